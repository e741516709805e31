import { describe, expect, it } from 'vitest';
import { LABEL_SHEETS, labelLink, labelPages, sheetMargins } from '@shared/labels';

describe('label sheets', () => {
  it('sheetMargins · A4 21-up · the grid is centred (7.25 mm sides, 15.15 mm top)', () => {
    // 210 − (3 × 63.5 + 2 × 2.5) = 14.5 → 7.25 a side; 297 − 7 × 38.1 = 30.3 → 15.15 (arithmetic on the
    // common 21-up layout's figures, from memory)
    const m = sheetMargins(LABEL_SHEETS.a4);
    expect(m.leftMm).toBeCloseTo(7.25, 6);
    expect(m.topMm).toBeCloseTo(15.15, 6);
  });

  it('sheetMargins · Letter 30-up · ½ in top and 3/16 in sides, as that layout is usually given', () => {
    // 30-up Letter (2⅝ × 1 in labels, ⅛ in column gap): ½ in top margin, 3/16 in side margin (from memory)
    const m = sheetMargins(LABEL_SHEETS.letter);
    expect(m.topMm).toBeCloseTo(0.5 * 25.4, 6);
    expect(m.leftMm).toBeCloseTo((3 / 16) * 25.4, 6);
  });

  it('labelPages · 2 + 20 pieces on A4 · one label per piece, 21 on the first page and 1 on the second', () => {
    const pages = labelPages(
      [
        { partSlug: 'rod-clamp', partTitle: 'Rod clamp', material: 'PETG', recipeId: 4, quantity: 2 },
        { partSlug: 'cable-clip', partTitle: 'Cable clip', material: 'PLA', recipeId: null, quantity: 20 },
      ],
      LABEL_SHEETS.a4,
    );
    expect(pages.map((p) => p.length)).toEqual([21, 1]);
    expect(pages[0][1]).toMatchObject({ partTitle: 'Rod clamp', copy: 2, of: 2 });
    expect(pages[1][0]).toMatchObject({ partTitle: 'Cable clip', copy: 20, of: 20 });
  });

  it('labelLink · slug and recipe · the on-set page of the part, recipe in the query', () => {
    expect(labelLink('https://shelf.example', { partSlug: 'rod-clamp', recipeId: 4 })).toBe('https://shelf.example/parts/rod-clamp/on-set?recipe=4');
    expect(labelLink('https://shelf.example', { partSlug: 'rod-clamp', recipeId: null })).toBe('https://shelf.example/parts/rod-clamp/on-set');
  });
});
