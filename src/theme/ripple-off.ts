// Stands in for PrimeVue's Ripple directive. The ripple is off in our PrimeVue config (its default),
// so the directive never does anything, yet Button and a few others import it with the directive base
// (about 5 kB gzip on every page). vite.config.ts points `primevue/ripple` here; to turn the ripple
// on, remove that alias first.
import type { Directive } from 'vue';

const RippleOff: Directive = {};
export default RippleOff;
