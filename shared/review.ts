// The review desk's rules: which decisions are legal from which state, and the checklist a moderator
// works through. Used by the server to enforce and by the client to offer only what is possible.
import type { RevisionStatus } from './types';

export const REVIEW_ACTIONS = ['submit', 'approve', 'send-back', 'reject', 'retire'] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

/** Part-level states that matter to the desk: a part's latest revision, or a published part as a whole. */
export type ReviewState = RevisionStatus | 'retired';

const TRANSITIONS: Record<ReviewAction, Partial<Record<ReviewState, ReviewState>>> = {
  submit: { draft: 'in_review', sent_back: 'in_review' },
  approve: { in_review: 'published' },
  'send-back': { in_review: 'sent_back' },
  reject: { in_review: 'rejected' },
  retire: { published: 'retired' },
};

const STATE_WORDS: Record<ReviewState, string> = {
  draft: 'a draft',
  in_review: 'waiting at the review desk',
  published: 'on the shelf',
  sent_back: 'sent back to its contributor',
  rejected: 'rejected',
  superseded: 'replaced by a newer revision',
  retired: 'retired',
};

const ACTION_WORDS: Record<ReviewAction, string> = {
  submit: 'submitted for review',
  approve: 'approved',
  'send-back': 'sent back',
  reject: 'rejected',
  retire: 'retired',
};

export type TransitionResult = { ok: true; to: ReviewState } | { ok: false; message: string };

export function transition(from: ReviewState, action: ReviewAction): TransitionResult {
  const to = TRANSITIONS[action][from];
  if (to) return { ok: true, to };
  return { ok: false, message: `This part is ${STATE_WORDS[from]}, so it cannot be ${ACTION_WORDS[action]}.` };
}

export function allowedActions(from: ReviewState): ReviewAction[] {
  return REVIEW_ACTIONS.filter((a) => TRANSITIONS[a][from]);
}

/** Decisions that must carry a note for the contributor. */
export const NOTE_REQUIRED: ReadonlySet<ReviewAction> = new Set(['send-back', 'reject', 'retire']);

export const REVIEW_CHECKLIST = [
  {
    key: 'files',
    label: 'Model files analyse cleanly',
    hint: 'watertight, no facets wound backwards, no shell inside out, one shell unless the part is meant to be several',
  },
  { key: 'photos', label: 'Photos show a real print', hint: 'not a render; the part as printed, ideally on the rig' },
  { key: 'recipe', label: 'A set-ready recipe is complete', hint: 'material, nozzle, layers, walls, infill and temperatures that make sense together' },
  { key: 'fit', label: 'Compatibility and key dimensions are plausible', hint: 'against the measured size: a 15 mm rod bore cannot sit in a 10 mm part' },
  { key: 'licence', label: 'Licence is consistent with the parent', hint: 'adaptations keep what the parent licence requires' },
  { key: 'safety', label: 'Safety flags are right for the use', hint: 'load, overhead, vehicle and heat flags match what the part is for' },
  { key: 'privacy', label: 'No faces, call sheets or other personal data in photos', hint: 'crews shoot on private locations' },
] as const;
export type ChecklistKey = (typeof REVIEW_CHECKLIST)[number]['key'];
