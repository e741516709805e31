/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig, type Plugin } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';

const alias = [
  { find: '@', replacement: fileURLToPath(new URL('./src', import.meta.url)) },
  { find: '@shared', replacement: fileURLToPath(new URL('./shared', import.meta.url)) },
  // parts of PrimeVue that are never switched on here, replaced by what they do when off
  // (src/theme/virtualscroller-off.ts, src/theme/ripple-off.ts)
  { find: /^primevue\/virtualscroller$/, replacement: fileURLToPath(new URL('./src/theme/virtualscroller-off.ts', import.meta.url)) },
  { find: /^primevue\/ripple$/, replacement: fileURLToPath(new URL('./src/theme/ripple-off.ts', import.meta.url)) },
];

/**
 * Moves the built stylesheet from <head> to the end of <body>: a stylesheet in the head holds back
 * every paint until it arrives, one in the body only what follows it, so the header bar index.html
 * draws is painted at once. The app's script still runs after the stylesheet has loaded (module
 * scripts wait for the document's pending stylesheets), so the app never shows unstyled.
 */
function stylesheetAfterBootBar(): Plugin {
  return {
    name: 'rigshelf:stylesheet-after-boot-bar',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(html) {
        const links: string[] = [];
        const head = html.replace(/\s*<link rel="stylesheet"[^>]*>/g, (tag) => {
          links.push(tag.trim());
          return '';
        });
        return links.length ? head.replace('</body>', `  ${links.join('\n    ')}\n  </body>`) : html;
      },
    },
  };
}

export default defineConfig({
  plugins: [
    vue(),
    stylesheetAfterBootBar(),
    // installable app and the service worker for no signal on set (src/sw.ts, src/offline/)
    VitePWA({
      strategies: 'injectManifest',
      srcDir: 'src',
      filename: 'sw.ts',
      injectRegister: false,
      registerType: 'autoUpdate',
      manifest: {
        name: 'Rigshelf',
        short_name: 'Rigshelf',
        description: 'The crew’s shelf of vetted printable rigging parts: kits, print sheets and cautions, with or without a signal.',
        theme_color: '#163733',
        background_color: '#f5f7f7',
        display: 'standalone',
        start_url: '/',
        scope: '/',
        icons: [
          { src: '/icon-192.png', sizes: '192x192', type: 'image/png' },
          { src: '/icon-512.png', sizes: '512x512', type: 'image/png' },
          { src: '/icon-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        ],
      },
      injectManifest: {
        globPatterns: ['**/*.{js,css,html,svg,png,woff2}'],
        // the icon font's SVG copy is for browsers without woff2
        globIgnores: ['**/primeicons-*.svg'],
        maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
      },
      devOptions: { enabled: false },
    }),
  ],
  resolve: { alias },
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: { '/api': process.env.RIGSHELF_API ?? 'http://127.0.0.1:3000' },
  },
  build: {
    chunkSizeWarningLimit: 900,
    // browsers without <link rel="modulepreload"> still load every chunk, only later; the polyfill would
    // ride on every first load
    modulePreload: { polyfill: false },
  },
  test: {
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          setupFiles: ['tests/helpers/test-database.ts'],
          testTimeout: 30_000,
          // a file with the demo shelf seeds it in beforeAll, which takes far longer on a busy machine
          hookTimeout: 120_000,
        },
      },
      {
        extends: true,
        test: {
          // the real server as a separate process: signals, shutdown, start-up, and the short chaos run
          name: 'process',
          include: ['tests/process/**/*.test.ts', 'tests/chaos/**/*.test.ts'],
          environment: 'node',
          testTimeout: 180_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          setupFiles: ['tests/helpers/test-database.ts'],
          testTimeout: 60_000,
          hookTimeout: 90_000,
        },
      },
    ],
  },
});
