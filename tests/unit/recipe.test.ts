import { describe, expect, it } from 'vitest';
import { INFILL_PATTERNS, MAX_LAYER_TO_NOZZLE, recipeSchema, type RecipeInput } from '@shared/schemas/recipe';
import { fieldErrors } from '@shared/validation';

const valid: RecipeInput = {
  purpose: 'set-ready',
  material: 'PETG',
  nozzleMm: 0.4,
  layerMm: 0.2,
  walls: 3,
  topBottomLayers: 5,
  infillPct: 30,
  infillPattern: 'gyroid',
  hotendC: 240,
  bedC: 80,
  speedMmS: 60,
  supports: 'bed-only',
};

function errorsFor(patch: Record<string, unknown>): Record<string, string> {
  const result = recipeSchema.safeParse({ ...valid, ...patch });
  return result.success ? {} : fieldErrors(result.error);
}

describe('recipeSchema', () => {
  it('recipeSchema · a complete recipe · accepted, notes trimmed', () => {
    const parsed = recipeSchema.parse({
      ...valid,
      orientationNote: '  Print on its back so the layers run along the clamp.  ',
      printerBedMm: [220, 220, 250],
      resultNotes: 'Held a 7 in monitor all day.',
    });
    expect(parsed.orientationNote).toBe('Print on its back so the layers run along the clamp.');
    expect(parsed.printerBedMm).toEqual([220, 220, 250]);
  });

  it.each([
    ['nozzleMm', 0.1, 1.2, 0.09, 1.21],
    ['walls', 1, 20, 0, 21],
    ['topBottomLayers', 0, 50, -1, 51],
    ['infillPct', 0, 100, -0.1, 100.1],
    ['hotendC', 150, 320, 149, 321],
    ['bedC', 0, 130, -1, 131],
    ['speedMmS', 5, 600, 4.9, 601],
  ] as const)('recipeSchema · %s · accepts %d and %d, rejects %d and %d', (field, min, max, below, above) => {
    // A nozzle large enough for the default layer, so only the field under test can fail.
    const base = field === 'nozzleMm' ? { layerMm: 0.08 } : {};
    expect(errorsFor({ ...base, [field]: min })).toEqual({});
    expect(errorsFor({ ...base, [field]: max })).toEqual({});
    expect(errorsFor({ ...base, [field]: below })[field]).toMatch(/between|at least/);
    expect(errorsFor({ ...base, [field]: above })[field]).toMatch(/between|at most/);
  });

  it('recipeSchema · layer height alone · bounded', () => {
    expect(errorsFor({ layerMm: 0.04 })).toEqual({});
    expect(errorsFor({ layerMm: 0.039 }).layerMm).toBe('The layer height must be between 0.04 and 1 mm.');
  });

  it('recipeSchema · walls and layers · whole numbers asked for', () => {
    expect(errorsFor({ walls: 2.5 }).walls).toBe('Enter a whole number of walls.');
    expect(errorsFor({ topBottomLayers: 3.2 }).topBottomLayers).toBe('Enter a whole number of top and bottom layers.');
  });

  it('recipeSchema · a wrong choice · the choices named', () => {
    expect(errorsFor({ material: 'wood' }).material).toMatch(/^Choose the material: PLA, PETG, /);
    expect(errorsFor({ purpose: 'final' }).purpose).toBe('Choose the purpose: fit-test, set-ready.');
    expect(errorsFor({ supports: 'tree' }).supports).toBe('Choose the supports: none, bed-only, everywhere.');
    expect(errorsFor({ infillPattern: 'stars' }).infillPattern).toBe(`Choose the infill pattern: ${INFILL_PATTERNS.join(', ')}.`);
  });

  it('recipeSchema · text where a number belongs · rejected', () => {
    expect(errorsFor({ nozzleMm: '0.4' }).nozzleMm).toBe('Enter the nozzle diameter as a number in mm.');
  });

  describe('layer height against nozzle (at most 80 %, common practice)', () => {
    it('layer height against nozzle · the limit · 80 %', () => {
      expect(MAX_LAYER_TO_NOZZLE).toBe(0.8);
    });

    it.each([
      [0.4, 0.32, 0.33],
      [0.6, 0.48, 0.49],
      [0.25, 0.2, 0.21],
      [0.8, 0.64, 0.65],
    ])('layer height against nozzle · a %d mm nozzle · allows %d mm but not %d mm', (nozzleMm, largest, tooThick) => {
      expect(errorsFor({ nozzleMm, layerMm: largest })).toEqual({});
      expect(errorsFor({ nozzleMm, layerMm: tooThick })).toEqual({
        layerMm: `A ${tooThick} mm layer is too thick for a ${nozzleMm} mm nozzle; use at most ${largest} mm (80 % of the nozzle).`,
      });
    });

    it('layer height against nozzle · other field errors too · reported alongside them', () => {
      expect(Object.keys(errorsFor({ layerMm: 0.36, walls: 0, material: 'wood' })).sort()).toEqual(['layerMm', 'material', 'walls']);
    });

    it('layer height against nozzle · an invalid nozzle · not reported', () => {
      expect(errorsFor({ nozzleMm: 'big', layerMm: 0.36 })).toEqual({
        nozzleMm: 'Enter the nozzle diameter as a number in mm.',
      });
    });
  });

  it('recipeSchema · printer bed size · checked', () => {
    expect(errorsFor({ printerBedMm: [220, 0, 250] })['printerBedMm.1']).toBe('Each printer bed size must be more than 0 mm.');
    expect(errorsFor({ printerBedMm: [220, 220] }).printerBedMm).toBe('Give the printer bed as three sizes: x, y and z in mm.');
  });

  it('recipeSchema · notes · limited', () => {
    expect(errorsFor({ orientationNote: 'x'.repeat(500) })).toEqual({});
    expect(errorsFor({ orientationNote: 'x'.repeat(501) }).orientationNote).toBe('Keep the orientation note to 500 characters or fewer.');
    expect(errorsFor({ resultNotes: 'x'.repeat(2000) })).toEqual({});
    expect(errorsFor({ resultNotes: 'x'.repeat(2001) }).resultNotes).toBe('Keep the result notes to 2000 characters or fewer.');
  });

  it('recipeSchema · a missing recipe · rejected as a whole', () => {
    const result = recipeSchema.safeParse(null);
    expect(result.success).toBe(false);
    expect(result.error && fieldErrors(result.error)).toEqual({ _: 'Send the print recipe with all its settings.' });
  });
});
