// The words of a set report (outcomes, conditions), apart from the statistics of shared/ranking.ts
// and shared/evidence.ts, so the client's forms and lists load them without the statistics package.

export const SET_REPORT_OUTCOMES = ['held-up', 'worn-but-working', 'deformed', 'cracked', 'failed'] as const;
export type SetReportOutcome = (typeof SET_REPORT_OUTCOMES)[number];

export const SET_CONDITIONS = [
  { key: 'heat', label: 'Heat or direct sun', phrase: 'in heat' },
  { key: 'cold', label: 'Cold', phrase: 'in the cold' },
  { key: 'wet', label: 'Rain or wet', phrase: 'in the wet' },
  { key: 'dust', label: 'Dust or sand', phrase: 'in dust or sand' },
  { key: 'vehicle', label: 'Vehicle or vibration', phrase: 'on a vehicle' },
  { key: 'impacts', label: 'Drops or impacts', phrase: 'after drops or impacts' },
] as const;
export type SetCondition = (typeof SET_CONDITIONS)[number]['key'];
export const SET_CONDITION_KEYS = SET_CONDITIONS.map((c) => c.key) as [SetCondition, ...SetCondition[]];

export const OUTCOME_LABELS: Record<SetReportOutcome, string> = {
  'held-up': 'Held up',
  'worn-but-working': 'Worn but working',
  deformed: 'Deformed',
  cracked: 'Cracked',
  failed: 'Failed',
};
