import { existsSync } from 'node:fs';
import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

/** Searches the shelf from the kit page and adds the part whose row shows `title`. */
async function addPart(page: Page, query: string, title: string, itemsBefore: number) {
  await page.locator('#add-part-search').fill(query);
  const row = page.locator('[data-test="add-part-results"] li', { hasText: title });
  await row.locator('[data-test="add-part-button"]').click();
  await page.locator('[data-test="kit-items"] > li').nth(itemsBefore).waitFor();
}

function item(page: Page, slug: string): Locator {
  return page.locator(`[data-test="kit-items"] > li[data-part="${slug}"]`);
}

describe('browser · shoot kit', () => {
  it('shoot kit · demo member plans three shelf parts for a car shoot in sun, one in PLA · sees the totals and a heat warning', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    // an invented production; the member already has the demo kit, so the form opens on request,
    // and stays open when it was asked for before the list of kits arrived (held back here)
    let releaseList!: () => void;
    const listHeld = new Promise<void>((resolve) => (releaseList = resolve));
    await page.route('**/api/kits', async (route) => {
      if (route.request().method() === 'GET') await listHeld;
      await route.fallback();
    });
    await page.locator('[data-test="nav-kits"]').click();
    await page.waitForURL((url) => url.pathname === '/kits');
    await page.locator('[data-test="new-kit"]').click();
    releaseList();
    await page.locator('.rs-kits-group').first().waitFor();
    await page.unroute('**/api/kits');
    await page.locator('[data-test="create-kit"]').click();
    await page.locator('.rs-error', { hasText: 'Name the kit' }).waitFor();
    await page.locator('#kit-name').fill('Lantern Quay — picture car');
    await page.locator('#kit-production').fill('Lantern Quay');
    await page.locator('#kit-starts').fill('2027-06-07');
    await page.locator('#kit-ends').fill('2027-06-11');
    await rig.screenshot('shoot-kit-1-new');
    await page.locator('[data-test="create-kit"]').click();
    await page.waitForURL((url) => /^\/kits\/\d+$/.test(url.pathname));
    expect(await page.locator('[data-test="kit-name"]').textContent()).toContain('Lantern Quay — picture car');

    // the shoot's heat: a car dashboard in sun
    await page.locator('[data-test="edit-kit"]').click();
    await page.locator('[data-test="heat-vehicle-sun"]').check();
    await page.locator('[data-test="save-kit"]').click();
    const heat = page.locator('[data-test="kit-heat"]');
    await heat.waitFor();
    // Vanos et al. 2018: 69.4 °C, shown to the whole degree
    expect(await heat.textContent()).toContain('about 69 °C (157 °F)');

    // three published demo parts from the shelf
    await addPart(page, 'yoke', 'Dashboard monitor yoke', 0);
    await addPart(page, 'gear ring', 'Lens gear ring, module 0.8, for 80 mm barrels', 1);
    await addPart(page, 'receiver cradle', 'Receiver cradle for 15 mm rods', 2);
    expect(await page.locator('[data-test="kit-items"] > li').count()).toBe(3);

    // the cradle in PLA instead of its recipe's PETG
    const cradle = item(page, 'receiver-cradle-for-15-mm-rods');
    await cradle.locator('[data-test^="item-more-"]').click();
    const material = cradle.locator('select[id^="material-"]');
    await material.selectOption({ label: (await material.locator('option', { hasText: /^PLA · / }).textContent())!.trim() });
    await cradle.locator('[data-test^="item-save-"]').click();
    await cradle.locator('[data-test="item-material"]', { hasText: 'PLA' }).waitFor();

    // two yokes: the quantity stepper saves by itself
    const yoke = item(page, 'dashboard-monitor-yoke');
    await yoke.getByRole('button', { name: 'One piece more' }).click();
    await page.locator('[data-test="total-pieces"]', { hasText: /^4$/ }).waitFor();

    // the heat warning names safer materials, and the kit says so at the top
    const warning = cradle.locator('[data-test="heat-warning"]');
    await warning.waitFor();
    const warningText = (await warning.textContent()) ?? '';
    expect(warningText).toContain('PLA softens at about 55 °C');
    expect(warningText).toContain('ASA');
    expect(await page.locator('[data-test="kit-attention"]').textContent()).toContain('softens in this shoot');
    // the yoke is printed in ASA: no heat warning, but the load cautions of the part page
    expect(await yoke.locator('[data-test="heat-warning"]').count()).toBe(0);
    expect(await yoke.locator('[data-test="cautions"]').textContent()).toContain('safety cable');

    // the totals: every piece estimated, per material with spools, per printer, labelled as estimates
    const totals = page.locator('[data-test="kit-totals"]');
    expect(await totals.textContent()).toContain('Estimates');
    const grams = Number.parseFloat((await page.locator('[data-test="total-grams"]').textContent()) ?? '');
    expect(grams).toBeGreaterThan(0);
    const byMaterial = (await page.locator('[data-test="by-material"]').textContent()) ?? '';
    for (const material of ['PLA', 'PETG', 'ASA']) expect(byMaterial).toContain(material);
    expect(await page.locator('[data-test="by-printer"]').textContent()).toContain('No printer chosen yet');
    expect(await page.locator('[data-test="kit-csv"]').getAttribute('href')).toMatch(/^\/api\/kits\/\d+\/export\.csv$/);
    await rig.screenshot('shoot-kit-2-planned');

    // the print sheet: the same kit as plain tables
    await page.emulateMedia({ media: 'print' });
    expect(await page.locator('[data-test="print-sheet"]').isVisible()).toBe(true);
    expect(await page.locator('.rs-topbar').isVisible()).toBe(false);
    const shot = await rig.screenshot('shoot-kit-3-print-sheet');
    await page.emulateMedia({ media: 'screen' });
    expect(existsSync(shot)).toBe(true);
  });
});
