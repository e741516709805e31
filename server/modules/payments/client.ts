// The official payments SDK, set up from the config: pointed at the local fake (started here) through
// the SDK's documented host/port/protocol options, or, with PAYMENTS_FAKE=0 and real keys, at the real
// service. Nothing else in the app knows which one it talks to.
import Stripe from 'stripe';
import type { Config } from '../../config';
import { AppError } from '../../errors';
import { startPaymentsFake, type PaymentsFake } from './fake';

export interface CheckoutInput {
  requestId: number;
  title: string;
  amountMinor: number;
  currency: string;
  successUrl: string;
  cancelUrl: string;
}

export interface Payments {
  /** The fake when it runs (tests pay through it and read what it sent). */
  fake(): Promise<PaymentsFake | null>;
  createCheckout(input: CheckoutInput): Promise<{ id: string; url: string | null; clientSecret: string | null }>;
  /** Refunds a payment in full; the same key twice refunds once. */
  refund(paymentRef: string, idempotencyKey: string): Promise<{ id: string; status: string | null }>;
  /** Checks the signature with the SDK's own verification; throws when it does not verify. */
  verify(rawBody: Buffer, signature: string | undefined): Stripe.Event;
  close(): Promise<void>;
}

export function createPayments(config: Config): Payments {
  const fakeReady: Promise<PaymentsFake | null> = config.PAYMENTS_FAKE
    ? startPaymentsFake({
        host: config.PAYMENTS_API_HOST ?? '127.0.0.1',
        port: config.PAYMENTS_API_PORT ?? 0,
        secretKey: config.PAYMENTS_SECRET_KEY,
        webhookSecret: config.PAYMENTS_WEBHOOK_SECRET,
        webhookUrl: config.PAYMENTS_WEBHOOK_URL,
      })
    : Promise.resolve(null);
  // a failure to start shows on first use, as a 503, and in the start-up log
  fakeReady.catch((err: Error) => console.error(`rigshelf: the local payments fake did not start: ${err.message}`));

  let client: Promise<Stripe> | null = null;
  function sdk(): Promise<Stripe> {
    client ??= fakeReady.then((fake) => {
      const where: Stripe.StripeConfig = fake
        ? { host: fake.host, port: fake.port, protocol: 'http' }
        : {
            ...(config.PAYMENTS_API_HOST ? { host: config.PAYMENTS_API_HOST } : {}),
            ...(config.PAYMENTS_API_PORT ? { port: config.PAYMENTS_API_PORT } : {}),
            ...(config.PAYMENTS_API_PROTOCOL ? { protocol: config.PAYMENTS_API_PROTOCOL } : {}),
          };
      return new Stripe(config.PAYMENTS_SECRET_KEY, { ...where, maxNetworkRetries: 2, timeout: 15_000, appInfo: { name: 'Rigshelf' } });
    });
    return client;
  }
  const verifier = new Stripe(config.PAYMENTS_SECRET_KEY);
  const notSetUp = () =>
    new AppError(503, 'payments_not_configured', 'Paying back is not set up on this Rigshelf yet; settle it with the printer’s owner directly for now.');
  if (!config.paymentsConfigured) console.warn('rigshelf: warning: PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET are not set, so paying back is off');

  function unavailable(err: unknown): AppError {
    console.error(`rigshelf: payments service: ${err instanceof Error ? err.message : String(err)}`);
    return new AppError(503, 'payments_unavailable', 'The payments service did not answer; nothing was charged. Try again in a minute.');
  }

  return {
    fake: () => fakeReady.catch(() => null),

    async createCheckout(input) {
      if (!config.paymentsConfigured) throw notSetUp();
      const stripe = await sdk().catch((err) => Promise.reject(unavailable(err)));
      try {
        const session = await stripe.checkout.sessions.create({
          mode: 'payment',
          line_items: [
            { quantity: 1, price_data: { currency: input.currency.toLowerCase(), unit_amount: input.amountMinor, product_data: { name: input.title } } },
          ],
          client_reference_id: String(input.requestId),
          metadata: { printRequestId: String(input.requestId) },
          success_url: input.successUrl,
          cancel_url: input.cancelUrl,
        });
        return { id: session.id, url: session.url ?? null, clientSecret: session.client_secret ?? null };
      } catch (err) {
        throw unavailable(err);
      }
    },

    async refund(paymentRef, idempotencyKey) {
      if (!config.paymentsConfigured) throw notSetUp();
      const stripe = await sdk();
      const refund = await stripe.refunds.create({ payment_intent: paymentRef }, { idempotencyKey });
      return { id: refund.id, status: refund.status };
    },

    verify(rawBody, signature) {
      if (!signature) throw new Error('No signature header.');
      if (!config.paymentsConfigured) throw new Error('Payments are not set up.');
      return verifier.webhooks.constructEvent(rawBody, signature, config.PAYMENTS_WEBHOOK_SECRET);
    },

    async close() {
      const fake = await fakeReady.catch(() => null);
      await fake?.close();
    },
  };
}
