// Every page on a 390 × 844 phone, as a visitor, a member, a moderator and an admin: nothing may be
// wider than the screen, and axe-core (run inside the page) may find no serious or critical
// violation of WCAG 2.1 A/AA, colour contrast included.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { ARTIFACTS, forgetSession, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

// @axe-core/playwright needs Node 22; axe-core's own browser build is injected instead
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const PHONE = { width: 390, height: 844 };

let rig: BrowserRig;
let context: BrowserContext;
let page: Page;
beforeAll(async () => {
  rig = await startBrowserRig();
  // a phone of its own; bypassCSP lets addScriptTag put axe into pages whose policy allows 'self' only
  context = await rig.browser.newContext({ baseURL: rig.server.url, viewport: PHONE, bypassCSP: true });
  page = await context.newPage();
});
afterAll(async () => {
  await context?.close();
  await rig?.close();
});

const screenshot = (name: string) => page.screenshot({ path: join(ARTIFACTS, `${name}.png`), fullPage: true });

interface AxeResult {
  violations: { id: string; impact: string | null; help: string; nodes: { target: string[]; failureSummary?: string }[] }[];
}

/** What is wrong with the page now: horizontal overflow (with the widest elements) and axe's findings. */
async function problemsOn(page: Page, label: string): Promise<string[]> {
  await page.waitForLoadState('networkidle');
  const problems: string[] = [];
  const overflow = await page.evaluate(() => {
    const doc = document.scrollingElement!;
    if (doc.scrollWidth <= window.innerWidth) return null;
    const wide = [...document.querySelectorAll<HTMLElement>('body *')]
      .filter((el) => el.getBoundingClientRect().right > window.innerWidth + 0.5)
      .filter((el) => ![...el.children].some((c) => c.getBoundingClientRect().right > window.innerWidth + 0.5))
      .slice(0, 4)
      .map(
        (el) =>
          `${el.tagName.toLowerCase()}${el.className && typeof el.className === 'string' ? '.' + el.className.trim().split(/\s+/).join('.') : ''} (right ${Math.round(el.getBoundingClientRect().right)})`,
      );
    return `${doc.scrollWidth} px wide: ${wide.join(', ')}`;
  });
  if (overflow) problems.push(`${label}: wider than ${PHONE.width} px, ${overflow}`);
  if (!(await page.evaluate(() => 'axe' in window))) await page.addScriptTag({ content: AXE_SOURCE });
  const result = (await page.evaluate(() =>
    (window as unknown as { axe: { run(ctx: unknown, opts: unknown): Promise<unknown> } }).axe.run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
      resultTypes: ['violations'],
    }),
  )) as AxeResult;
  for (const v of result.violations) {
    if (v.impact !== 'serious' && v.impact !== 'critical') continue;
    const where = v.nodes
      .slice(0, 3)
      .map((n) => `${n.target.join(' ')}${n.failureSummary ? ` [${n.failureSummary.split('\n').slice(1).join(' ').trim()}]` : ''}`);
    problems.push(`${label}: ${v.id} (${v.impact}) ${v.help} at ${where.join('; ')}`);
  }
  return problems;
}

async function visitAll(paths: string[], who: string): Promise<string[]> {
  const found: string[] = [];
  for (const path of paths) {
    await page.goto(path);
    found.push(...(await problemsOn(page, `${who} ${path}`)));
    await screenshot(`phone-${who}-${path.replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '') || 'home'}`);
  }
  return found;
}

async function apiJson<T>(path: string): Promise<T> {
  const res = await page.request.get(path);
  expect(res.status(), path).toBe(200);
  return (await res.json()) as T;
}

const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;

describe('browser · phone width and accessibility', () => {
  it('visitor pages · 390 px phone · no horizontal overflow and no serious axe violation', async () => {
    await forgetSession(page);
    const search = await apiJson<{ results: { slug: string }[] }>('/api/search?q=');
    const found = await visitAll(
      [
        '/',
        '/search?q=plate',
        `/parts/${search.results[0].slug}`,
        '/sign-in',
        '/register',
        '/forgot-password',
        '/verify-email',
        '/reset-password',
        '/no-such-page',
      ],
      'visitor',
    );
    expect(found).toEqual([]);
  }, 240_000);

  it('member pages · 390 px phone · no horizontal overflow and no serious axe violation', async () => {
    await forgetSession(page);
    await signInThroughForm(page, account('member').email, DEMO_PASSWORD);
    await page.locator('[data-test="account-button"]').waitFor();
    const search = await apiJson<{ results: { slug: string }[] }>('/api/search?q=');
    const kits = await apiJson<{ items: { id: number }[] }>('/api/kits');
    const wanted = await apiJson<{ items: { id: number }[] }>('/api/wanted');
    const me = await apiJson<{ user: { id: number } }>('/api/auth/me');
    const slug = search.results[0].slug;
    const paths = [
      '/',
      '/search?q=rod',
      `/parts/${slug}`,
      `/parts/${slug}/report`,
      '/parts/new',
      '/my/parts',
      '/kits',
      '/printers',
      '/builds',
      '/wanted',
      '/wanted/new',
      '/account',
      `/crew/${me.user.id}`,
    ];
    if (kits.items[0]) paths.push(`/kits/${kits.items[0].id}`);
    if (wanted.items[0]) paths.push(`/wanted/${wanted.items[0].id}`);
    const found = await visitAll(paths, 'member');

    // the part page's 3D view and the "Add to a shoot kit" dialog stay on the screen
    await page.goto(`/parts/${slug}`);
    await page.locator('[data-test="show-3d"]').click();
    await page.locator('[data-test="model-viewer"]').waitFor();
    await page.waitForFunction(() => !document.querySelector('.rs-viewer-cover[aria-live]'));
    found.push(...(await problemsOn(page, `member /parts/${slug} with the 3D view`)));
    await screenshot('phone-member-part-3d');
    await page.locator('[data-test="add-to-kit"]').click();
    const dialog = page.locator('[data-test="add-to-kit-dialog"]');
    await dialog.waitFor();
    const dialogBox = await dialog.boundingBox();
    if (dialogBox!.x < 0 || dialogBox!.x + dialogBox!.width > PHONE.width) found.push(`member /parts/${slug}: the kit dialog runs off the screen`);
    await screenshot('phone-member-part-add-to-kit');
    await page.keyboard.press('Escape');

    // the header keeps "Shoot kits" in reach, and the header is not a wall on a phone
    await page.goto('/');
    const header = await page.locator('header').first().boundingBox();
    if (header!.height > 80) found.push(`member /: the header is ${Math.round(header!.height)} px tall`);
    await page.locator('[data-test="nav-toggle"]').click();
    const kitsLink = page.locator('[data-test="nav-kits"]');
    await kitsLink.waitFor({ state: 'visible' });
    const kitsBox = await kitsLink.boundingBox();
    expect(kitsBox!.x + kitsBox!.width).toBeLessThanOrEqual(PHONE.width);
    found.push(...(await problemsOn(page, 'member / with the menu open')));
    await screenshot('phone-member-menu-open');
    await page.keyboard.press('Escape');

    // the notices panel fits on the screen
    await page.goto('/');
    await page.locator('[data-test="notice-bell"]').click();
    const panel = page.locator('.rs-notices');
    await panel.waitFor();
    const box = await panel.boundingBox();
    expect(box!.x).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width).toBeLessThanOrEqual(PHONE.width);
    found.push(...(await problemsOn(page, 'member / with notices open')));
    await screenshot('phone-member-notices-open');
    expect(found).toEqual([]);
  }, 300_000);

  it('moderator pages · 390 px phone · no horizontal overflow and no serious axe violation', async () => {
    await forgetSession(page);
    await signInThroughForm(page, account('moderator').email, DEMO_PASSWORD);
    await page.locator('[data-test="account-button"]').waitFor();
    const queue = await apiJson<{ items: { partId: number }[] }>('/api/review/queue');
    const paths = ['/review', '/review/flags'];
    if (queue.items[0]) paths.push(`/review/${queue.items[0].partId}`);
    expect(await visitAll(paths, 'moderator')).toEqual([]);
  }, 120_000);

  it('admin pages · 390 px phone · no horizontal overflow and no serious axe violation', async () => {
    await forgetSession(page);
    await signInThroughForm(page, account('admin').email, DEMO_PASSWORD);
    await page.locator('[data-test="account-button"]').waitFor();
    expect(await visitAll(['/admin/users', '/admin/mail', '/admin/bodies'], 'admin')).toEqual([]);
  }, 120_000);
});
