/// <reference types="vitest/config" />
import { readdirSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, URL } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig, type Plugin } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';
import { commonCss, componentCss } from './src/theme/static-css.ts';

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

/**
 * PrimeVue's styled mode as plain CSS (src/theme/static-css.ts): `virtual:primevue-theme.css` is the
 * palette and global rules, and each `primevue/<x>/style` module's import of its rules from
 * `@primeuix/styles/<x>` becomes an empty string plus an import of that component's CSS, so the rules
 * travel with the chunk that uses the component and no stylesheet text or tokens are JavaScript.
 */
function primevueStaticTheme(): Plugin {
  const THEME = 'virtual:primevue-theme.css';
  const THEME_ID = '/__primevue-theme/common.css';
  const RULES = '\0primevue-rules:';
  const CSS = /^\/__primevue-theme\/([a-z]+)\.css$/;
  // the app's own styles may read the theme's variables (var(--p-form-field-…)): they are kept
  const src = fileURLToPath(new URL('./src', import.meta.url));
  let styles: string | undefined;
  const appStyles = () =>
    (styles ??= readdirSync(src, { recursive: true, encoding: 'utf8' })
      .filter((f) => /\.(vue|css)$/.test(f))
      .map((f) => readFileSync(join(src, f), 'utf8'))
      .join('\n'));
  return {
    name: 'rigshelf:primevue-static-theme',
    enforce: 'pre',
    resolveId(id, importer) {
      if (id === THEME) return THEME_ID;
      if (CSS.test(id)) return id;
      const rules = /^@primeuix\/styles\/([a-z]+)$/.exec(id);
      if (!rules || !importer) return null;
      // @primevue/core's BaseStyle imports the global rules (`base`), which are in the common sheet
      if (rules[1] === 'base') return `${RULES}base`;
      const dir = /[\\/]primevue[\\/](?:dist[\\/])?([a-z]+)[\\/]style[\\/]/.exec(importer)?.[1];
      return dir ? `${RULES}${dir}` : null;
    },
    async load(id) {
      if (id === THEME_ID) return commonCss(appStyles());
      const css = CSS.exec(id);
      if (css) return componentCss(css[1], appStyles());
      if (!id.startsWith(RULES)) return null;
      const dir = id.slice(RULES.length);
      return dir === 'base' ? `export const style = '';` : `import '/__primevue-theme/${dir}.css';\nexport const style = '';`;
    },
  };
}

export default defineConfig({
  plugins: [
    primevueStaticTheme(),
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
  // served module by module in development, so primevueStaticTheme sees each component's style import
  optimizeDeps: { exclude: ['primevue'] },
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
    // Most test files wait on MariaDB or chromium; on a 2-core machine a second worker keeps the CPU busy
    // (vitest's own default there is one). The process files run alone after the rest (below).
    maxWorkers: Math.max(2, availableParallelism() - 1),
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
          // they time shutdowns and restarts of real processes: alone, after the other files
          maxWorkers: 1,
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
