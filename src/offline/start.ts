// Installs the service worker (built by vite-plugin-pwa from src/sw.ts) and starts the offline store:
// stored copies are noticed, and the queue is sent when the signal returns. The worker is registered
// with the browser's own API rather than workbox-window, which every first load would fetch.
import { useOfflineStore } from '@/stores/offline';

export function startOffline() {
  useOfflineStore().start();
  if (!('serviceWorker' in navigator) || !import.meta.env.PROD) return;
  // sw.ts takes over at once (skipWaiting, clientsClaim); when it replaces an older worker the page
  // reloads so it runs the new assets, as vite-plugin-pwa's autoUpdate does
  const updating = !!navigator.serviceWorker.controller;
  navigator.serviceWorker.addEventListener('controllerchange', () => {
    if (updating) window.location.reload();
  });
  // after the page has loaded: the worker's install downloads every asset for offline use, which
  // must not compete with the first page's own scripts on a weak signal
  const register = () => void navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => undefined);
  if (document.readyState === 'complete') register();
  else window.addEventListener('load', register, { once: true });
}
