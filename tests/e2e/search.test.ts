import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

const SPACER = 'V-style plate spacer, 6 mm';

function searchParams(url: string) {
  return new URL(url).searchParams;
}

describe('browser · search', () => {
  it('search · battery plate from the home page, V-style mount ticked, part opened, back · the search comes back from the address', async () => {
    const { page } = rig;
    await page.goto('/');

    // the home page's box hands the text to the search view
    await page.locator('[data-test="home-search"]').fill('battery plate');
    await page.locator('[data-test="home-search"]').press('Enter');
    await page.waitForURL((url) => url.pathname === '/search' && url.searchParams.get('q') === 'battery plate');
    const results = page.locator('[data-test="search-result"]');
    await results.first().waitFor();
    expect(await results.allTextContents()).toEqual(expect.arrayContaining([expect.stringContaining(SPACER)]));
    await rig.screenshot('search-1-battery-plate');

    // the mount list counts the parts each tick would leave, and ticking one goes into the address
    const vStyle = page.locator('[data-test="facet-mount"] [data-test="facet-option-battery-v-style"]');
    await vStyle.waitFor();
    expect(await vStyle.textContent()).toContain('V-style battery plate');
    await vStyle.click();
    await page.waitForURL((url) => url.searchParams.getAll('mount').includes('battery-v-style'));
    const params = searchParams(page.url());
    expect(params.get('q')).toBe('battery plate');
    expect(params.getAll('mount')).toEqual(['battery-v-style']);
    await page.locator('[data-test="search-chosen"]', { hasText: 'V-style battery plate' }).waitFor();
    // the whole demo shelf holds several V-style parts with "battery" or "plate"; the spacer is among them
    await page.locator('[data-test="results-heading"]', { hasText: /\d+ parts? for/ }).waitFor();
    await results.filter({ hasText: SPACER }).waitFor();
    await rig.screenshot('search-2-v-style-ticked');

    // the result opens the part page
    await results.filter({ hasText: SPACER }).click();
    await page.waitForURL((url) => url.pathname === '/parts/v-style-plate-spacer-6-mm');
    await page.locator('h1', { hasText: SPACER }).waitFor();
    await rig.screenshot('search-3-part-page');

    // back: the same search, read from the address again
    await page.goBack();
    await page.waitForURL((url) => url.pathname === '/search');
    const back = searchParams(page.url());
    expect(back.get('q')).toBe('battery plate');
    expect(back.getAll('mount')).toEqual(['battery-v-style']);
    expect(await page.locator('[data-test="search-q"]').inputValue()).toBe('battery plate');
    await results.filter({ hasText: SPACER }).waitFor();
    expect(await vStyle.locator('input[type="checkbox"]').isChecked()).toBe(true);
    const shot = await rig.screenshot('search-4-back-restored');
    expect(existsSync(shot)).toBe(true);

    // one step further back undoes the tick: each choice is its own history entry
    await page.goBack();
    await page.waitForURL((url) => url.pathname === '/search' && url.searchParams.getAll('mount').length === 0);
    expect(searchParams(page.url()).get('q')).toBe('battery plate');
    await page.locator('[data-test="search-chosen"]').waitFor({ state: 'detached' });
  });

  it('search · unreadable query syntax and a space without its third side · the messages sit beside their inputs', async () => {
    const { page } = rig;
    await page.goto('/search?q=' + encodeURIComponent('mounts:'));
    const qError = page.locator('[data-test="search-q-error"]');
    await qError.waitFor();
    expect(await qError.textContent()).toContain('could not be read');

    await page.goto('/search');
    await page.locator('[data-test="fit-x"]').fill('120');
    await page.locator('[data-test="fit-y"]').fill('80');
    await page.locator('[data-test="fit-y"]').press('Enter');
    const fitError = page.locator('[data-test="fit-error"]');
    await fitError.waitFor();
    expect(await fitError.textContent()).toContain('all three sides');
    expect(searchParams(page.url()).get('fit')).toBeNull();

    // in inches the readback gives millimetres and the address carries the unit
    await page.locator('[data-test="fit-unit"]').getByText('inches').click();
    await page.locator('[data-test="fit-z"]').fill('2');
    await page.locator('[data-test="fit-z"]').press('Enter');
    await page.waitForURL((url) => url.searchParams.get('fit') === '120inx80inx2in');
    await page.locator('[data-test="fit-x"]').fill('4.5');
    await page.locator('[data-test="fit-y"]').fill('3');
    await page.locator('[data-test="fit-y"]').press('Enter');
    await page.waitForURL((url) => url.searchParams.get('fit') === '4.5inx3inx2in');
    await page.getByText('= 114.3 × 76.2 × 50.8 mm').waitFor();
    await rig.screenshot('search-5-inline-messages');
  });

  it('search · "receiver bracket for v-style" typed and sent with the keyboard, on a laptop and a phone · partial matches say quietly what matched', async () => {
    const { page } = rig;
    for (const [name, viewport] of [
      ['laptop', { width: 1366, height: 800 }],
      ['phone', { width: 390, height: 844 }],
    ] as const) {
      await page.setViewportSize(viewport);
      await page.goto('/search');
      const box = page.locator('#search-q');
      await box.focus();
      await page.keyboard.type('receiver bracket for v-style');
      await page.keyboard.press('Enter');
      await page.waitForURL((url) => url.searchParams.get('q') === 'receiver bracket for v-style');
      const results = page.locator('[data-test="search-result"]');
      await results.first().waitFor();
      // no demo part matches every word: the page says so and each card names what it matched
      await page.locator('[data-test="search-partial-head"]').waitFor();
      const partial = page.locator('[data-test="result-partial"]');
      expect(await partial.count()).toBe(await results.count());
      const texts = await results.allTextContents();
      expect(texts).toEqual(expect.arrayContaining([expect.stringContaining('Receiver cradle'), expect.stringContaining('V-style plate spacer')]));
      expect(await partial.first().textContent()).toMatch(/Matches “[^”]+”.*no “/);
      await rig.screenshot(`search-partial-${name}`);
    }
    await page.setViewportSize({ width: 1280, height: 800 });
  });
});
