import { Jimp } from 'jimp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
let photo: Buffer;
beforeAll(async () => {
  rig = await startBrowserRig();
  photo = await new Jimp({ width: 96, height: 72, color: 0x92490cff }).getBuffer('image/jpeg');
});
afterAll(async () => {
  await rig?.close();
});

const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;
const moderator = DEMO_ACCOUNTS.find((a) => a.role === 'moderator')!;
// a published demo part by the demo moderator, with two held-up reports and the member's 4 in the demo evidence
const SPACER = '/parts/v-style-plate-spacer-6-mm';

describe('browser · rate and report', () => {
  it('rate and report · demo member files a cracked report with a 2 and a photo from a phone · the part page shows it and the figures move', async () => {
    const { page } = rig;
    await page.setViewportSize({ width: 390, height: 844 });
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    await page.goto(SPACER);
    const sentence = page.locator('[data-test="proven-sentence"]');
    await sentence.waitFor();
    // the rating form and the report list are fetched as the evidence section comes near
    await sentence.scrollIntoViewIfNeeded();
    await page.locator('[data-test="report"]').first().waitFor();
    expect(await page.locator('[data-test="author-link"]').textContent()).toContain(moderator.displayName);
    expect(await sentence.textContent()).toContain('2 of 2 set reports');
    expect(await page.locator('[data-test="report"]').count()).toBe(2);
    expect(await page.locator('[data-test="my-rating"]').textContent()).toContain('4 of 5');
    await rig.screenshot('rate-and-report-1-part-before');

    await page.locator('[data-test="report-back"]').click();
    await page.waitForURL((url) => url.pathname === `${SPACER}/report`);
    await page.locator('[data-test="report-form"]').waitFor();

    // sending it empty shows the shared schema's messages inline
    await page.locator('[data-test="report-submit"]').click();
    await page.locator('.rs-error', { hasText: 'Say how it held up.' }).waitFor();
    await page.locator('.rs-error', { hasText: 'Name the production or job.' }).waitFor();

    await page.locator('[data-test="outcome-cracked"]').click();
    await page.locator('[data-test="rate-2"]').click();
    await page.locator('[data-test="report-production"]').fill('Harbour Lights');
    for (let i = 0; i < 3; i++) await page.getByRole('button', { name: 'One day more' }).click();
    await page.locator('[data-test="condition-impacts"]').click();
    await page.locator('[data-test="condition-cold"]').click();
    // the part's one recipe (PETG) is picked already
    expect(await page.locator('[data-test="recipe-picker"] input[type="radio"]').first().isChecked()).toBe(true);
    await page.locator('#rs-report-notes').fill('Cracked at the bolt hole after a drop on a frozen pier.');
    await page.locator('[data-test="photo-library"]').setInputFiles({ name: 'crack.jpg', mimeType: 'image/jpeg', buffer: photo });
    await page.locator('.rs-rp-list img').waitFor();
    // the inline messages went away as the fields were filled
    expect(await page.locator('.rs-report-form .rs-error').count()).toBe(0);
    expect(await page.locator('[data-test="report-submit"]').textContent()).toContain('report and rating');
    await rig.screenshot('rate-and-report-2-phone-form');

    await page.locator('[data-test="report-submit"]').click();
    await page.waitForURL((url) => url.pathname === SPACER && url.hash === '#set-reports');

    // the new report is on top, with its outcome, production, days and conditions
    const reports = page.locator('[data-test="report"]');
    await expect.poll(() => reports.count()).toBe(3);
    const newest = reports.first();
    expect(await newest.locator('[data-test="report-outcome"]').textContent()).toContain('Cracked');
    const text = await newest.textContent();
    expect(text).toContain('Harbour Lights');
    expect(text).toContain('3 days in use');
    expect(text).toContain('Drops or impacts');
    expect(text).toContain('Recipe 1: PETG');
    expect(text).toContain(member.displayName);
    expect(await newest.locator('[data-test="flag-report"]').count()).toBe(0); // not on one's own report

    // the proven sentence, the held-up counts and the rating follow
    expect(await sentence.textContent()).toContain('2 of 3 set reports');
    expect(await page.locator('[data-test="held-up"]').textContent()).toMatch(/2\s*held up or kept working\s*1\s*did not/);
    expect(await page.locator('[data-test="my-rating"]').textContent()).toContain('2 of 5');
    expect(await page.locator('[data-test="rating-summary"]').textContent()).toMatch(/1 rating\s*· mean 2\.0 of 5/);
    // the photo is cleaned on the server, then shown
    await newest.locator('img').waitFor({ timeout: 30_000 });
    await rig.screenshot('rate-and-report-3-part-after-phone');

    await page.setViewportSize({ width: 1280, height: 800 });
    await page.reload();
    await page.locator('.rs-evidence-chart-spot').scrollIntoViewIfNeeded();
    await page.locator('[data-test="evidence-chart"]').waitFor();
    await rig.screenshot('rate-and-report-4-part-after-desk');
  });
});
