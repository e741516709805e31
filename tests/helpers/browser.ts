// Debian's chromium driven by playwright-core, against the real server on a free loopback port.
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { startServer, type RunningServer } from '../../server/index';
import { testConfig } from './app';
import { copyDemo } from './demo-template';

export const ARTIFACTS = resolve(import.meta.dirname, '../../test-results');

export interface BrowserRig {
  server: RunningServer;
  browser: Browser;
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
  screenshot(name: string): Promise<string>;
}

export async function startBrowserRig(): Promise<BrowserRig> {
  const config = testConfig({ PORT: '0', RIGSHELF_DEMO: '1' });
  // a copy of the run's seeded demo shelf; the server's own seed then has nothing left to do
  await copyDemo('full', config);
  const server = await startServer(config);
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    // playwright gives every launch a fresh temporary profile
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const context = await browser.newContext({ baseURL: server.url, viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (err) => problems.push(err.message));
  mkdirSync(ARTIFACTS, { recursive: true });
  return {
    server,
    browser,
    context,
    page,
    async screenshot(name) {
      const path = join(ARTIFACTS, `${name}.png`);
      await page.screenshot({ path, fullPage: true });
      return path;
    },
    async close() {
      await browser.close();
      await server.close();
      if (problems.length) throw new Error(`The page threw: ${problems.join('; ')}`);
    },
  };
}

export async function signInThroughForm(page: Page, email: string, password: string) {
  for (let attempt = 1; ; attempt++) {
    await page.goto('/sign-in');
    // the sign-in page sends a signed-in visitor home: a late answer set the old session's cookie again
    const field = page.getByLabel('E-mail');
    await Promise.race([field.waitFor(), page.waitForURL((u) => u.pathname !== '/sign-in')]).catch(() => undefined);
    if (new URL(page.url()).pathname === '/sign-in' || attempt === 3) break;
    await forgetSession(page);
  }
  try {
    await page.getByLabel('E-mail').fill(email);
  } catch (err) {
    await page.screenshot({ path: join(ARTIFACTS, 'sign-in-failure.png'), fullPage: true });
    throw err;
  }
  await page.locator('#password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/**
 * Starts a fresh session. The page is left first, and the session is ended on the server before its
 * cookie is cleared: sessions roll, and an answer still in flight (the service worker keeps fetching
 * pictures for a page that is gone) would otherwise set the old session's cookie again.
 */
export async function forgetSession(page: Page) {
  await page.goto('about:blank');
  const api = page.context().request;
  const csrf = await api.get('/api/auth/csrf').catch(() => null);
  if (csrf?.ok()) {
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    await api.post('/api/auth/logout', { headers: { 'X-CSRF-Token': csrfToken } }).catch(() => undefined);
  }
  await page.context().clearCookies();
}
