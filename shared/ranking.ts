// Ranking parts by how they held up on set and by their star ratings.
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import type { SetReportOutcome } from './evidence-terms';

/** z such that a two-sided interval at `confidence` covers the standard normal between −z and z. */
export function normalQuantileTwoSided(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('Confidence must be between 0 and 1.');
  return normalQuantile(1 - (1 - confidence) / 2, 0, 1);
}

/**
 * Lower bound of the Wilson score interval for a success proportion (E. B. Wilson, JASA 1927):
 * a cautious estimate that rewards many consistent results over a few perfect ones.
 */
export function wilsonLowerBound(successes: number, n: number, confidence = 0.95): number {
  if (!Number.isInteger(n) || n < 0) throw new RangeError('The number of results must be a whole number ≥ 0.');
  if (!Number.isInteger(successes) || successes < 0 || successes > n) {
    throw new RangeError('Successes must be a whole number between 0 and the number of results.');
  }
  if (n === 0) return 0;
  const z = normalQuantileTwoSided(confidence);
  const p = successes / n;
  const z2 = z * z;
  const centre = p + z2 / (2 * n);
  const spread = z * Math.sqrt((p * (1 - p) + z2 / (4 * n)) / n);
  return (centre - spread) / (1 + z2 / n);
}

/**
 * How many ratings' worth of weight the catalogue mean gets. With 5, a part needs five ratings
 * before its own mean counts for half of its adjusted rating. Our choice: large enough that one
 * or two ratings do not jump a part to the top, small enough that a new part can rise soon.
 */
export const PRIOR_WEIGHT = 5;

export interface RatingSummary {
  mean: number;
  count: number;
}

export interface RatingPrior {
  /** Mean rating across the catalogue (C). */
  priorMean: number;
  /** Prior weight in ratings (m); defaults to PRIOR_WEIGHT. */
  priorWeight?: number;
}

/** Weighted rating v/(v+m)·R + m/(v+m)·C: the part's mean R pulled toward the catalogue mean C. */
export function bayesianRating({ mean, count }: RatingSummary, { priorMean, priorWeight = PRIOR_WEIGHT }: RatingPrior): number {
  if (count < 0 || priorWeight < 0) throw new RangeError('Counts and weights must be ≥ 0.');
  const total = count + priorWeight;
  if (total === 0) return priorMean;
  return (count / total) * mean + (priorWeight / total) * priorMean;
}

export { SET_REPORT_OUTCOMES, type SetReportOutcome } from './evidence-terms';

const SUCCESSFUL_OUTCOMES: ReadonlySet<SetReportOutcome> = new Set(['held-up', 'worn-but-working']);

export function isSuccessfulOutcome(outcome: SetReportOutcome): boolean {
  return SUCCESSFUL_OUTCOMES.has(outcome);
}

/** Wilson lower bound (95 %) of the share of set reports in which the part kept working. */
export function provenScore(outcomes: readonly SetReportOutcome[]): number {
  const successes = outcomes.filter(isSuccessfulOutcome).length;
  return wilsonLowerBound(successes, outcomes.length);
}

export interface ProvenRank {
  provenScore: number;
  /** The bayesianRating of the part. */
  adjustedRating: number;
}

/** Sort comparator, best first: proven on set, then adjusted rating. */
export function compareProven(a: ProvenRank, b: ProvenRank): number {
  return b.provenScore - a.provenScore || b.adjustedRating - a.adjustedRating;
}
