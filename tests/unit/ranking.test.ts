import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import {
  PRIOR_WEIGHT,
  bayesianRating,
  compareProven,
  normalQuantileTwoSided,
  provenScore,
  wilsonLowerBound,
  type ProvenRank,
  type SetReportOutcome,
} from '@shared/ranking';

describe('normal quantile', () => {
  it('normal quantile · a two-sided 95 % interval · 1.959964', () => {
    // Standard normal table: z(0.975) = 1.959964 (trade reference "Ranking").
    expect(normalQuantileTwoSided(0.95)).toBeCloseTo(1.959964, 6);
    // The same quantile from another library (npm jstat), to the last few bits.
    expect(normalQuantileTwoSided(0.95)).toBeCloseTo(jStat.normal.inv(0.975, 0, 1), 12);
    // Standard normal table: z(0.95) = 1.644854 for a two-sided 90 % interval.
    expect(normalQuantileTwoSided(0.9)).toBeCloseTo(1.644854, 6);
  });

  it('normal quantile · a confidence outside (0, 1) · rejected', () => {
    expect(() => normalQuantileTwoSided(1)).toThrow(RangeError);
    expect(() => normalQuantileTwoSided(0)).toThrow(RangeError);
  });
});

describe('wilsonLowerBound', () => {
  it('wilsonLowerBound · 8 of 10 · matches the hand-worked figure from Wilson (JASA 1927)', () => {
    // z = 1.959964, z² = 3.841459, n = 10, p̂ = 0.8
    // centre  = p̂ + z²/2n          = 0.8 + 0.1920729             = 0.9920729
    // spread  = z·√((p̂(1−p̂) + z²/4n)/n) = 1.959964·√((0.16 + 0.0960365)/10)
    //         = 1.959964·√0.02560365 = 1.959964·0.1600114         = 0.3136166
    // divisor = 1 + z²/n            = 1.3841459
    // bound   = (0.9920729 − 0.3136166) / 1.3841459 = 0.6784563 / 1.3841459 = 0.4901624
    expect(wilsonLowerBound(8, 10)).toBeCloseTo(0.4901624, 6);
  });

  it('wilsonLowerBound · 1 of 1 · matches the hand-worked figure', () => {
    // p̂ = 1: centre − spread = 1 + z²/2 − z·√(z²/4) = 1, so bound = 1 / (1 + z²) = 1 / 4.841459 = 0.2065493
    expect(wilsonLowerBound(1, 1)).toBeCloseTo(0.2065493, 6);
  });

  it('wilsonLowerBound · no results, no successes · 0', () => {
    expect(wilsonLowerBound(0, 0)).toBe(0);
    expect(wilsonLowerBound(0, 25)).toBeCloseTo(0, 12);
  });

  it('wilsonLowerBound · more of the same evidence · stays below the observed share and rises', () => {
    expect(wilsonLowerBound(8, 10)).toBeLessThan(0.8);
    expect(wilsonLowerBound(80, 100)).toBeGreaterThan(wilsonLowerBound(8, 10));
    expect(wilsonLowerBound(80, 100)).toBeLessThan(0.8);
  });

  it('wilsonLowerBound · impossible counts · rejected', () => {
    expect(() => wilsonLowerBound(3, 2)).toThrow(RangeError);
    expect(() => wilsonLowerBound(-1, 2)).toThrow(RangeError);
    expect(() => wilsonLowerBound(1.5, 2)).toThrow(RangeError);
  });
});

describe('bayesianRating', () => {
  it('bayesianRating · a worked example · matches the weighted-rating formula worked by hand', () => {
    // v = 3 ratings averaging R = 5.0, m = 5, C = 3.8:
    // WR = 3/8 · 5.0 + 5/8 · 3.8 = 1.875 + 2.375 = 4.25
    expect(bayesianRating({ mean: 5, count: 3 }, { priorMean: 3.8, priorWeight: 5 })).toBeCloseTo(4.25, 12);
    // v = 45, R = 4.6, m = 5, C = 3.8: WR = 0.9 · 4.6 + 0.1 · 3.8 = 4.14 + 0.38 = 4.52
    expect(bayesianRating({ mean: 4.6, count: 45 }, { priorMean: 3.8 })).toBeCloseTo(4.52, 12);
  });

  it('bayesianRating · prior · the documented weight, falling back to the catalogue mean', () => {
    expect(PRIOR_WEIGHT).toBe(5);
    expect(bayesianRating({ mean: 0, count: 0 }, { priorMean: 3.8 })).toBe(3.8);
    expect(bayesianRating({ mean: 2, count: 0 }, { priorMean: 4, priorWeight: 0 })).toBe(4);
  });
});

describe('provenScore and compareProven', () => {
  const outcomes = (good: number, bad: number): SetReportOutcome[] => [
    ...Array<SetReportOutcome>(good).fill('held-up'),
    ...Array<SetReportOutcome>(bad).fill('cracked'),
  ];

  it('provenScore · held-up and worn-but-working · count as successes', () => {
    const mixed: SetReportOutcome[] = ['held-up', 'worn-but-working', 'deformed', 'cracked', 'failed'];
    expect(provenScore(mixed)).toBe(wilsonLowerBound(2, 5));
    expect(provenScore([])).toBe(0);
  });

  it('compareProven · one perfect report against thirty-eight good ones out of forty · does not outrank them', () => {
    // Wilson 1/1 = 0.2065 (worked above); 38/40 ≈ 0.835 (same formula).
    const one = provenScore(outcomes(1, 0));
    const forty = provenScore(outcomes(38, 2));
    expect(one).toBeCloseTo(0.2065493, 6);
    expect(forty).toBeGreaterThan(0.8);
    expect(forty).toBeGreaterThan(one);
  });

  it('compareProven · several parts · sorted by proven score, then adjusted rating', () => {
    const parts: (ProvenRank & { name: string })[] = [
      { name: 'new clip', provenScore: 0.21, adjustedRating: 4.9 },
      { name: 'rod clamp', provenScore: 0.83, adjustedRating: 4.1 },
      { name: 'cheese plate', provenScore: 0.83, adjustedRating: 4.4 },
      { name: 'unreported', provenScore: 0, adjustedRating: 5 },
    ];
    expect(parts.sort(compareProven).map((p) => p.name)).toEqual(['cheese plate', 'rod clamp', 'new clip', 'unreported']);
  });
});
