// Paying a print back through the payments SDK: the checkout, the verified webhook (each event id
// taken in once) and refunds (due ones, a second payment, and those still due at start-up).
import { UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import type Stripe from 'stripe';
import { canPay, refundDue, STATE_LABELS, type PrintRequestState } from '@shared/print-requests';
import { PaymentEvent, PrintRequest, PrintRequestEvent, type User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import type { Payments } from '../payments/client';

export interface PayingBackDeps {
  sequelize: Sequelize;
  payments: Payments;
  /** Records a step with its notice and mail (service.ts). */
  record: (
    r: PrintRequest,
    step: 'paid' | 'refunded',
    actor: User | null,
    from: string | null,
    details: Record<string, unknown> | null,
    t: Transaction,
  ) => Promise<void>;
  /** The request if the viewer is one of its two sides (locked inside a transaction), else 404. */
  visible: (viewer: User, id: number, transaction?: Transaction) => Promise<PrintRequest>;
  link: (id: number) => string;
  publicUrl: () => string;
}

export function payingBack({ sequelize, payments, record, visible, link, publicUrl }: PayingBackDeps) {
  /** Refunds a request whose refund is due, once (the idempotency key holds across retries). */
  async function settleRefund(id: number): Promise<void> {
    const r = await PrintRequest.findByPk(id);
    if (!r || r.paymentStatus !== 'refund_due' || !r.paymentRef) return;
    let refund: { id: string; status: string | null };
    try {
      refund = await payments.refund(r.paymentRef, `rigshelf-refund-${r.id}-${r.paymentRef}`);
    } catch (err) {
      console.error(`rigshelf: refund of print request ${r.id} failed, tried again with the next shared chores (about a minute): ${(err as Error).message}`);
      return;
    }
    await transact(sequelize, async (t) => {
      const locked = await PrintRequest.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
      if (!locked || locked.paymentStatus !== 'refund_due') return;
      await locked.update({ paymentStatus: 'refunded', refundRef: refund.id, refundedAt: new Date() }, { transaction: t });
      await record(locked, 'refunded', null, locked.status, { refund: refund.id, amountMinor: locked.paidMinor, currency: locked.currency }, t);
    });
  }

  /** A second payment for a request already paid is refunded in full (the key holds across retries). */
  async function refundExtra(x: { requestId: number; paymentRef: string; amountMinor: number }) {
    try {
      const refund = await payments.refund(x.paymentRef, `rigshelf-refund-extra-${x.paymentRef}`);
      await transact(sequelize, async (t) => {
        const r = await PrintRequest.findByPk(x.requestId, { transaction: t });
        if (!r) return;
        await PrintRequestEvent.create(
          {
            requestId: r.id,
            actorId: null,
            action: 'refunded-extra',
            fromStatus: r.status,
            toStatus: r.status,
            details: { refund: refund.id, amountMinor: x.amountMinor, currency: r.currency },
          },
          { transaction: t },
        );
      });
    } catch (err) {
      console.error(`rigshelf: refund of a second payment for print request ${x.requestId} failed: ${(err as Error).message}`);
    }
  }

  return {
    settleRefund,

    async checkout(viewer: User, id: number): Promise<{ url: string | null; clientSecret: string | null }> {
      const r = await visible(viewer, id);
      if (r.requesterId !== viewer.id) throw AppError.forbidden('Only the member who asked pays a print back.');
      if (!canPay(r.status, r.paymentStatus)) {
        throw AppError.conflict(
          r.paymentStatus === 'paid' || r.paymentStatus === 'refunded' || r.paymentStatus === 'refund_due'
            ? 'This request is paid already.'
            : `This request is ${STATE_LABELS[r.status as PrintRequestState].toLowerCase()}; it can be paid once the printer’s owner accepts it.`,
        );
      }
      const session = await payments.createCheckout({
        requestId: r.id,
        title: `Print: ${r.title} (${r.quantity} ×, ${r.printerName})`,
        amountMinor: r.priceMinor!,
        currency: r.currency,
        successUrl: `${publicUrl()}${link(r.id)}?paid=1`,
        cancelUrl: `${publicUrl()}${link(r.id)}`,
      });
      await transact(sequelize, async (t) => {
        const locked = await visible(viewer, id, t);
        if (locked.paymentStatus === 'unpaid' || locked.paymentStatus === 'pending') {
          await locked.update({ paymentStatus: 'pending', checkoutId: session.id }, { transaction: t });
          await PrintRequestEvent.create(
            { requestId: r.id, actorId: viewer.id, action: 'checkout', fromStatus: r.status, toStatus: r.status, details: { checkout: session.id } },
            { transaction: t },
          );
        }
      });
      return { url: session.url, clientSecret: session.clientSecret };
    },

    /**
     * A webhook from the payments service. Verified with the SDK or refused (400, nothing changes);
     * each event id is taken in once; a payment for a request that ended is refunded.
     */
    async webhook(rawBody: Buffer, signature: string | undefined): Promise<{ received: true; duplicate?: true }> {
      let event: Stripe.Event;
      try {
        event = payments.verify(rawBody, signature);
      } catch {
        throw new AppError(400, 'bad_signature', 'The webhook signature does not verify; nothing was changed.');
      }
      let refundId: number | null | 'duplicate' = null;
      let extra: { requestId: number; paymentRef: string; amountMinor: number } | null = null;
      try {
        refundId = await transact(sequelize, async (t) => {
          if (await PaymentEvent.findByPk(event.id, { transaction: t })) return 'duplicate' as const;
          const taken = { eventId: event.id, type: event.type, requestId: null as number | null, outcome: 'ignored' };
          let due: number | null = null;
          if (event.type === 'checkout.session.completed') {
            const s = event.data.object as Stripe.Checkout.Session;
            const requestId = Number(s.metadata?.printRequestId ?? s.client_reference_id);
            const r = Number.isInteger(requestId) && requestId > 0 ? await PrintRequest.findByPk(requestId, { transaction: t, lock: t.LOCK.UPDATE }) : null;
            const paymentRef = typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null);
            taken.requestId = r?.id ?? null;
            if (!r) taken.outcome = 'unknown_request';
            else if (s.payment_status !== 'paid' || !paymentRef) taken.outcome = 'not_paid';
            else if (r.priceMinor === null || s.amount_total !== r.priceMinor || s.currency?.toUpperCase() !== r.currency) taken.outcome = 'amount_mismatch';
            else if (r.paymentStatus === 'paid' || r.paymentStatus === 'refund_due' || r.paymentStatus === 'refunded') {
              taken.outcome = r.paymentRef === paymentRef ? 'already_paid' : 'second_payment';
              // paid twice through two checkouts: the later payment goes back
              if (taken.outcome === 'second_payment') extra = { requestId: r.id, paymentRef, amountMinor: s.amount_total ?? 0 };
            } else {
              const from = r.status;
              const settled = refundDue(r.status, 'paid') ? ('refund_due' as const) : ('paid' as const);
              await r.update({ paymentStatus: settled, paidMinor: s.amount_total!, paymentRef, paidAt: new Date(), checkoutId: s.id }, { transaction: t });
              await record(r, 'paid', null, from, { amountMinor: s.amount_total, currency: r.currency, event: event.id }, t);
              taken.outcome = 'paid';
              if (settled === 'refund_due') due = r.id;
            }
          }
          await PaymentEvent.create(taken, { transaction: t });
          return due;
        });
      } catch (err) {
        if (err instanceof UniqueConstraintError) return { received: true, duplicate: true };
        throw err;
      }
      if (refundId === 'duplicate') return { received: true, duplicate: true };
      if (refundId) await settleRefund(refundId);
      if (extra) await refundExtra(extra);
      return { received: true };
    },

    /** Refunds still due (the payments service was away, or the server stopped before it answered). */
    async resumeRefunds(): Promise<number> {
      const due = await PrintRequest.findAll({ where: { paymentStatus: 'refund_due' }, attributes: ['id'] });
      for (const r of due) await settleRefund(r.id);
      return due.length;
    },
  };
}
