// What set reports and ratings say about a part: the proven score (Wilson lower bound of the share
// that held up), per material and per condition, the adjusted rating, and warnings from the evidence.
import { bayesianRating, isSuccessfulOutcome, PRIOR_WEIGHT, wilsonLowerBound, type SetReportOutcome } from './ranking';
import { SET_CONDITIONS, type SetCondition } from './evidence-terms';

export { OUTCOME_LABELS, SET_CONDITION_KEYS, SET_CONDITIONS, type SetCondition } from './evidence-terms';

const BAD_OUTCOMES: SetReportOutcome[] = ['deformed', 'cracked', 'failed'];
/** Two reports of the same failure are a pattern worth a warning; one may be bad luck. */
export const WARNING_THRESHOLD = 2;

export interface ReportFacts {
  outcome: SetReportOutcome;
  material: string;
  conditions: readonly SetCondition[];
  /** Who filed it; reports without one are each counted. */
  userId?: number;
  /** The production or job it was used on. */
  production?: string | null;
  /** When it was filed: the day stands in for a production that is not named, and the latest of repeats counts. */
  createdAt?: Date | string;
}

/** "The Salt Road", "the salt road " and "THE SALT-ROAD" are one production. */
export function productionKey(production: string | null | undefined): string {
  return (production ?? '')
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]+/gu, ' ')
    .trim();
}

const time = (r: ReportFacts) => (r.createdAt === undefined ? 0 : new Date(r.createdAt).getTime());

/**
 * One report per member per production (per day when no production is named): the member's latest.
 * Reports keep their order otherwise.
 */
export function onePerMemberAndProduction<T extends ReportFacts>(reports: readonly T[]): T[] {
  const latest = new Map<string, T>();
  reports.forEach((r, i) => {
    if (r.userId === undefined) return latest.set(`#${i}`, r);
    const where = productionKey(r.production) || (r.createdAt === undefined ? `#${i}` : new Date(r.createdAt).toISOString().slice(0, 10));
    const key = `${r.userId}|${where}`;
    const seen = latest.get(key);
    if (!seen || time(r) >= time(seen)) latest.set(key, r);
  });
  const kept = new Set(latest.values());
  return reports.filter((r) => kept.has(r));
}

/**
 * The reports that count toward a part's proven figures: never its author's own (they cannot vouch
 * for their own part), and at most one per member per production.
 */
export function countedReports<T extends ReportFacts>(reports: readonly T[], authorId: number | null | undefined): T[] {
  return onePerMemberAndProduction(reports.filter((r) => authorId == null || r.userId !== authorId));
}

export interface ProvenFigures {
  proven: number;
  reports: number;
  heldUp: number;
}

export interface EvidenceWarning {
  material: string;
  condition: SetCondition;
  bad: number;
  of: number;
  text: string;
}

export interface Evidence extends ProvenFigures {
  /** Visible reports left out of the figures: the author's own, and repeats by one member on one production. */
  notCounted: number;
  byMaterial: Record<string, ProvenFigures>;
  byCondition: Partial<Record<SetCondition, ProvenFigures>>;
  rating: { mean: number | null; count: number; adjusted: number | null; distribution: Record<1 | 2 | 3 | 4 | 5, number> };
  warnings: EvidenceWarning[];
  sentence: string;
}

function figures(reports: readonly ReportFacts[]): ProvenFigures {
  const heldUp = reports.filter((r) => isSuccessfulOutcome(r.outcome)).length;
  return { proven: wilsonLowerBound(heldUp, reports.length), reports: reports.length, heldUp };
}

function groupBy<K extends string>(reports: readonly ReportFacts[], keys: (r: ReportFacts) => readonly K[]) {
  const groups = new Map<K, ReportFacts[]>();
  for (const r of reports) for (const k of keys(r)) groups.set(k, [...(groups.get(k) ?? []), r]);
  return groups;
}

function verbFor(outcomes: SetReportOutcome[]): string {
  const kinds = [...new Set(outcomes)];
  if (kinds.length === 1) return kinds[0];
  return `${kinds.slice(0, -1).join(', ')} or ${kinds[kinds.length - 1]}`;
}

export function evidenceWarnings(reports: readonly ReportFacts[]): EvidenceWarning[] {
  const warnings: EvidenceWarning[] = [];
  for (const [material, ofMaterial] of groupBy(reports, (r) => [r.material])) {
    for (const condition of SET_CONDITIONS) {
      const inCondition = ofMaterial.filter((r) => r.conditions.includes(condition.key));
      const bad = inCondition.filter((r) => BAD_OUTCOMES.includes(r.outcome));
      if (bad.length < WARNING_THRESHOLD) continue;
      warnings.push({
        material,
        condition: condition.key,
        bad: bad.length,
        of: inCondition.length,
        text: `${material} ${verbFor(bad.map((r) => r.outcome))} ${condition.phrase} in ${bad.length} of ${inCondition.length} reports`,
      });
    }
  }
  return warnings;
}

/** The counts, as crews say them: "2 of 2 held up". */
export function provenCounts(f: Pick<ProvenFigures, 'heldUp' | 'reports'>): string {
  return `${f.heldUp} of ${f.reports} held up`;
}

/**
 * The cautious lower bound (Wilson, 95 %) in words: what a crew can plan on, and why it is lower
 * than the counts suggest when there are few reports. Ranking still sorts by the bound itself.
 */
export function provenCaution(f: ProvenFigures): string {
  if (f.reports === 0) return '';
  const n = Math.round(f.proven * 100);
  const few = f.reports < 10 ? `${f.reports === 1 ? 'One report is' : `${f.reports} reports are`} not much to go on, so we` : 'We';
  return `${few} plan on the safe side: count on at least ${n} in every 100 prints holding up. That figure climbs as more crews report it held up.`;
}

export function provenSentence(f: ProvenFigures, notCounted = 0): string {
  const aside = notCounted
    ? ` ${notCounted} more ${notCounted === 1 ? 'report is' : 'reports are'} not counted (the author's own, or repeats by one member on one production).`
    : '';
  if (f.reports === 0) return `No set reports yet: nobody has said how it holds up on a job.${aside}`;
  return `${f.heldUp} of ${f.reports} set reports say it held up or kept working. ${provenCaution(f)}${aside}`;
}

/**
 * The evidence of one part. With `authorId`, the proven figures leave out the author's own reports;
 * repeats by one member on one production count once. Warnings read every member's reports
 * (the author's too: a failure they report is still a caution), one per member and production.
 */
export function summariseEvidence(
  allReports: readonly ReportFacts[],
  stars: readonly number[],
  catalogueMean: number | null,
  options: { authorId?: number | null } = {},
): Evidence {
  const reports = countedReports(allReports, options.authorId);
  const all = figures(reports);
  const byMaterial = Object.fromEntries([...groupBy(reports, (r) => [r.material])].map(([k, v]) => [k, figures(v)]));
  const byCondition = Object.fromEntries([...groupBy(reports, (r) => r.conditions)].map(([k, v]) => [k, figures(v)]));
  const notCounted = allReports.length - reports.length;
  const count = stars.length;
  const mean = count ? stars.reduce((a, b) => a + b, 0) / count : null;
  const distribution = { 1: 0, 2: 0, 3: 0, 4: 0, 5: 0 } as Record<1 | 2 | 3 | 4 | 5, number>;
  for (const s of stars) distribution[s as 1 | 2 | 3 | 4 | 5] += 1;
  const adjusted = mean === null ? null : bayesianRating({ mean, count }, { priorMean: catalogueMean ?? mean, priorWeight: PRIOR_WEIGHT });
  return {
    ...all,
    notCounted,
    byMaterial,
    byCondition,
    rating: { mean, count, adjusted, distribution },
    warnings: evidenceWarnings(onePerMemberAndProduction(allReports)),
    sentence: provenSentence(all, notCounted),
  };
}
