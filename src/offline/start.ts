/// <reference types="vite-plugin-pwa/client" />
// Installs the service worker (vite-plugin-pwa) and starts the offline store: stored copies are
// noticed, and the queue is sent when the signal returns.
import { registerSW } from 'virtual:pwa-register';
import { useOfflineStore } from '@/stores/offline';

export function startOffline() {
  useOfflineStore().start();
  if ('serviceWorker' in navigator && import.meta.env.PROD) registerSW({ immediate: true });
}
