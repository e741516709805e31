import { describe, expect, it } from 'vitest';
import { fitPartToBuild, rangesOverlap, sameSizeName, type FitBuild, type FitPart } from '@shared/build-fit';

// The demo member's build and three demo-like parts (server/demo/0003-demo-parts.ts).
const carWeek: FitBuild = {
  body: 'korvel-kx8',
  mounts: ['rods-15-60', 'screw-1-4-20'],
  keySizes: [{ name: 'lens barrel', valueMm: 80, tolMm: 0.5 }],
};
const cradle: FitPart = {
  bodies: ['korvel-kx8', 'halden-h6'],
  mounts: ['rods-15-60', 'screw-1-4-20'],
  keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }],
};
const gearRing: FitPart = { bodies: [], mounts: ['gear-0-8'], keyDimensions: [{ name: 'barrel bore', valueMm: 80.4, tolMm: 0.3 }] };
const shoeCover: FitPart = { bodies: ['peregrine-p1'], mounts: ['accessory-shoe'], keyDimensions: [] };

const labels = {
  body: (s: string) => ({ 'korvel-kx8': 'Korvel KX-8', 'peregrine-p1': 'Peregrine Digital P1 Documentary' })[s] ?? s,
  mount: (s: string) => ({ 'rods-15-60': '15 mm rods at 60 mm', 'screw-1-4-20': '1/4-20 UNC screw' })[s] ?? s,
};

/** The definition of overlapping closed intervals: the larger lower end is not above the smaller upper end. */
function overlapByEnds(a: { valueMm: number; tolMm: number }, b: { valueMm: number; tolMm: number }): boolean {
  const lo = Math.max(Math.round((a.valueMm - a.tolMm) * 1e6), Math.round((b.valueMm - b.tolMm) * 1e6));
  const hi = Math.min(Math.round((a.valueMm + a.tolMm) * 1e6), Math.round((b.valueMm + b.tolMm) * 1e6));
  return lo <= hi;
}

describe('rangesOverlap · value ± tolerance', () => {
  it('rangesOverlap · a 15 mm rod bore asked as 15 ± 0.1 against 15.2 ± 0.2 · overlaps (14.9–15.1 meets 15.0–15.4)', () => {
    // interval arithmetic (from memory): [a−ta, a+ta] and [b−tb, b+tb] meet when |a−b| ≤ ta+tb
    expect(rangesOverlap({ name: 'x', valueMm: 15, tolMm: 0.1 }, { name: 'x', valueMm: 15.2, tolMm: 0.2 })).toBe(true);
  });
  it('rangesOverlap · ranges that only touch (80 ± 0.1 and 80.4 ± 0.3) · overlap, edges included', () => {
    // 80.1 is both the upper end of one and the lower end of the other: 0.4 ≤ 0.1 + 0.3 exactly
    expect(rangesOverlap({ name: 'x', valueMm: 80, tolMm: 0.1 }, { name: 'x', valueMm: 80.4, tolMm: 0.3 })).toBe(true);
  });
  it('rangesOverlap · ranges 0.001 mm apart · do not overlap', () => {
    expect(rangesOverlap({ name: 'x', valueMm: 80, tolMm: 0.099 }, { name: 'x', valueMm: 80.4, tolMm: 0.3 })).toBe(false);
  });
  it('rangesOverlap · every pair on a 0.1 mm grid · agrees with comparing the interval ends', () => {
    for (let a = 0; a <= 20; a++)
      for (let ta = 0; ta <= 5; ta++)
        for (let b = 0; b <= 20; b++)
          for (let tb = 0; tb <= 5; tb++) {
            const x = { name: 'x', valueMm: 10 + a / 10, tolMm: ta / 10 };
            const y = { name: 'y', valueMm: 10 + b / 10, tolMm: tb / 10 };
            expect(rangesOverlap(x, y)).toBe(overlapByEnds(x, y));
          }
  });
});

describe('sameSizeName · naming', () => {
  it('sameSizeName · "Lens  Barrel" and "lens barrel diameter" · the same size', () => {
    expect(sameSizeName('Lens  Barrel', 'lens barrel diameter')).toBe(true);
  });
  it('sameSizeName · "rod bore" and "barrel bore" · different sizes', () => {
    expect(sameSizeName('rod bore', 'barrel bore')).toBe(false);
  });
  it('sameSizeName · "lens barrel" and "barrel bore" · the same size (a gear ring’s bore sits on the barrel)', () => {
    expect(sameSizeName('lens barrel', 'barrel bore')).toBe(true);
    expect(sameSizeName('barrel diameter', 'barrel bore')).toBe(true);
  });
  it('sameSizeName · "plate width" and "plate height" · different measures of one thing', () => {
    expect(sameSizeName('plate width', 'plate height')).toBe(false);
    expect(sameSizeName('monitor width', 'Monitor widths')).toBe(true);
  });
});

describe('fitPartToBuild · worked examples', () => {
  it('fitPartToBuild · receiver cradle listing the KX-8 with both of the build’s mounts · fits, naming body and mounts', () => {
    const r = fitPartToBuild(cradle, carWeek, labels);
    expect(r.verdict).toBe('fits');
    expect(r.summary).toBe('Made for the Korvel KX-8 · Shares 15 mm rods at 60 mm, 1/4-20 UNC screw');
  });

  it('fitPartToBuild · gear ring with no body and a gear mount the build lacks · not for this build, though its bore meets the barrel', () => {
    const r = fitPartToBuild(gearRing, carWeek, labels);
    expect(r.verdict).toBe('not');
    expect(r.reasons.map((x) => x.kind)).toEqual(['body-agnostic', 'mounts-none-shared', 'size-within']);
  });

  it('fitPartToBuild · the same gear ring for a build that lists the gear · fits, and its barrel bore meets the lens barrel', () => {
    // 80.4 ± 0.3 (80.1–80.7) against 80 ± 0.5 (79.5–80.5): they overlap from 80.1 to 80.5
    const r = fitPartToBuild(gearRing, { ...carWeek, mounts: ['gear-0-8'], keySizes: [{ name: 'barrel', valueMm: 80, tolMm: 0.5 }] });
    expect(r.verdict).toBe('fits');
    expect(r.reasons.find((x) => x.kind === 'size-within')?.text).toBe('barrel bore 80.4 ± 0.3 mm meets your barrel 80 ± 0.5 mm');
  });

  it('fitPartToBuild · gear ring for a 95 mm barrel · not, the size misses', () => {
    const r = fitPartToBuild(gearRing, { body: null, mounts: ['gear-0-8'], keySizes: [{ name: 'barrel', valueMm: 95, tolMm: 0.5 }] });
    expect(r.verdict).toBe('not');
    expect(r.summary).toBe('barrel bore 80.4 ± 0.3 mm misses your barrel 95 ± 0.5 mm');
  });

  it('fitPartToBuild · part made for another body only · not, naming the body it is made for', () => {
    const r = fitPartToBuild(shoeCover, { body: 'korvel-kx8', mounts: ['accessory-shoe'], keySizes: [] }, labels);
    expect(r.verdict).toBe('not');
    expect(r.summary).toBe('Made for Peregrine Digital P1 Documentary, not the Korvel KX-8');
  });

  it('fitPartToBuild · body-agnostic part sharing a mount · fits', () => {
    const yoke: FitPart = { bodies: [], mounts: ['screw-1-4-20', 'accessory-shoe'], keyDimensions: [] };
    expect(fitPartToBuild(yoke, carWeek).verdict).toBe('fits');
  });

  it('fitPartToBuild · body-agnostic part with no mounts, build with no body · may fit', () => {
    const cap: FitPart = { bodies: [], mounts: [], keyDimensions: [{ name: 'cap depth', valueMm: 12, tolMm: 0 }] };
    const r = fitPartToBuild(cap, { body: null, mounts: ['screw-1-4-20'], keySizes: [] });
    expect(r.verdict).toBe('may-fit');
    expect(r.reasons.every((x) => x.weight === 0)).toBe(true);
  });

  it('fitPartToBuild · part lists bodies but the build names none, no mounts in common declared · may fit', () => {
    expect(fitPartToBuild({ bodies: ['halden-h6'], mounts: [], keyDimensions: [] }, { body: null, mounts: [], keySizes: [] }).verdict).toBe('may-fit');
  });

  it('fitPartToBuild · body listed but a key size clashes · not (a clash outweighs a listed body)', () => {
    const r = fitPartToBuild({ ...cradle, keyDimensions: [{ name: 'lens barrel', valueMm: 95, tolMm: 0.2 }] }, carWeek);
    expect(r.verdict).toBe('not');
  });
});
