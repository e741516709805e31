import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';
import { plainPng } from '../helpers/photos';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

// the demo shelf's plate adapter: it puts a V-style plate where the cheese plate was
const PLATE_ADAPTER = 'V-style plate spacer, 6 mm';
const DESK = { width: 1366, height: 800 };
const PHONE = { width: 390, height: 844 };

describe('browser · camera builds and wanted parts', () => {
  it('demo member · searches as a crew types, saves a build, asks the crew from an empty search · the request is on the board', async () => {
    const { page } = rig;
    await page.setViewportSize(DESK);
    await signInThroughForm(page, DEMO_ACCOUNTS.find((a) => a.role === 'member')!.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    // 1. the way crews type: the plate adapter is among the first three
    await page.locator('[data-test="home-search"]').fill('receiver plate for v-style');
    await page.locator('[data-test="home-search"]').press('Enter');
    await page.waitForURL((url) => url.pathname === '/search' && url.searchParams.get('q') === 'receiver plate for v-style');
    const results = page.locator('[data-test="search-result"]');
    await results.first().waitFor();
    const firstThree = (await results.allTextContents()).slice(0, 3);
    expect(
      firstThree.some((text) => text.includes(PLATE_ADAPTER)),
      JSON.stringify(firstThree),
    ).toBe(true);
    await rig.screenshot('builds-1-receiver-plate-desk');

    // 2. a new build, from the switch on the search page
    await page.locator('[data-test="build-switch"]').getByText('Your builds').click();
    await page.waitForURL((url) => url.pathname === '/builds');
    await page.locator('[data-test="new-build"]').click();
    await page.waitForURL((url) => url.searchParams.get('new') === '1');
    await page.locator('[data-test="build-name"]').fill('C-camera, rain day');
    await page.locator('[data-test="build-body"]').selectOption({ label: 'Korvel KX-8' });
    await page.locator('[data-test="build-mount-battery-v-style"]').check();
    await page.locator('[data-test="build-mount-screw-1-4-20"]').check();
    await rig.screenshot('builds-2-new-build-desk');
    await page.locator('[data-test="save-build"]').click();
    await page.waitForURL((url) => url.searchParams.has('saved'));
    const card = page.locator('[data-test="builds"] li', { hasText: 'C-camera, rain day' });
    await card.waitFor();
    expect(await card.textContent()).toContain('Korvel KX-8');
    const buildId = new URL(page.url()).searchParams.get('saved')!;

    // 3. the shelf for that build: every result carries its fit
    await page.locator(`[data-test="search-with-build-${buildId}"]`).click();
    await page.waitForURL((url) => url.pathname === '/search' && url.searchParams.get('build') === buildId);
    await page.locator('[data-test="fit-badge"]').first().waitFor();
    expect(await page.locator('[data-test="fit-badge"]').count()).toBe(await results.count());
    expect(await page.locator('[data-test="fit-badge"]').first().getAttribute('data-verdict')).toBe('fits');
    await rig.screenshot('builds-3-search-with-build-desk');

    // 4. nothing on the shelf: ask the crew, with the build's body and mounts already filled in
    await page.setViewportSize(PHONE);
    await page.locator('[data-test="search-q"]').fill('gimbal counterweight');
    await page.locator('[data-test="search-q"]').press('Enter');
    await page.waitForURL((url) => url.searchParams.get('q') === 'gimbal counterweight' && url.searchParams.get('build') === buildId);
    await page.locator('[data-test="ask-crew"]').waitFor();
    await rig.screenshot('builds-4-ask-the-crew-phone');
    await page.locator('[data-test="ask-crew-button"]').click();
    await page.waitForURL((url) => url.pathname === '/wanted/new' && url.searchParams.get('build') === buildId);
    await page.locator('[data-test="wanted-from-search"]', { hasText: 'C-camera, rain day' }).waitFor();
    expect(await page.locator('[data-test="wanted-title"]').inputValue()).toBe('Gimbal counterweight');
    expect(await page.locator('[data-test="wanted-mount-battery-v-style"]').isChecked()).toBe(true);
    await page.locator('[data-test="wanted-title"]').fill('Gimbal counterweight that clamps to a V-style plate');
    await page.locator('[data-test="wanted-needed-by"]').fill('2026-05-04');
    await page.locator('[data-test="wanted-photo"]').setInputFiles({ name: 'sketch.png', mimeType: 'image/png', buffer: await plainPng() });
    await rig.screenshot('builds-5-wanted-form-phone');
    await page.locator('[data-test="wanted-post"]').click();
    await page.waitForURL((url) => /^\/wanted\/\d+$/.test(url.pathname));
    await page.locator('[data-test="wanted-heading"]', { hasText: 'Gimbal counterweight that clamps to a V-style plate' }).waitFor();
    expect(await page.locator('main, body').first().textContent()).toContain('Korvel KX-8');
    await rig.screenshot('builds-6-wanted-request-phone');

    // 5. on the board for everyone
    await page.setViewportSize(DESK);
    await page.goto('/wanted');
    await page.locator('[data-test="wanted-card"]', { hasText: 'Gimbal counterweight that clamps to a V-style plate' }).waitFor();
    await rig.screenshot('builds-7-wanted-board-desk');
  });
});
