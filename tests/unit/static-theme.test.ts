import { Theme } from '@primeuix/styled';
import ButtonStyle from 'primevue/button/style';
import SelectStyle from 'primevue/select/style';
import { describe, expect, it } from 'vitest';
import { commonCss, componentCss } from '../../src/theme/static-css.ts';

// The reference is PrimeVue's own server-side rendering API (BaseStyle.getThemeStyleSheet /
// getCommonThemeStyleSheet), which writes the same <style> elements its components inject at run time.
const rulesOf = (sheet: string) =>
  sheet
    .replace(/<\/?style[^>]*>/g, '\n')
    .replace(/--p-[\w-]+:[^;{}]*;?/g, '')
    .replace(/[^{}]+\{\}/g, '')
    .replace(/\s+/g, '');
const declared = (sheet: string) => new Set([...sheet.matchAll(/(--p-[\w-]+):/g)].map((m) => m[1]));
const read = (sheet: string) => new Set([...sheet.matchAll(/var\((--p-[\w-]+)/g)].map((m) => m[1]));

describe('static theme', () => {
  it.each([
    ['button', ButtonStyle],
    ['select', SelectStyle],
  ])('static theme · %s · the rules PrimeVue renders for our preset, every variable they read declared', async (dir, style) => {
    const common = await commonCss();
    const ours = await componentCss(dir);
    // componentCss set the theme to our preset; PrimeVue's own rendering uses the same Theme
    expect(Theme.getPreset()).toBeTruthy();
    const reference = (style as unknown as { getThemeStyleSheet(): string }).getThemeStyleSheet();
    expect(rulesOf(ours)).toBe(rulesOf(reference));
    const available = new Set([...declared(common), ...declared(ours)]);
    const missing = [...read(ours)].filter((name) => !available.has(name));
    expect(missing).toEqual([]);
  });

  it('static theme · common sheet · palette and global rules, unused palette left out', async () => {
    const common = await commonCss();
    expect(common).toContain('--p-primary-color:');
    expect(common).toContain('@layer primevue-global{');
    // Aura's pink palette is read by no component the app uses
    expect(common).not.toContain('--p-pink-500');
    const available = declared(common);
    expect([...read(common)].filter((name) => !available.has(name))).toEqual([]);
  });
});
