// How the client shows what set reports say: outcome words, colours and icons, condition icons.
// Kept apart from format.ts because the shared evidence rules bring the statistics library along,
// which only the evidence screens need.
import { OUTCOME_LABELS, SET_CONDITIONS, type SetCondition } from '@shared/evidence-terms';
import type { SetReportOutcome } from '@shared/ranking';

export interface OutcomeWording {
  label: string;
  /** What the outcome means, under its button in the report flow. */
  hint: string;
  icon: string;
  /** Fill of its bar in the outcome chart and of its tally cell. */
  colour: string;
  /** Text on that fill. */
  ink: string;
  good: boolean;
}

/** Set-report outcomes: the two that count as held up in greens, the failures in ambers and brick red. */
export const OUTCOME_WORDING: Record<SetReportOutcome, OutcomeWording> = {
  'held-up': {
    label: OUTCOME_LABELS['held-up'],
    hint: 'No change. Ready for the next job.',
    icon: 'pi pi-check-circle',
    colour: '#1d5149',
    ink: '#ffffff',
    good: true,
  },
  'worn-but-working': {
    label: OUTCOME_LABELS['worn-but-working'],
    hint: 'Scuffed or loosened, still does the job.',
    icon: 'pi pi-wrench',
    colour: '#78b8ab',
    ink: '#0b1f1c',
    good: true,
  },
  deformed: {
    label: OUTCOME_LABELS.deformed,
    hint: 'Bent, warped or sagged out of shape.',
    icon: 'pi pi-wave-pulse',
    colour: '#f2a524',
    ink: '#1c2223',
    good: false,
  },
  cracked: { label: OUTCOME_LABELS.cracked, hint: 'Split or cracked, but did not let go.', icon: 'pi pi-bolt', colour: '#b86509', ink: '#ffffff', good: false },
  failed: {
    label: OUTCOME_LABELS.failed,
    hint: 'Broke or let go of what it held.',
    icon: 'pi pi-times-circle',
    colour: '#a3261b',
    ink: '#ffffff',
    good: false,
  },
};

export const CONDITION_ICONS: Record<SetCondition, string> = {
  heat: 'pi pi-sun',
  cold: 'pi pi-asterisk',
  wet: 'pi pi-cloud',
  dust: 'pi pi-ellipsis-h',
  vehicle: 'pi pi-car',
  impacts: 'pi pi-hammer',
};

export function conditionLabel(key: string): string {
  return SET_CONDITIONS.find((c) => c.key === key)?.label ?? key;
}
