import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Kit, KitItem, KitRecall, SetReport, User } from '../../server/db/models';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

async function noHorizontalOverflow() {
  const widths = await rig.page.evaluate(() => ({ doc: document.documentElement.scrollWidth, view: window.innerWidth }));
  expect(widths.doc).toBeLessThanOrEqual(widths.view);
}

describe('browser · no signal on set', () => {
  let kitPath = '';
  let partPath = '';

  it('offline · a phone opened its kit and a part with signal · both stay readable with the signal cut, with an "as of" time', async () => {
    const { page, context } = rig;
    await page.setViewportSize({ width: 390, height: 844 });
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');
    // the service worker takes over the page once it is installed
    await page.waitForFunction(() => !!navigator.serviceWorker?.controller, undefined, { timeout: 30_000 });

    const owner = (await User.findOne({ where: { email: member.email } }))!;
    const kit = (await Kit.findOne({ where: { ownerId: owner.id }, order: [['id', 'ASC']] }))!;
    kitPath = `/kits/${kit.id}`;
    await page.goto(kitPath);
    await page.locator('[data-test="kit-name"]').waitFor();
    await page.locator('[data-test="kit-items"] a[href^="/parts/"]').first().waitFor();
    // the print sheet's figures come from the summary
    await page.locator('[data-test="kit-totals"]').waitFor();
    partPath = (await page.locator('[data-test="kit-items"] a[href^="/parts/"]').first().getAttribute('href'))!;
    await page.goto(partPath);
    await page.locator('h1').first().waitFor();
    const partTitle = (await page.locator('h1').first().textContent())!.trim();
    await page.waitForLoadState('networkidle');
    const cautions = await page.locator('[data-test="cautions"] li').count();
    await page.goto(`${partPath}/report`);
    await page.locator('[data-test="report-form"]').waitFor();

    await context.setOffline(true);
    await page.goto(kitPath);
    await page.locator('[data-test="kit-name"]').waitFor();
    expect(await page.locator('[data-test="kit-name"]').textContent()).toBe(kit.name);
    expect(await page.locator('[data-test="offline-state"]').textContent()).toContain('No signal');
    expect(await page.locator('[data-test="offline-as-of"]').textContent()).toMatch(/\d{1,2}:\d{2}/);
    await noHorizontalOverflow();
    await rig.screenshot('offline-1-kit-no-signal-phone');

    await page.goto(partPath);
    await page.locator('h1', { hasText: partTitle }).waitFor();
    if (cautions) await page.locator('[data-test="cautions"] li').first().waitFor();
    expect(await page.locator('[data-test="cautions"] li').count()).toBe(cautions);
    expect(await page.locator('[data-test="offline-as-of"]').count()).toBe(1);
    await rig.screenshot('offline-2-part-no-signal-phone');
  });

  it('offline · a set report written with no signal · kept on the phone, then filed exactly once when the signal returns', async () => {
    const { page, context } = rig;
    const slug = partPath.split('/').pop()!;
    const before = await SetReport.count();

    await page.goto(`${partPath}/report`);
    await page.locator('[data-test="report-form"]').waitFor();
    await page.locator('[data-test="outcome-held-up"]').click();
    await page.locator('[data-test="report-production"]').fill('Night shoot, pier');
    for (let i = 0; i < 2; i++) await page.getByRole('button', { name: 'One day more' }).click();
    await page.locator('#rs-report-notes').fill('Written on the pier with no signal.');
    await page.locator('[data-test="report-submit"]').click();
    await page.waitForURL((url) => url.pathname === `/parts/${slug}`);
    await page.locator('[data-test="offline-waiting"]', { hasText: '1 entry waits' }).waitFor();
    expect(await SetReport.count()).toBe(before);
    await rig.screenshot('offline-3-report-waiting-phone');

    await context.setOffline(false);
    await page.locator('[data-test="offline-waiting"]').waitFor({ state: 'detached', timeout: 30_000 });
    expect(await SetReport.count()).toBe(before + 1);
    const filed = await SetReport.findOne({ order: [['id', 'DESC']] });
    expect(filed?.notes).toBe('Written on the pier with no signal.');

    // a reload and another "online" event find nothing left to send
    await page.reload();
    await page.evaluate(() => window.dispatchEvent(new Event('online')));
    await page.locator('h1').first().waitFor();
    expect(await SetReport.count()).toBe(before + 1);
  });
});

describe('browser · label sheet', () => {
  it('labels · the demo kit on a phone and on a desktop · one label per piece with a QR code, never the production', async () => {
    const { page } = rig;
    const owner = (await User.findOne({ where: { email: member.email } }))!;
    const kit = (await Kit.findOne({ where: { ownerId: owner.id }, order: [['id', 'ASC']] }))!;
    const detail = await page.evaluate(async (id) => (await fetch(`/api/kits/${id}`)).json(), kit.id);
    const pieces = (detail.items as { quantity: number }[]).reduce((n, i) => n + i.quantity, 0);

    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(`/kits/${kit.id}`);
    await page.locator('[data-test="kit-labels-link"]').click();
    await page.waitForURL((url) => url.pathname === `/kits/${kit.id}/labels`);
    await page.locator('[data-test="label"] svg').first().waitFor();
    expect(await page.locator('[data-test="label"]').count()).toBe(pieces);
    const text = await page.locator('[data-test="labels"]').textContent();
    if (kit.production) expect(text).not.toContain(kit.production);
    expect(text).not.toContain(kit.name);
    await noHorizontalOverflow();
    await rig.screenshot('labels-1-phone');

    await page.setViewportSize({ width: 1366, height: 800 });
    await rig.screenshot('labels-2-desktop');
    await page.emulateMedia({ media: 'print' });
    await rig.screenshot('labels-3-print-a4');
    await page.emulateMedia({ media: 'screen' });
    await page.locator('[data-test="labels-paper"]').selectOption('letter');
    await page.emulateMedia({ media: 'print' });
    await rig.screenshot('labels-4-print-letter');
    await page.emulateMedia({ media: 'screen' });
  });

  it('labels · scanning a label opens the part’s on-set page · cautions, the recipe and the way to the report form', async () => {
    const { page } = rig;
    await page.setViewportSize({ width: 390, height: 844 });
    const owner = (await User.findOne({ where: { email: member.email } }))!;
    const kit = (await Kit.findOne({ where: { ownerId: owner.id }, order: [['id', 'ASC']] }))!;
    const detail = await page.evaluate(async (id) => (await fetch(`/api/kits/${id}`)).json(), kit.id);
    const item = detail.items[0] as { part: { slug: string; title: string }; recipe: { id: number } | null };
    await page.goto(`/parts/${item.part.slug}/on-set${item.recipe ? `?recipe=${item.recipe.id}` : ''}`);
    await page.locator('[data-test="on-set-title"]', { hasText: item.part.title }).waitFor();
    await page.locator('[data-test="recipes-table"]').waitFor();
    await noHorizontalOverflow();
    await rig.screenshot('labels-5-on-set-phone');
    await page.locator('[data-test="on-set-report"]').click();
    await page.locator('[data-test="report-form"]').waitFor();
    if (item.recipe) expect(new URL(page.url()).searchParams.get('recipe')).toBe(String(item.recipe.id));
  });
});

describe('browser · recall banner', () => {
  it('recall · a part of the kit was retired · the owner sees the part and the reason, acknowledges it, and it stays gone', async () => {
    const { page } = rig;
    await page.setViewportSize({ width: 1366, height: 800 });
    const owner = (await User.findOne({ where: { email: member.email } }))!;
    const kit = (await Kit.findOne({ where: { ownerId: owner.id }, order: [['id', 'ASC']] }))!;
    await KitRecall.update({ acknowledgedAt: new Date(), acknowledgedBy: owner.id }, { where: { kitId: kit.id } });
    const item = (await KitItem.findOne({ where: { kitId: kit.id }, order: [['position', 'ASC']] }))!;
    const recall = await KitRecall.create({
      kitId: kit.id,
      partId: item.partId!,
      kind: 'retired',
      partTitle: 'Test bracket',
      reason: 'Retired from the shelf: the clamp screw strips its thread.',
      acknowledgedAt: null,
      acknowledgedBy: null,
    });
    await page.goto(`/kits/${kit.id}`);
    const banner = page.locator('[data-test="kit-recall-retired"]');
    await banner.waitFor();
    expect(await banner.textContent()).toContain('the clamp screw strips its thread');
    await rig.screenshot('recall-1-kit-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await noHorizontalOverflow();
    await rig.screenshot('recall-2-kit-phone');

    await banner.locator('[data-test="kit-recall-ack"]').click();
    await banner.waitFor({ state: 'detached' });
    expect((await recall.reload()).acknowledgedAt).not.toBeNull();
    await page.reload();
    await page.locator('[data-test="kit-name"]').waitFor();
    expect(await page.locator('[data-test="kit-recalls"]').count()).toBe(0);
  });
});
