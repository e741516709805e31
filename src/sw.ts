/// <reference lib="webworker" />
// Rigshelf's service worker (built by vite-plugin-pwa, injectManifest). The app shell is precached;
// what a member needs on set with no signal is kept as they use it: their kits and the figures of the
// print sheet, the part pages they opened (cautions included) and their photos. Network first, so a
// copy is only used when the network fails; each stored copy carries the time it was
// stored (x-rigshelf-stored-at), which the app shows as "as of".
import { cleanupOutdatedCaches, createHandlerBoundToURL, precacheAndRoute } from 'workbox-precaching';
import { NavigationRoute, registerRoute } from 'workbox-routing';
import { CacheFirst, NetworkFirst } from 'workbox-strategies';
import { ExpirationPlugin } from 'workbox-expiration';
import { clientsClaim, type WorkboxPlugin } from 'workbox-core';
import { OFFLINE_CACHE, OFFLINE_IMAGE_CACHE, STORED_AT_HEADER, keepsOfflineCopy, keepsOfflineImage } from './offline/routes';

declare const self: ServiceWorkerGlobalScope;

// a new version takes over at once (the app shell is precached whole, so pages keep working)
void self.skipWaiting();
clientsClaim();

precacheAndRoute(self.__WB_MANIFEST);
cleanupOutdatedCaches();
registerRoute(new NavigationRoute(createHandlerBoundToURL('/index.html'), { denylist: [/^\/api\//] }));

/** Stamps the stored copy with the time it was stored; the page gets the network answer untouched. */
const stampStoredAt: WorkboxPlugin = {
  async cacheWillUpdate({ response }) {
    if (response.status !== 200) return null;
    const headers = new Headers(response.headers);
    headers.set(STORED_AT_HEADER, new Date().toISOString());
    return new Response(await response.blob(), { status: response.status, statusText: response.statusText, headers });
  },
};

registerRoute(
  ({ url, request, sameOrigin }) => sameOrigin && request.method === 'GET' && keepsOfflineCopy(url.pathname),
  new NetworkFirst({
    cacheName: OFFLINE_CACHE,
    // no time limit: a slow answer (a kit summary slicing its models) must not be swapped for an older copy
    plugins: [stampStoredAt, new ExpirationPlugin({ maxEntries: 400, maxAgeSeconds: 30 * 24 * 3600 })],
  }),
);

registerRoute(
  ({ url, request, sameOrigin }) => sameOrigin && request.method === 'GET' && keepsOfflineImage(url.pathname),
  new CacheFirst({ cacheName: OFFLINE_IMAGE_CACHE, plugins: [new ExpirationPlugin({ maxEntries: 300, maxAgeSeconds: 30 * 24 * 3600 })] }),
);
