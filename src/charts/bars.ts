// The chart.js parts the stacked bars of the part page use, registered one by one so the bundle
// carries nothing else (no chart.js/auto). Loaded only when the chart's section comes into view.
import { BarController, BarElement, CategoryScale, Chart, LinearScale, Tooltip } from 'chart.js';

Chart.register(BarController, BarElement, CategoryScale, LinearScale, Tooltip);

export { Chart };
