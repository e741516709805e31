import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Jimp } from 'jimp';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';
import { boxStl } from '../helpers/meshes';

let rig: BrowserRig;
let dir: string;
const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

beforeAll(async () => {
  rig = await startBrowserRig();
  dir = mkdtempSync(join(tmpdir(), 'rigshelf-e2e-submit-'));
  // the box is made by @jscad/modeling and written by its own STL serializer (tests/helpers/meshes.ts)
  writeFileSync(join(dir, 'rod-clamp.stl'), boxStl(20, 30, 10));
  writeFileSync(join(dir, 'on-the-rig.jpg'), await new Jimp({ width: 64, height: 48, color: 0x336699ff }).getBuffer('image/jpeg'));
});
afterAll(async () => {
  if (dir) rmSync(dir, { recursive: true, force: true });
  await rig?.close();
});

async function nextStep(page: Page) {
  await page.locator('[data-test="next-step"]').click();
}

describe('browser · submit a part', () => {
  it('submit flow · demo member sends a 20 × 30 × 10 mm box with a photo · lands on the part page with the measured size', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    await page.locator('[data-test="nav-submit"]').click();
    await page.waitForURL((url) => url.pathname === '/parts/new');

    // 1 · what it is: leaving it empty shows the shared schema's messages inline
    await page.locator('#part-title').waitFor();
    await nextStep(page);
    await page.locator('.rs-error', { hasText: 'Choose a category from the list.' }).waitFor();
    await page.locator('#part-title').fill('Rod clamp test block');
    await page.locator('#part-summary').fill('A 20 × 30 × 10 mm block to check the submit flow end to end.');
    await page.getByText('Rods & mounting').click();
    await rig.screenshot('part-submit-1-details');
    await nextStep(page);

    // 2 · files: the browser measures the STL before anything is uploaded
    await page.locator('[data-test="model-input"]').setInputFiles(join(dir, 'rod-clamp.stl'));
    await page.locator('[data-test="photo-input"]').setInputFiles(join(dir, 'on-the-rig.jpg'));
    const preview = page.locator('[data-test="model-size"]');
    await preview.waitFor();
    expect(await preview.textContent()).toContain('20 × 30 × 10 mm');
    await page.locator('[data-test="photo-thumb"] img').waitFor();
    await rig.screenshot('part-submit-2-files');
    await nextStep(page);

    // 3 · what it fits: a 15 mm rod mount and a key dimension typed in inches
    await page.getByText('15 mm rods at 60 mm').click();
    await page.getByRole('button', { name: 'rod bore' }).click();
    await page.locator('#dim-value-0').fill('0.6 in');
    await page.locator('#dim-tol-0').fill('0.2');
    await page.getByText('= 15.24 mm').waitFor();
    await rig.screenshot('part-submit-3-fit');
    await nextStep(page);

    // 4 · one set-ready PLA recipe
    await page.locator('#recipe-0-infillPct').fill('30');
    await page.locator('#recipe-0-speedMmS').fill('60');
    await page.locator('#recipe-0-hotendC').fill('210');
    await page.locator('#recipe-0-bedC').fill('60');
    await rig.screenshot('part-submit-4-recipes');
    await nextStep(page);

    // 5 · licence and a load flag, which brings up the cautions
    await page.locator('#licence').click();
    await page
      .getByRole('option', { name: /CC BY 4\.0/ })
      .first()
      .click();
    await page.locator('[data-test="flag-carriesLoad"]').check();
    await page.locator('#tested-load').fill('2');
    await page.locator('[data-test="cautions"]').getByText('safety cable').waitFor();
    await rig.screenshot('part-submit-5-licence');
    await nextStep(page);

    // 6 · check and send
    await page.locator('[data-test="review-problems"]').waitFor({ state: 'detached' });
    await rig.screenshot('part-submit-6-review');
    await page.locator('[data-test="send"]').click();

    await page.waitForURL((url) => url.pathname === '/parts/rod-clamp-test-block');
    await page.getByText('Sent to the review desk').first().waitFor();
    const size = page.locator('[data-test="part-size"]');
    await size.waitFor();
    expect(await size.textContent()).toContain('20 × 30 × 10 mm');
    expect(await page.locator('[data-test="revision-banner"]').textContent()).toContain('only you and the moderators');
    expect(await page.locator('[data-test="cautions"]').textContent()).toContain('tested load of 2 kg');
    expect(await page.locator('.rs-dims').textContent()).toContain('rod bore 15.24 ± 0.20 mm');
    const shot = await rig.screenshot('part-submit-7-part-page');
    expect(existsSync(shot)).toBe(true);
  });
  it('submit flow · a draft with a model file · survives a reload and leaving the form, until discarded', async () => {
    const { page } = rig;
    // the browser's own "leave this site?" question on reload: yes
    const acceptLeave = (d: { type(): string; accept(): Promise<void> }) => void (d.type() === 'beforeunload' && d.accept());
    page.on('dialog', acceptLeave);
    const kept = () =>
      page.evaluate(
        () =>
          new Promise<number>((resolve) => {
            const open = indexedDB.open('rigshelf-drafts');
            open.onsuccess = () => {
              const db = open.result;
              if (!db.objectStoreNames.contains('drafts')) return resolve(0);
              const count = db.transaction('drafts').objectStore('drafts').count();
              count.onsuccess = () => resolve(count.result);
            };
          }),
      );

    await page.goto('/parts/new');
    await page.locator('#part-title').fill('Draft that survives a reload');
    await page.locator('#part-summary').fill('Typed on set, with the model chosen, then the page reloaded.');
    await page.getByText('Rods & mounting').click();
    await nextStep(page);
    await page.locator('[data-test="model-input"]').setInputFiles(join(dir, 'rod-clamp.stl'));
    await page.locator('[data-test="model-size"]').waitFor();
    await expect.poll(kept).toBe(1);

    await page.reload();
    await page.locator('[data-test="draft-resumed"]').waitFor();
    expect(await page.locator('[data-test="model-size"]').textContent()).toContain('20 × 30 × 10 mm');
    await rig.screenshot('part-submit-draft-after-reload');

    // leaving through the app asks first; staying keeps the form
    await page.locator('[data-test="nav-search"]').first().click();
    const dialog = page.getByRole('alertdialog');
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain('kept on this device');
    await dialog.getByRole('button', { name: 'Stay here' }).click();
    expect(new URL(page.url()).pathname).toBe('/parts/new');
    await page.locator('[data-test="nav-search"]').first().click();
    await dialog.getByRole('button', { name: 'Leave the form' }).click();
    await page.waitForURL((u) => u.pathname === '/search');

    // coming back finds it, then discarding empties the form and the store
    await page.locator('[data-test="nav-submit"]').click();
    await page.locator('[data-test="draft-resumed"]').waitFor();
    await page.locator('[data-test="discard-draft"]').click();
    await dialog.getByRole('button', { name: 'Discard it' }).click();
    await page.locator('[data-test="draft-resumed"]').waitFor({ state: 'detached' });
    await page.goto('/parts/new');
    expect(await page.locator('#part-title').inputValue()).toBe('');
    await expect.poll(kept).toBe(0);
    page.off('dialog', acceptLeave);
  });
});
