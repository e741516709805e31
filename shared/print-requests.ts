// Print requests between crew members: which step is legal from which state and for whom, and when a
// request can be paid back. Used by the server to enforce and by the client to offer only what is possible.

export const PRINT_REQUEST_STATES = ['requested', 'accepted', 'declined', 'cancelled', 'fit_tested', 'printed', 'handed_over'] as const;
export type PrintRequestState = (typeof PRINT_REQUEST_STATES)[number];

export const PRINT_REQUEST_ACTIONS = ['accept', 'decline', 'cancel', 'fit-tested', 'printed', 'handed-over'] as const;
export type PrintRequestAction = (typeof PRINT_REQUEST_ACTIONS)[number];

/** Who may take a step: the member who owns the printer, or the member who asked. */
export type PrintRequestRole = 'owner' | 'requester';

const TRANSITIONS: Record<PrintRequestAction, Partial<Record<PrintRequestState, PrintRequestState>>> = {
  accept: { requested: 'accepted' },
  // the owner may still back out after accepting, as long as nothing is printed yet
  decline: { requested: 'declined', accepted: 'declined' },
  // "until printing starts": a fit test is a print, so after it the requester can no longer cancel
  cancel: { requested: 'cancelled', accepted: 'cancelled' },
  'fit-tested': { accepted: 'fit_tested' },
  // the fit test is optional
  printed: { accepted: 'printed', fit_tested: 'printed' },
  'handed-over': { printed: 'handed_over' },
};

export const ACTION_ROLE: Record<PrintRequestAction, PrintRequestRole> = {
  accept: 'owner',
  decline: 'owner',
  cancel: 'requester',
  'fit-tested': 'owner',
  printed: 'owner',
  'handed-over': 'owner',
};

export const STATE_LABELS: Record<PrintRequestState, string> = {
  requested: 'Asked',
  accepted: 'Accepted',
  declined: 'Declined',
  cancelled: 'Cancelled',
  fit_tested: 'Fit test printed',
  printed: 'Printed',
  handed_over: 'Handed over',
};

export const ACTION_LABELS: Record<PrintRequestAction, string> = {
  accept: 'Accept',
  decline: 'Decline',
  cancel: 'Cancel the request',
  'fit-tested': 'Fit test printed',
  printed: 'Printed',
  'handed-over': 'Handed over',
};

const STATE_WORDS: Record<PrintRequestState, string> = {
  requested: 'waiting for the printer’s owner',
  accepted: 'accepted',
  declined: 'declined',
  cancelled: 'cancelled',
  fit_tested: 'past its fit test',
  printed: 'printed',
  handed_over: 'handed over',
};

const ACTION_WORDS: Record<PrintRequestAction, string> = {
  accept: 'accepted',
  decline: 'declined',
  cancel: 'cancelled',
  'fit-tested': 'marked as fit-tested',
  printed: 'marked as printed',
  'handed-over': 'marked as handed over',
};

export const FINAL_STATES: ReadonlySet<PrintRequestState> = new Set(['declined', 'cancelled', 'handed_over']);

export type PrintTransitionResult = { ok: true; to: PrintRequestState } | { ok: false; status: 403 | 409; message: string };

/** Whether `role` may take `action` on a request in state `from`. */
export function printTransition(from: PrintRequestState, action: PrintRequestAction, role: PrintRequestRole): PrintTransitionResult {
  if (ACTION_ROLE[action] !== role) {
    return {
      ok: false,
      status: 403,
      message: role === 'owner' ? 'Only the member who asked can cancel a request; you can decline it.' : 'Only the printer’s owner takes this step.',
    };
  }
  const to = TRANSITIONS[action][from];
  if (to) return { ok: true, to };
  return { ok: false, status: 409, message: `This request is ${STATE_WORDS[from]}, so it cannot be ${ACTION_WORDS[action]}.` };
}

export function allowedPrintActions(from: PrintRequestState, role: PrintRequestRole): PrintRequestAction[] {
  return PRINT_REQUEST_ACTIONS.filter((a) => ACTION_ROLE[a] === role && TRANSITIONS[a][from]);
}

// ---- paying back -----------------------------------------------------------------------------

export const PAYMENT_STATES = ['unpaid', 'pending', 'paid', 'refund_due', 'refunded'] as const;
export type PaymentState = (typeof PAYMENT_STATES)[number];

export const PAYMENT_LABELS: Record<PaymentState, string> = {
  unpaid: 'Not paid yet',
  pending: 'Payment started',
  paid: 'Paid',
  refund_due: 'Refund on its way',
  refunded: 'Refunded',
};

/** States in which the price is frozen and owed. */
const OWED_STATES: ReadonlySet<PrintRequestState> = new Set(['accepted', 'fit_tested', 'printed', 'handed_over']);

/** The requester can pay once the owner accepted (the price is frozen then), until it is paid. */
export function canPay(state: PrintRequestState, payment: PaymentState): boolean {
  return OWED_STATES.has(state) && (payment === 'unpaid' || payment === 'pending');
}

/** A request that ends without a print gives back what was paid. */
export function refundDue(state: PrintRequestState, payment: PaymentState): boolean {
  return (state === 'cancelled' || state === 'declined') && payment === 'paid';
}

/** Money still owed to the printer's owner for this request. */
export function isOwed(state: PrintRequestState, payment: PaymentState): boolean {
  return OWED_STATES.has(state) && payment !== 'paid';
}
