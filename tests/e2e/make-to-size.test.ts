import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyseModelFile } from '@shared/mesh';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { ARTIFACTS, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

describe('browser · make to size', () => {
  it('make to size · demo member makes a gear ring for an 82 mm barrel · sees preview and estimate, downloads the 3MF, adds it to a kit', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    await page.locator('[data-test="nav-make"]').click();
    await page.locator('[data-test="maker-gear-ring"]').click();
    await page.waitForURL((url) => url.pathname === '/make/gear-ring');

    // the live preview (made in the page's worker) and its figures
    await page.locator('[data-test="make-figures"]').waitFor();
    await page.locator('#make-barrelDiameterMm').fill('82');
    // module 0.8 (the default): the root circle must clear 82 mm plus the wall, so the outside grows past 86 mm
    await page.locator('[data-test="make-figures"]', { hasText: /88\.8 × 88\.8/ }).waitFor();
    await page.locator('[data-test="model-viewer"] canvas').waitFor();
    expect(await page.locator('[data-test="make-sound"]').textContent()).toContain('closed');

    // the server's estimate and bed fit for one of the member's printers
    await page.locator('#make-printer').selectOption({ label: 'Cart printer' });
    await page.locator('[data-test="make-bed-fit"]', { hasText: 'Cart printer' }).waitFor();
    const estimate = (await page.locator('[data-test="make-estimate"]').textContent()) ?? '';
    expect(estimate).toMatch(/\d+(\.\d)? g\s*filament/);
    await rig.screenshot('make-1-gear-ring');

    // the 3MF download
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="make-download-3mf"]').click()]);
    expect(download.suggestedFilename()).toMatch(/^lens-gear-ring.*\.3mf$/);
    const saved = join(ARTIFACTS, 'make-gear-ring.3mf');
    await download.saveAs(saved);
    const analysis = analyseModelFile(new Uint8Array(readFileSync(saved)));
    expect(analysis.watertight).toBe(true);
    expect(analysis.sizeMm[0]).toBeCloseTo(88.8, 0);

    // into the demo kit
    await page.locator('[data-test="make-kit"]').selectOption({ label: 'The Salt Road — car unit' });
    await page.locator('[data-test="make-add-to-kit"]').click();
    await page.locator('.p-toast-message', { hasText: 'Added to The Salt Road — car unit' }).waitFor();

    await page.locator('[data-test="nav-kits"]').click();
    await page.getByRole('link', { name: 'The Salt Road — car unit' }).first().click();
    const item = page.locator('[data-test="kit-items"] > li[data-part="made-gear-ring"]');
    await item.waitFor();
    expect(await item.textContent()).toContain('Lens gear ring, module 0.8, barrel diameter 82 mm');
    await item.locator('[data-test="item-estimate"]').waitFor();
    await rig.screenshot('make-2-kit');
  });
});
