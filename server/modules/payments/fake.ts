// A small local fake of the hosted payments API, on loopback, implementing exactly what Rigshelf calls
// through the official SDK: create and read a checkout session, create a refund. It also serves the
// page a member is sent to for paying (one button, nothing is charged) and, when they pay, delivers a
// signed `checkout.session.completed` event to the app's webhook, signed with the SDK's own helper.
import { randomBytes } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import escapeHtml from 'escape-html';
import express, { type Request, type Response } from 'express';
import Stripe from 'stripe';

export interface FakeSession {
  id: string;
  object: 'checkout.session';
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  success_url: string | null;
  cancel_url: string | null;
  payment_intent: string | null;
  url: string;
  created: number;
  livemode: false;
  line_items_description: string;
}

export interface FakeRefund {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  payment_intent: string;
  status: 'succeeded';
  metadata: Record<string, string>;
  created: number;
}

export interface SentEvent {
  id: string;
  type: string;
  payload: string;
  signature: string;
  /** HTTP status the webhook answered, or null when it could not be reached. */
  answered: number | null;
}

export interface PaymentsFake {
  host: string;
  port: number;
  url: string;
  sessions: Map<string, FakeSession>;
  refunds: FakeRefund[];
  events: SentEvent[];
  /** Where events go; tests point it at an app they started on a free port. */
  webhookUrl: string;
  /** Pays a session as the button on the pay page does; resolves with the event it sent. */
  pay(sessionId: string): Promise<SentEvent>;
  close(): Promise<void>;
}

const id = (prefix: string) => `${prefix}_fake_${randomBytes(12).toString('hex')}`;
const now = () => Math.floor(Date.now() / 1000);

function apiError(res: Response, status: number, message: string, param?: string) {
  res.status(status).json({ error: { type: 'invalid_request_error', message, ...(param ? { param } : {}) } });
}

function formatAmount(minor: number, currency: string): string {
  try {
    const digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
    return new Intl.NumberFormat('en', { style: 'currency', currency }).format(minor / 10 ** digits);
  } catch {
    return `${minor} ${currency}`;
  }
}

export async function startPaymentsFake(options: {
  host: string;
  port: number;
  secretKey: string;
  webhookSecret: string;
  webhookUrl: string;
}): Promise<PaymentsFake> {
  const signer = new Stripe(options.secretKey);
  const sessions = new Map<string, FakeSession>();
  const refunds: FakeRefund[] = [];
  const refundsByKey = new Map<string, FakeRefund>();
  const events: SentEvent[] = [];
  const app = express();
  app.disable('x-powered-by');

  let base = '';
  const fake: PaymentsFake = {
    host: options.host,
    port: 0,
    url: '',
    sessions,
    refunds,
    events,
    webhookUrl: options.webhookUrl,
    pay,
    close,
  };

  async function deliver(type: string, object: unknown): Promise<SentEvent> {
    const event = { id: id('evt'), object: 'event', type, created: now(), livemode: false, api_version: null, data: { object } };
    const payload = JSON.stringify(event);
    const signature = signer.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
    const sent: SentEvent = { id: event.id, type, payload, signature, answered: null };
    events.push(sent);
    try {
      const answer = await fetch(fake.webhookUrl, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'stripe-signature': signature },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      sent.answered = answer.status;
    } catch {
      sent.answered = null;
    }
    return sent;
  }

  async function pay(sessionId: string): Promise<SentEvent> {
    const session = sessions.get(sessionId);
    if (!session) throw new Error(`No session ${sessionId}`);
    if (session.status === 'open') {
      session.status = 'complete';
      session.payment_status = 'paid';
      session.payment_intent = id('pi');
    }
    return deliver('checkout.session.completed', session);
  }

  // the API, as the SDK calls it: form-encoded bodies with bracketed keys, a bearer key
  const api = express.Router();
  api.use((req, res, next) => {
    if (req.get('authorization') !== `Bearer ${options.secretKey}`) return apiError(res, 401, 'Invalid API key provided.');
    next();
  });
  api.use(express.urlencoded({ extended: true, limit: '100kb' }));

  api.post('/checkout/sessions', (req: Request, res: Response) => {
    const body = req.body as Record<string, unknown>;
    const items = body.line_items as
      { price_data?: { currency?: string; unit_amount?: string; product_data?: { name?: string } }; quantity?: string }[] | undefined;
    if (body.mode !== 'payment') return apiError(res, 400, 'The fake supports mode=payment only.', 'mode');
    if (!Array.isArray(items) || !items.length) return apiError(res, 400, 'line_items is required.', 'line_items');
    const currencies = new Set(items.map((i) => i.price_data?.currency?.toLowerCase()));
    if (currencies.size !== 1 || currencies.has(undefined)) return apiError(res, 400, 'Every line item needs the same price_data[currency].', 'line_items');
    let amount = 0;
    for (const item of items) {
      const unit = Number(item.price_data?.unit_amount);
      const qty = Number(item.quantity ?? 1);
      if (!Number.isInteger(unit) || unit < 0 || !Number.isInteger(qty) || qty < 1)
        return apiError(res, 400, 'unit_amount and quantity must be whole numbers.', 'line_items');
      amount += unit * qty;
    }
    const session: FakeSession = {
      id: id('cs'),
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: amount,
      currency: [...currencies][0]!,
      client_reference_id: typeof body.client_reference_id === 'string' ? body.client_reference_id : null,
      metadata: (body.metadata as Record<string, string>) ?? {},
      success_url: typeof body.success_url === 'string' ? body.success_url : null,
      cancel_url: typeof body.cancel_url === 'string' ? body.cancel_url : null,
      payment_intent: null,
      url: '',
      created: now(),
      livemode: false,
      line_items_description: items.map((i) => i.price_data?.product_data?.name ?? 'Item').join(', '),
    };
    session.url = `${base}/pay/${session.id}`;
    sessions.set(session.id, session);
    res.json(session);
  });

  api.get('/checkout/sessions/:id', (req, res) => {
    const session = sessions.get(String(req.params.id));
    if (!session) return apiError(res, 404, `No such checkout.session: '${req.params.id}'`);
    res.json(session);
  });

  api.post('/refunds', (req, res) => {
    const body = req.body as Record<string, unknown>;
    const key = req.get('idempotency-key');
    if (key && refundsByKey.has(key)) return res.json(refundsByKey.get(key));
    const pi = typeof body.payment_intent === 'string' ? body.payment_intent : '';
    const session = [...sessions.values()].find((s) => s.payment_intent === pi && s.payment_status === 'paid');
    if (!session) return apiError(res, 400, `No paid payment_intent '${pi}'.`, 'payment_intent');
    const already = refunds.filter((r) => r.payment_intent === pi).reduce((s, r) => s + r.amount, 0);
    const amount = body.amount === undefined ? session.amount_total - already : Number(body.amount);
    if (!Number.isInteger(amount) || amount <= 0 || amount + already > session.amount_total) {
      return apiError(res, 400, 'The refund is more than what is left of the payment.', 'amount');
    }
    const refund: FakeRefund = {
      id: id('re'),
      object: 'refund',
      amount,
      currency: session.currency,
      payment_intent: pi,
      status: 'succeeded',
      metadata: (body.metadata as Record<string, string>) ?? {},
      created: now(),
    };
    refunds.push(refund);
    if (key) refundsByKey.set(key, refund);
    res.json(refund);
  });

  api.use((req, res) => apiError(res, 404, `Unrecognized request URL (${req.method}: ${req.originalUrl}). The local fake implements only what Rigshelf uses.`));
  app.use('/v1', api);

  // the page a member pays on
  app.get('/pay/:id', (req, res) => {
    const session = sessions.get(String(req.params.id));
    if (!session) return res.status(404).type('text/plain').send('No such payment.');
    const done = session.status !== 'open';
    res.type('html').send(`<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Test payment</title>
<style>body{font-family:system-ui,sans-serif;background:#eef0f3;color:#1b1f24;margin:0;padding:24px}
main{max-width:420px;margin:40px auto;background:#fff;border:1px solid #ccd2da;border-radius:8px;padding:24px}
.amount{font-size:32px;font-weight:700;margin:8px 0 16px}.warn{background:#fff6d6;border:1px solid #e0c766;padding:8px 12px;border-radius:6px;font-size:14px}
button{font-size:18px;padding:12px 20px;width:100%;margin-top:16px;border:0;border-radius:6px;background:#2f4a7a;color:#fff;cursor:pointer}
a{display:block;margin-top:12px;text-align:center;color:#2f4a7a}</style></head>
<body><main>
<p class="warn">Local payments fake: a test payment. Nothing is charged and no card is asked for.</p>
<h1>Test payment</h1>
<p>${escapeHtml(session.line_items_description)}</p>
<p class="amount">${escapeHtml(formatAmount(session.amount_total, session.currency.toUpperCase()))}</p>
${done ? '<p>This payment is done.</p>' : `<form method="post" action="/pay/${escapeHtml(session.id)}"><button type="submit">Pay ${escapeHtml(formatAmount(session.amount_total, session.currency.toUpperCase()))}</button></form>`}
${session.cancel_url && !done ? `<a href="${escapeHtml(session.cancel_url)}">Back without paying</a>` : ''}
${session.success_url && done ? `<a href="${escapeHtml(session.success_url)}">Back to Rigshelf</a>` : ''}
</main></body></html>`);
  });

  app.post('/pay/:id', async (req, res) => {
    const session = sessions.get(String(req.params.id));
    if (!session) return res.status(404).type('text/plain').send('No such payment.');
    await pay(session.id);
    res.redirect(303, session.success_url ?? `/pay/${session.id}`);
  });

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, options.host, () => resolve());
  });
  const address = server.address();
  fake.port = typeof address === 'object' && address ? address.port : options.port;
  base = `http://${options.host.includes(':') ? `[${options.host}]` : options.host}:${fake.port}`;
  fake.url = base;

  async function close() {
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
  return fake;
}
