import { describe, expect, it } from 'vitest';
import { estimatePrint } from '@shared/estimate';
import { fitTestAdvice, type FitTestRecipe } from '@shared/fit-test';

// A 20 mm cube: 8000 mm³, 2400 mm², the trade reference's worked example geometry (analytic).
const cube = { volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20] as [number, number, number] };
const fit: FitTestRecipe = { purpose: 'fit-test', material: 'PLA', nozzleMm: 0.4, layerMm: 0.28, walls: 2, topBottomLayers: 3, infillPct: 10 };
const set: FitTestRecipe = { purpose: 'set-ready', material: 'PETG', nozzleMm: 0.4, layerMm: 0.2, walls: 4, topBottomLayers: 5, infillPct: 40 };

describe('fit test first · quick check before the durable print', () => {
  it('fit test first · two recipes · compared with the same estimate model, with what a wrong fit would waste', () => {
    const advice = fitTestAdvice(cube, [set, fit], 1)!;
    expect(advice.fitTest).toEqual(estimatePrint(cube, fit));
    expect(advice.setReady).toEqual(estimatePrint(cube, set));
    expect(advice.savedMinIfWrong).toBeCloseTo(advice.setReady.timeMin - advice.fitTest.timeMin, 9);
    expect(advice.savedGIfWrong).toBeGreaterThan(0);
    // fewer walls, thicker layers and sparse infill print faster (monotonic sanity of the model)
    expect(advice.timeShare).toBeGreaterThan(0);
    expect(advice.timeShare).toBeLessThan(1);
  });

  it('fit test first · a recipe or the key dimensions missing · no advice', () => {
    expect(fitTestAdvice(cube, [set], 2)).toBeNull();
    expect(fitTestAdvice(cube, [fit], 2)).toBeNull();
    expect(fitTestAdvice(cube, [fit, set], 0)).toBeNull();
  });
});
