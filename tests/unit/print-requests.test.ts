import { describe, expect, it } from 'vitest';
import {
  allowedPrintActions,
  canPay,
  isOwed,
  PAYMENT_STATES,
  PRINT_REQUEST_ACTIONS,
  PRINT_REQUEST_STATES,
  printTransition,
  refundDue,
  type PrintRequestRole,
} from '@shared/print-requests';

// The request flow as the crew works it: asked → accepted (owner) → fit test printed (optional)
// → printed → handed over; the owner may decline before anything is printed; the requester may
// cancel until printing starts. Everything else is refused.
const LEGAL: Record<string, string> = {
  'requested:accept:owner': 'accepted',
  'requested:decline:owner': 'declined',
  'accepted:decline:owner': 'declined',
  'requested:cancel:requester': 'cancelled',
  'accepted:cancel:requester': 'cancelled',
  'accepted:fit-tested:owner': 'fit_tested',
  'accepted:printed:owner': 'printed',
  'fit_tested:printed:owner': 'printed',
  'printed:handed-over:owner': 'handed_over',
};
const ROLES: PrintRequestRole[] = ['owner', 'requester'];

describe('print request state machine · every state, action and role', () => {
  for (const from of PRINT_REQUEST_STATES) {
    for (const action of PRINT_REQUEST_ACTIONS) {
      for (const role of ROLES) {
        const key = `${from}:${action}:${role}`;
        it(`print request state machine · ${from} + ${action} by ${role} · ${LEGAL[key] ?? 'refused'}`, () => {
          const result = printTransition(from, action, role);
          if (LEGAL[key]) expect(result).toEqual({ ok: true, to: LEGAL[key] });
          else {
            expect(result.ok).toBe(false);
            if (!result.ok) {
              const rightRole = action === 'cancel' ? role === 'requester' : role === 'owner';
              expect(result.status).toBe(rightRole ? 409 : 403);
              expect(result.message).toMatch(rightRole ? /cannot be/ : /Only/);
            }
          }
        });
      }
    }
  }

  it('print request state machine · offered actions · only the legal ones per role', () => {
    expect(allowedPrintActions('requested', 'owner')).toEqual(['accept', 'decline']);
    expect(allowedPrintActions('requested', 'requester')).toEqual(['cancel']);
    expect(allowedPrintActions('accepted', 'owner')).toEqual(['decline', 'fit-tested', 'printed']);
    expect(allowedPrintActions('fit_tested', 'requester')).toEqual([]);
    expect(allowedPrintActions('printed', 'owner')).toEqual(['handed-over']);
    for (const end of ['declined', 'cancelled', 'handed_over'] as const) {
      expect(allowedPrintActions(end, 'owner')).toEqual([]);
      expect(allowedPrintActions(end, 'requester')).toEqual([]);
    }
  });
});

describe('paying back · which states owe, pay and refund', () => {
  it('paying back · price frozen (accepted and later) and not paid · can pay', () => {
    const payable = PRINT_REQUEST_STATES.flatMap((s) => PAYMENT_STATES.filter((p) => canPay(s, p)).map((p) => `${s}:${p}`));
    expect(payable.sort()).toEqual(['accepted', 'fit_tested', 'printed', 'handed_over'].flatMap((s) => [`${s}:pending`, `${s}:unpaid`]).sort());
  });

  it('paying back · cancelled or declined after paying · refund due; never otherwise', () => {
    const due = PRINT_REQUEST_STATES.flatMap((s) => PAYMENT_STATES.filter((p) => refundDue(s, p)).map((p) => `${s}:${p}`));
    expect(due.sort()).toEqual(['cancelled:paid', 'declined:paid']);
  });

  it('paying back · owed · accepted work not yet paid', () => {
    expect(isOwed('printed', 'unpaid')).toBe(true);
    expect(isOwed('printed', 'paid')).toBe(false);
    expect(isOwed('requested', 'unpaid')).toBe(false);
    expect(isOwed('cancelled', 'unpaid')).toBe(false);
  });
});
