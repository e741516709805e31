import { describe, expect, it } from 'vitest';
import { allowedActions, REVIEW_ACTIONS, transition, type ReviewAction, type ReviewState } from '@shared/review';

const STATES: ReviewState[] = ['draft', 'in_review', 'published', 'sent_back', 'rejected', 'superseded', 'retired'];

// The review flow as the desk defines it: draft → in review → published | sent back | rejected;
// sent back → in review again; published → retired. Everything else is refused.
const LEGAL: Record<string, ReviewState> = {
  'draft:submit': 'in_review',
  'sent_back:submit': 'in_review',
  'in_review:approve': 'published',
  'in_review:send-back': 'sent_back',
  'in_review:reject': 'rejected',
  'published:retire': 'retired',
};

describe('review state machine · every state and action', () => {
  for (const from of STATES) {
    for (const action of REVIEW_ACTIONS) {
      const key = `${from}:${action}`;
      it(`review state machine · ${from} + ${action} · ${LEGAL[key] ?? 'refused'}`, () => {
        const result = transition(from, action as ReviewAction);
        if (LEGAL[key]) expect(result).toEqual({ ok: true, to: LEGAL[key] });
        else {
          expect(result.ok).toBe(false);
          expect(!result.ok && result.message).toMatch(/cannot be/);
        }
      });
    }
  }

  it('review state machine · each state · only the legal actions offered', () => {
    expect(allowedActions('in_review')).toEqual(['approve', 'send-back', 'reject']);
    expect(allowedActions('published')).toEqual(['retire']);
    expect(allowedActions('rejected')).toEqual([]);
    expect(allowedActions('sent_back')).toEqual(['submit']);
  });
});
