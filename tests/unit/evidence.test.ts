import { describe, expect, it } from 'vitest';
import {
  countedReports,
  evidenceWarnings,
  onePerMemberAndProduction,
  productionKey,
  provenCaution,
  provenCounts,
  provenSentence,
  summariseEvidence,
  type ReportFacts,
} from '@shared/evidence';
import { compareProven, normalQuantileTwoSided } from '@shared/ranking';

const r = (outcome: ReportFacts['outcome'], material = 'PETG', conditions: ReportFacts['conditions'] = []): ReportFacts => ({ outcome, material, conditions });

/** Wilson lower bound written out from E. B. Wilson, JASA 22(158), 1927 (trade reference, "Ranking"). */
function wilsonByHand(k: number, n: number): number {
  const z = normalQuantileTwoSided(0.95); // jstat's normal quantile, 1.959964
  const p = k / n;
  return (p + (z * z) / (2 * n) - z * Math.sqrt((p * (1 - p) + (z * z) / (4 * n)) / n)) / (1 + (z * z) / n);
}

describe('evidence · proven score per part, material and condition', () => {
  const reports = [
    r('held-up', 'PETG', ['heat']),
    r('worn-but-working', 'PETG', ['vehicle']),
    r('held-up', 'ASA', ['heat', 'vehicle']),
    r('deformed', 'PLA', ['heat']),
    r('cracked', 'PETG', ['impacts']),
  ];
  const e = summariseEvidence(reports, [], null);

  it('proven score · held up and worn-but-working · count as success; the Wilson lower bound taken', () => {
    expect(e.reports).toBe(5);
    expect(e.heldUp).toBe(3);
    expect(e.proven).toBeCloseTo(wilsonByHand(3, 5), 12);
    // 3 of 5 at 95 %, by hand: z² = 3.841459; (0.6 + 0.384146 − 1.959964·√((0.24 + 0.192073)/5)) / (1 + 0.768292)
    //   = (0.984146 − 0.576157) / 1.768292 = 0.230724
    expect(e.proven).toBeCloseTo(0.2307, 3);
  });

  it('proven score · reports of several materials and conditions · figures split by each', () => {
    expect(e.byMaterial.PETG).toEqual({ reports: 3, heldUp: 2, proven: wilsonByHand(2, 3) });
    expect(e.byMaterial.PLA).toEqual({ reports: 1, heldUp: 0, proven: 0 });
    expect(e.byCondition.heat).toEqual({ reports: 3, heldUp: 2, proven: wilsonByHand(2, 3) });
    expect(e.byCondition.cold).toBeUndefined();
  });

  it('proven score · no reports · 0, said in plain words', () => {
    const none = summariseEvidence([], [], null);
    expect(none.proven).toBe(0);
    expect(none.sentence).toMatch(/No set reports yet/);
    expect(provenSentence({ proven: 0.62, reports: 12, heldUp: 10 })).toBe(
      '10 of 12 set reports say it held up or kept working. We plan on the safe side: count on at least 62 in every 100 prints holding up. That figure climbs as more crews report it held up.',
    );
  });

  it('evidence · 2 of 2 held up · leads with the counts and explains the cautious 34 in 100', () => {
    const two = summariseEvidence([r('held-up'), r('worn-but-working')], [], null);
    // Wilson 95 % lower bound for 2 of 2 (E. B. Wilson 1927, z = 1.96): 1 / (1 + 1.96² / 2) = 0.342
    expect(two.proven).toBeCloseTo(wilsonByHand(2, 2), 12);
    expect(two.proven).toBeCloseTo(0.342, 3);
    expect(provenCounts(two)).toBe('2 of 2 held up');
    expect(two.sentence.startsWith('2 of 2 set reports say it held up')).toBe(true);
    expect(provenCaution(two)).toBe(
      '2 reports are not much to go on, so we plan on the safe side: count on at least 34 in every 100 prints holding up. That figure climbs as more crews report it held up.',
    );
    expect(two.sentence).not.toMatch(/%/);
  });
});

describe('evidence · warnings drawn from the reports', () => {
  it('evidence warnings · a material deformed in heat in two or more reports · warned', () => {
    const reports = [r('deformed', 'PLA', ['heat']), r('deformed', 'PLA', ['heat', 'vehicle']), r('deformed', 'PLA', ['heat']), r('held-up', 'PLA', ['heat'])];
    const warnings = evidenceWarnings(reports);
    expect(warnings.map((w) => w.text)).toContain('PLA deformed in heat in 3 of 4 reports');
  });

  it('evidence warnings · mixed failures; a single one · named; quiet', () => {
    expect(evidenceWarnings([r('deformed', 'PLA', ['heat']), r('failed', 'PLA', ['heat'])])[0].text).toBe('PLA deformed or failed in heat in 2 of 2 reports');
    expect(evidenceWarnings([r('deformed', 'PLA', ['heat']), r('held-up', 'PLA', ['heat'])])).toEqual([]);
  });
});

describe('evidence · ratings', () => {
  it('ratings · several ratings · distribution, mean and the Bayesian adjusted rating with the catalogue mean as prior', () => {
    const e = summariseEvidence([], [5, 5, 4], 3.5);
    expect(e.rating.distribution).toEqual({ 1: 0, 2: 0, 3: 0, 4: 1, 5: 2 });
    expect(e.rating.mean).toBeCloseTo(14 / 3, 12);
    // WR = v/(v+m)·R + m/(v+m)·C with v = 3, m = 5, R = 14/3, C = 3.5 → (14 + 17.5) / 8 = 3.9375 (by hand)
    expect(e.rating.adjusted).toBeCloseTo(3.9375, 12);
  });
});

describe('ranking · a fixed set, best proven first', () => {
  it('ranking · forty good reports and one perfect one · the forty first; ties broken by adjusted rating', () => {
    const parts = [
      { name: 'one perfect', ...summariseEvidence([r('held-up')], [5], 4) },
      { name: 'forty good', ...summariseEvidence([...Array(38).fill(r('held-up')), r('failed'), r('cracked')], [4, 4, 5], 4) },
      { name: 'no reports, loved', ...summariseEvidence([], [5, 5, 5, 5], 4) },
      { name: 'no reports, disliked', ...summariseEvidence([], [1, 2], 4) },
    ];
    const order = [...parts]
      .sort((a, b) =>
        compareProven({ provenScore: a.proven, adjustedRating: a.rating.adjusted ?? 0 }, { provenScore: b.proven, adjustedRating: b.rating.adjusted ?? 0 }),
      )
      .map((p) => p.name);
    expect(order).toEqual(['forty good', 'one perfect', 'no reports, loved', 'no reports, disliked']);
  });
});

describe('evidence · who counts toward the proven figure', () => {
  const AUTHOR = 1;
  const by = (userId: number, outcome: ReportFacts['outcome'], production = 'The Salt Road', createdAt = '2026-03-01T10:00:00Z'): ReportFacts => ({
    outcome,
    material: 'PETG',
    conditions: [],
    userId,
    production,
    createdAt,
  });

  it("evidence · an author's own reports · never count toward their part's proven figure", () => {
    // the probe's case: 25 "held up" reports by the author, one "failed" and one "held up" by crew
    const reports = [...Array.from({ length: 25 }, (_, i) => by(AUTHOR, 'held-up', `Shoot ${i}`)), by(2, 'failed'), by(3, 'held-up')];
    const e = summariseEvidence(reports, [], null, { authorId: AUTHOR });
    expect(e.reports).toBe(2);
    expect(e.heldUp).toBe(1);
    expect(e.notCounted).toBe(25);
    // Wilson lower bound, 1 of 2 at 95 % (E. B. Wilson, JASA 1927), by hand: z² = 3.841459;
    // (0.5 + 0.960365 − 1.959964·√((0.25 + 0.480182)/2)) / (1 + 1.920730) = (1.460365 − 1.184265) / 2.920730 = 0.094531
    expect(e.proven).toBeCloseTo(0.094531, 5);
    expect(e.proven).toBeCloseTo(wilsonByHand(1, 2), 12);
    expect(e.sentence).toMatch(/25 more reports are not counted/);
    // without the rule the same reports would read 26 of 27, Wilson ≈ 0.81 (by the same formula)
    expect(summariseEvidence(reports, [], null).proven).toBeCloseTo(wilsonByHand(26, 27), 12);
  });

  it('evidence · one member, one production · counts once (the latest), however the production is written', () => {
    // our rule (common practice against ballot stuffing): one voice per member per job
    const reports = [
      by(2, 'failed', 'The Salt Road', '2026-03-01T10:00:00Z'),
      by(2, 'held-up', 'the salt road ', '2026-03-02T10:00:00Z'),
      by(2, 'held-up', 'THE SALT-ROAD', '2026-03-03T10:00:00Z'),
      by(2, 'held-up', 'Night Ferry', '2026-03-04T10:00:00Z'),
      by(3, 'held-up', 'The Salt Road', '2026-03-01T10:00:00Z'),
    ];
    const kept = onePerMemberAndProduction(reports);
    expect(kept).toEqual([reports[2], reports[3], reports[4]]);
    expect(productionKey('  THE  Salt-Road ')).toBe('the salt road');
    const e = summariseEvidence(reports, [], null, { authorId: AUTHOR });
    expect(e).toMatchObject({ reports: 3, heldUp: 3, notCounted: 2 });
    expect(e.proven).toBeCloseTo(wilsonByHand(3, 3), 12);
  });

  it('evidence · no production named · one per member per day', () => {
    const reports = [by(2, 'held-up', '', '2026-03-01T08:00:00Z'), by(2, 'held-up', '', '2026-03-01T18:00:00Z'), by(2, 'held-up', '', '2026-03-02T08:00:00Z')];
    expect(countedReports(reports, AUTHOR)).toEqual([reports[1], reports[2]]);
  });

  it("evidence · warnings · still read the author's own failure reports (a caution is a caution), once per member and production", () => {
    const reports = [
      { ...by(AUTHOR, 'deformed'), material: 'PLA', conditions: ['heat'] as const },
      { ...by(2, 'deformed'), material: 'PLA', conditions: ['heat'] as const },
      { ...by(2, 'deformed', 'The Salt Road', '2026-03-05T10:00:00Z'), material: 'PLA', conditions: ['heat'] as const },
    ];
    const e = summariseEvidence(reports, [], null, { authorId: AUTHOR });
    expect(e.warnings.map((w) => w.text)).toEqual(['PLA deformed in heat in 2 of 2 reports']);
    expect(e.reports).toBe(1);
  });

  it("evidence · ranking · an author's 25 self-reports no longer lift their part above one with five crew reports", () => {
    const stuffed = summariseEvidence([...Array.from({ length: 25 }, (_, i) => by(AUTHOR, 'held-up', `Shoot ${i}`)), by(2, 'held-up')], [], null, {
      authorId: AUTHOR,
    });
    const earned = summariseEvidence(
      [2, 3, 4, 5, 6].map((u) => by(u, 'held-up')),
      [],
      null,
      { authorId: AUTHOR },
    );
    // Wilson lower bounds (JASA 1927): 1 of 1 → 0.2065, 5 of 5 → 0.5655 (both by the formula above)
    expect(stuffed.proven).toBeCloseTo(wilsonByHand(1, 1), 12);
    expect(earned.proven).toBeCloseTo(0.5655, 4);
    expect(compareProven({ provenScore: earned.proven, adjustedRating: 0 }, { provenScore: stuffed.proven, adjustedRating: 0 })).toBeLessThan(0);
  });
});
