import { describe, expect, it } from 'vitest';
import {
  countFacets,
  dimensionCloseness,
  fitsWithin,
  keyDimensionDistance,
  matchesFilters,
  matchesKeyDimension,
  type FilterableDoc,
} from '@shared/search/filters';
import { inchesToMm } from '@shared/units';

type Triple = [number, number, number];

const PERMUTATIONS: Triple[] = [
  [0, 1, 2],
  [0, 2, 1],
  [1, 0, 2],
  [1, 2, 0],
  [2, 0, 1],
  [2, 1, 0],
];

/** The definition: some turn of the part (one of the 6 axis orders) fits side by side. */
function fitsSomeTurn(size: Triple, envelope: Triple): boolean {
  return PERMUTATIONS.some((p) => p.every((axis, i) => size[axis] <= envelope[i]));
}

describe('fitsWithin · envelope rule', () => {
  it('fitsWithin · every box and envelope on a 1..5 grid · agrees with trying all 6 axis orders', () => {
    // brute force over 125 × 125 cases: the sorted-sides rule equals the 6-permutation definition
    const grid: Triple[] = [];
    for (let x = 1; x <= 5; x++) for (let y = 1; y <= 5; y++) for (let z = 1; z <= 5; z++) grid.push([x, y, z]);
    let fits = 0;
    for (const size of grid) {
      for (const envelope of grid) {
        const expected = fitsSomeTurn(size, envelope);
        expect(fitsWithin(size, envelope), `${size} in ${envelope}`).toBe(expected);
        if (expected) fits += 1;
      }
    }
    // both outcomes occur often, so the agreement is not vacuous
    expect(fits).toBeGreaterThan(1000);
    expect(fits).toBeLessThan(grid.length ** 2 - 1000);
  });

  it('fitsWithin · random real-valued boxes · agrees with the 6 orders', () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31) * 200;
    for (let i = 0; i < 5000; i++) {
      const size: Triple = [rand(), rand(), rand()];
      const envelope: Triple = [rand(), rand(), rand()];
      expect(fitsWithin(size, envelope)).toBe(fitsSomeTurn(size, envelope));
    }
  });

  it('fitsWithin · a part that fits only when turned · fits', () => {
    // 40 tall, 120 long, 80 deep goes into a 120 × 80 × 40 space lying down
    expect(fitsWithin([40, 120, 80], [120, 80, 40])).toBe(true);
    for (const p of PERMUTATIONS) {
      const size = p.map((i) => [40, 120, 80][i]) as Triple;
      expect(fitsWithin(size, [120, 80, 40])).toBe(true);
    }
    // no turn helps when one side is too long
    expect(fitsWithin([121, 10, 10], [120, 80, 40])).toBe(false);
    // each side may be small enough alone, yet not all at once (two sides need the 120)
    expect(fitsWithin([100, 100, 10], [120, 80, 40])).toBe(false);
  });

  it('fitsWithin · the edge, float32 mesh noise below a micrometre · included; ignored', () => {
    expect(fitsWithin([120, 80, 40], [120, 80, 40])).toBe(true);
    // 120 mm stored as float32 reads back as 120.00000762939453
    expect(fitsWithin([Math.fround(120.0000001), 80, 40], [120, 80, 40])).toBe(true);
    expect(fitsWithin([120.002, 80, 40], [120, 80, 40])).toBe(false);
  });

  it('fitsWithin · inch envelopes · converted exactly', () => {
    // 4.5 in × 3 in × 1 in = 114.3 × 76.2 × 25.4 mm (1 in = 25.4 mm, NIST SP 811 Appendix B)
    const envelope: Triple = [inchesToMm(4.5), inchesToMm(3), inchesToMm(1)];
    expect(envelope).toEqual([114.3, 76.2, 25.4]);
    expect(fitsWithin([25.4, 114.3, 76.2], envelope)).toBe(true);
    expect(fitsWithin([25.5, 114.3, 76.2], envelope)).toBe(false);
  });
});

describe('matchesKeyDimension · tolerance', () => {
  const bore = [{ name: 'Rod bore', valueMm: 15.3 }];

  it('matchesKeyDimension · the edge of the tolerance (15.3 − 15 ≤ 0.3) · included despite floating point', () => {
    // in doubles 15.3 - 15 = 0.3000000000000007 > 0.3, so a naive comparison would miss this part
    expect(15.3 - 15 > 0.3).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'rod bore', valueMm: 15, tolMm: 0.3 })).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'rod bore', valueMm: 15.6, tolMm: 0.3 })).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'rod bore', valueMm: 15, tolMm: 0.299 })).toBe(false);
    expect(matchesKeyDimension(bore, { name: 'rod bore', valueMm: 14.99, tolMm: 0.3 })).toBe(false);
  });

  it('matchesKeyDimension · tolerance 0 · the exact value matches', () => {
    expect(matchesKeyDimension(bore, { name: 'bore', valueMm: 15.3, tolMm: 0 })).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'bore', valueMm: 15.3001, tolMm: 0 })).toBe(false);
  });

  it('matchesKeyDimension · names · matched case-insensitively by containment, after trimming', () => {
    expect(matchesKeyDimension(bore, { name: '  BORE ', valueMm: 15.3, tolMm: 0 })).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'rod   bore', valueMm: 15.3, tolMm: 0 })).toBe(true);
    expect(matchesKeyDimension(bore, { name: 'rod width', valueMm: 15.3, tolMm: 1 })).toBe(false);
  });

  it('matchesKeyDimension · inch values and tolerances · compared exactly', () => {
    // plate width 4 in ± 0.05 in = 101.6 ± 1.27 mm (1 in = 25.4 mm exactly, NIST SP 811 Appendix B)
    const plate = [{ name: 'plate width', valueMm: 102.87 }];
    expect(matchesKeyDimension(plate, { name: 'plate width', valueMm: inchesToMm(4), tolMm: inchesToMm(0.05) })).toBe(true);
    expect(matchesKeyDimension([{ name: 'plate width', valueMm: 102.871 }], { name: 'plate width', valueMm: inchesToMm(4), tolMm: inchesToMm(0.05) })).toBe(
      false,
    );
  });
});

describe('keyDimensionDistance · range overlap', () => {
  // Interval overlap: [a − s, a + s] and [b − t, b + t] intersect iff |a − b| ≤ s + t (elementary
  // interval arithmetic, common practice); the worked example is the one in shared/search/filters.ts.
  const asked = { name: 'rod bore', valueMm: 15, tolMm: 0.1 };

  it('keyDimensionDistance · a clamp of 15.2 ± 0.2 for a 15 ± 0.1 bore · matches: its range covers 15.0', () => {
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }, asked)).toBeCloseTo(0.2, 9);
  });

  it('keyDimensionDistance · ranges that touch, ranges a micrometre apart · match; do not', () => {
    // [15.3 − 0.2, 15.5] touches [14.9, 15.1] at 15.1
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15.3, tolMm: 0.2 }, asked)).toBeCloseTo(0.3, 9);
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15.301, tolMm: 0.2 }, asked)).toBeNull();
    // touching from below: [14.6, 14.8] + 0.1 … [14.7 ± 0.2] touches at 14.9
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 14.7, tolMm: 0.2 }, asked)).not.toBeNull();
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 14.699, tolMm: 0.2 }, asked)).toBeNull();
  });

  it('keyDimensionDistance · disjoint ranges; no tolerance on either side · apart; only the exact value', () => {
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15.5, tolMm: 0.1 }, asked)).toBeNull();
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15 }, { ...asked, tolMm: 0 })).toBe(0);
    expect(keyDimensionDistance({ name: 'rod bore', valueMm: 15.0001 }, { ...asked, tolMm: 0 })).toBeNull();
  });

  it('keyDimensionDistance · several matches · the closest nominal first', () => {
    const dims = [
      { name: 'rod bore', valueMm: 15.2, tolMm: 0.2 },
      { name: 'rod bore', valueMm: 15.05, tolMm: 0 },
    ];
    expect(dimensionCloseness(dims, [asked])).toBeCloseTo(0.05, 9);
    expect(dimensionCloseness([dims[0]], [asked])).toBeGreaterThan(dimensionCloseness(dims, [asked]));
  });
});

const doc = (over: Partial<FilterableDoc> = {}): FilterableDoc => ({
  category: 'rods-mounting',
  bodies: [],
  mounts: [],
  materials: [],
  sizeMm: null,
  keyDimensions: [],
  adaptable: true,
  rating: null,
  ...over,
});

describe('matchesFilters', () => {
  it('matchesFilters · several kinds and values · kinds ANDed, values of one kind ORed', () => {
    const d = doc({ mounts: [{ slug: 'screw-1-4-20' }], materials: ['PETG'], bodies: [{ slug: 'korvel-kx8' }] });
    expect(matchesFilters(d, { mount: ['screw-1-4-20', 'rods-15-60'] })).toBe(true);
    expect(matchesFilters(d, { mount: ['screw-1-4-20'], material: ['ASA'] })).toBe(false);
    expect(matchesFilters(d, { body: ['korvel-kx8'], material: ['ASA', 'PETG'], category: ['rods-mounting'] })).toBe(true);
    expect(matchesFilters(d, { category: ['lens-focus'] })).toBe(false);
  });

  it('matchesFilters · parts without a measured size, unrated parts · out of an envelope search; out of minRating', () => {
    expect(matchesFilters(doc(), { fit: [100, 100, 100] })).toBe(false);
    expect(matchesFilters(doc({ sizeMm: [10, 10, 10] }), { fit: [100, 100, 100] })).toBe(true);
    expect(matchesFilters(doc(), { minRating: 3 })).toBe(false);
    expect(matchesFilters(doc(), { minRating: 0 })).toBe(true);
    expect(matchesFilters(doc({ rating: 4.5 }), { minRating: 4 })).toBe(true);
  });

  it('matchesFilters · adaptable · filtered both ways', () => {
    expect(matchesFilters(doc({ adaptable: false }), { adaptable: true })).toBe(false);
    expect(matchesFilters(doc({ adaptable: false }), { adaptable: false })).toBe(true);
  });
});

describe('countFacets', () => {
  it('countFacets · documents · each value once per document; categories add up to the number of documents', () => {
    const docs = [
      doc({ category: 'rods-mounting', mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }], materials: ['PETG', 'PLA', 'PETG'] }),
      doc({ category: 'rods-mounting', mounts: [{ slug: 'rods-15-60' }], bodies: [{ slug: 'korvel-kx8' }] }),
      doc({ category: 'lens-focus', mounts: [{ slug: 'gear-0-8' }, { slug: 'gear-0-8' }], materials: ['TPU'] }),
    ];
    const facets = countFacets(docs);
    expect(facets.category).toEqual({ 'rods-mounting': 2, 'lens-focus': 1 });
    expect(Object.values(facets.category).reduce((a, b) => a + b, 0)).toBe(docs.length);
    expect(facets.mount).toEqual({ 'rods-15-60': 2, 'screw-1-4-20': 1, 'gear-0-8': 1 });
    expect(facets.material).toEqual({ PETG: 1, PLA: 1, TPU: 1 });
    expect(facets.body).toEqual({ 'korvel-kx8': 1 });
    // each count is the number of documents that carry the value
    for (const [slug, n] of Object.entries(facets.mount)) expect(n).toBe(docs.filter((d) => d.mounts.some((m) => m.slug === slug)).length);
  });
});
