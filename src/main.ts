import { createApp } from 'vue';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import '@fontsource/atkinson-hyperlegible-next/400.css';
import '@fontsource/atkinson-hyperlegible-next/700.css';
import 'primeicons/primeicons.css';
// PrimeVue's theme as CSS made at build time (src/theme/static-css.ts); each component's rules come
// with the chunk that uses it
import 'virtual:primevue-theme.css';
import './styles.css';
import App from './App.vue';
import { router } from './router';
import { startOffline } from './offline/start';

const app = createApp(App);
app.use(createPinia());
app.use(router);
app.use(PrimeVue, { theme: 'none' });
app.use(ToastService);
app.use(ConfirmationService);
app.mount('#app');
startOffline();
