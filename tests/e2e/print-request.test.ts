import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Part, PartRevision } from '../../server/db/models';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { DEMO_SECOND_MEMBER } from '../../server/demo/0017-demo-crew-shelf';
import { forgetSession, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
// two demo members of one crew: the 2nd AC asks, the 1st AC owns the printers
const asker = DEMO_SECOND_MEMBER;
const owner = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

async function signInAs(page: Page, email: string) {
  await forgetSession(page);
  await signInThroughForm(page, email, DEMO_PASSWORD);
  await page.waitForURL((url) => url.pathname === '/');
}

async function statusIs(page: Page, label: string) {
  await page.locator('[data-test="request-status"]', { hasText: label }).waitFor();
}

describe('browser · print request', () => {
  it('print request · two demo crew members · asked, accepted, fit test, printed, handed over and paid back through the payments page', async () => {
    const { page } = rig;
    const revision = (await PartRevision.findOne({ where: { title: 'Snap-on cable clip for 15 mm rods', status: 'published' } }))!;
    const part = (await Part.findByPk(revision.partId))!;

    // the 2nd AC asks from the part page
    await signInAs(page, asker.email);
    await page.goto(`/parts/${part.slug}`);
    await page.locator('[data-test="ask-print"]').click();
    const dialog = page.locator('[data-test="ask-print-dialog"]');
    await dialog.locator('[data-test="ask-printer"]').waitFor();
    // other crew members have printers too: choose one of the 1st AC's
    const printer = dialog.locator('[data-test="ask-printer"]');
    const theirs = await printer
      .locator('option', { hasText: new RegExp(`· ${owner.displayName} ·`) })
      .first()
      .textContent();
    await printer.selectOption({ label: theirs!.trim() });
    await dialog.locator('#ask-note').fill('For the A camera’s follow focus.');
    await dialog.locator('[data-test="ask-print-send"]').click();
    await page.waitForURL((url) => /^\/print-requests\/\d+$/.test(url.pathname));
    const requestPath = new URL(page.url()).pathname;
    await statusIs(page, 'Asked');
    expect(await page.locator('[data-test="request-total"]').textContent()).toMatch(/€\d+\.\d\d/);
    await page.setViewportSize({ width: 1366, height: 800 });
    await rig.screenshot('print-request-1-asked-1366');

    // the 1st AC takes it from asked to handed over
    await signInAs(page, owner.email);
    await page.goto(requestPath);
    for (const [step, label] of [
      ['accept', 'Accepted'],
      ['fit-tested', 'Fit test printed'],
      ['printed', 'Printed'],
      ['handed-over', 'Handed over'],
    ] as const) {
      await page.locator(`[data-test="step-${step}"]`).click();
      await statusIs(page, label);
    }
    const frozen = await page.locator('[data-test="request-total"]').textContent();
    expect(await page.locator('[data-test="request-history"] li').count()).toBe(5);
    await page.setViewportSize({ width: 390, height: 844 });
    await rig.screenshot('print-request-2-handed-over-390');

    // the 2nd AC pays back on the payments page (the local fake) and comes back paid
    await signInAs(page, asker.email);
    await page.goto(requestPath);
    await page.locator('[data-test="request-pay"]').click();
    await page.waitForURL((url) => url.pathname.startsWith('/pay/'));
    expect(await page.locator('body').textContent()).toContain('Nothing is charged');
    await rig.screenshot('print-request-3-payment-page-390');
    await page.getByRole('button', { name: /^Pay / }).click();
    await page.waitForURL((url) => url.pathname === requestPath);
    await page.locator('[data-test="request-paid"]').waitFor();
    expect(await page.locator('[data-test="request-paid"]').textContent()).toContain(frozen!.trim());
    expect(await page.locator('[data-test="request-payment"]').textContent()).toContain('Paid');
    await rig.screenshot('print-request-4-paid-390');

    // the owner sees it paid to them
    await signInAs(page, owner.email);
    await page.setViewportSize({ width: 1366, height: 800 });
    await page.goto('/print-requests');
    await page.locator('[data-test="paid-to-me"]', { hasText: frozen!.trim() }).waitFor();
    await rig.screenshot('print-request-5-list-1366');
  });
});
