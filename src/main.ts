import { createApp } from 'vue';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import '@fontsource/atkinson-hyperlegible-next/400.css';
import '@fontsource/atkinson-hyperlegible-next/700.css';
import 'primeicons/primeicons.css';
import './styles.css';
import App from './App.vue';
import { router } from './router';
import { RigshelfPreset } from './theme/preset';
import { startOffline } from './offline/start';

const app = createApp(App);
app.use(createPinia());
app.use(router);
app.use(PrimeVue, {
  theme: {
    preset: RigshelfPreset,
    options: { prefix: 'p', darkModeSelector: '.rs-dark', cssLayer: false },
  },
});
app.use(ToastService);
app.use(ConfirmationService);
app.mount('#app');
startOffline();
