// Mail goes through an outbox table: callers add rows (inside their own transaction, so a decision
// and its mail commit together) and a delivery loop sends them over SMTP afterwards, so a slow or
// broken mail server never holds up a request. Failed deliveries are retried with exponential
// backoff and end up 'failed' for an admin to see and retry.
import nodemailer from 'nodemailer';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { Config } from '../../config';
import { MailMessage } from '../../db/models';
import type { FakeSmtp } from './fake-smtp';
import type { MailContent } from './templates';

export interface Mailer {
  /** Adds a row per recipient, inside the caller's transaction when given. */
  enqueue(to: string | string[], content: MailContent, transaction?: Transaction): Promise<void>;
  /** Delivers everything due now; waits for a delivery already running and then runs again. */
  flush(): Promise<void>;
  /** Starts the background delivery loop; after this, enqueue and kick also deliver right away. */
  start(): void;
  /** Asks the loop to deliver now (no-op until start()). */
  kick(): void;
  /** Stops the loop, waits for a delivery in hand, closes the SMTP transport and the fake. */
  close(): Promise<void>;
  /** The local fake SMTP server when SMTP_FAKE is on. */
  fake: FakeSmtp | null;
}

/** Delivery attempts before a mail is marked 'failed'. */
export const MAX_ATTEMPTS = 8;
const BACKOFF_BASE_MS = 10_000;
const BACKOFF_CAP_MS = 60 * 60_000;
/** While one delivery loop sends a row, others leave it alone for this long. */
const LEASE_MS = 2 * 60_000;
const LOOP_MS = 2000;
const BATCH = 50;

/** When the next attempt is due after `attempts` failed ones: 10 s · 2^attempts, at most an hour. */
export function backoffMs(attempts: number): number {
  return Math.min(BACKOFF_BASE_MS * 2 ** attempts, BACKOFF_CAP_MS);
}

function describe(err: unknown): string {
  const e = err as { message?: string; code?: string; responseCode?: number };
  const text = [e.code, e.responseCode, e.message ?? String(err)].filter((x) => x !== undefined && x !== '').join(' ');
  return text.slice(0, 1000);
}

export interface MailerDeps {
  config: Config;
  /** The database that holds mail_outbox (the MailMessage model is bound to it by initModels). */
  sequelize: Sequelize;
}

export async function createMailer({ config }: MailerDeps): Promise<Mailer> {
  // loaded only when used: the fake's packages (smtp-server, mailparser) are development dependencies
  const fake = config.SMTP_FAKE ? await (await import('./fake-smtp')).startFakeSmtp({ host: config.SMTP_HOST, port: config.SMTP_PORT }) : null;
  // one pooled connection, reused across a batch (a fresh connection per mail costs ~100 ms)
  const transport = nodemailer.createTransport({
    pool: true,
    maxConnections: 1,
    maxMessages: 100,
    host: config.SMTP_HOST,
    port: fake ? fake.port : config.SMTP_PORT,
    secure: fake ? false : config.SMTP_SECURE,
    ignoreTLS: fake !== null,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASS ?? '' } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });

  let started = false;
  let closed = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> | null = null;
  let again: Promise<void> | null = null;
  let loopFailing = false;

  async function deliver(row: MailMessage): Promise<void> {
    const now = new Date();
    // claim the row, so a second loop (another instance) does not send it too: one conditional
    // UPDATE, so of two loops only one changes the row; nextAttemptAt is the lease, and a mail whose
    // instance died mid-send is sent again once it passes (delivery is at least once)
    const [claimed] = await MailMessage.update(
      { nextAttemptAt: new Date(now.getTime() + LEASE_MS), claimedBy: config.INSTANCE_ID },
      { where: { id: row.id, status: 'queued', nextAttemptAt: { [Op.lte]: now } } },
    );
    if (!claimed) return;
    if (row.claimedBy) console.log(`rigshelf: mail #${row.id}: taken over from ${row.claimedBy}, whose try did not finish`);
    const attempts = row.attempts + 1;
    try {
      await transport.sendMail({
        from: config.MAIL_FROM,
        to: row.toAddress,
        subject: row.subject,
        text: row.textBody ?? '',
        html: row.htmlBody ?? undefined,
        headers: { 'Auto-Submitted': 'auto-generated' },
      });
      // the bodies may hold one-time links: keep them no longer than needed
      await MailMessage.update(
        { status: 'sent', attempts, sentAt: new Date(), lastError: null, textBody: null, htmlBody: null, claimedBy: null },
        { where: { id: row.id } },
      );
    } catch (err) {
      const code = (err as { responseCode?: number }).responseCode;
      // a 5xx answer is the server refusing this mail for good; retrying the same thing will not help
      const permanent = typeof code === 'number' && code >= 500 && code < 600;
      const failed = permanent || attempts >= MAX_ATTEMPTS;
      const lastError = describe(err);
      await MailMessage.update(
        {
          status: failed ? 'failed' : 'queued',
          attempts,
          claimedBy: null,
          lastError,
          nextAttemptAt: new Date(Date.now() + backoffMs(attempts)),
        },
        { where: { id: row.id } },
      );
      console.error(
        `rigshelf: mail #${row.id} to ${row.toAddress} not delivered (attempt ${attempts}): ${lastError}` +
          (failed ? ' — marked failed; an admin can retry it' : `; next try in ${Math.round(backoffMs(attempts) / 1000)} s`),
      );
    }
  }

  async function deliverDue(): Promise<void> {
    for (;;) {
      const due = await MailMessage.findAll({
        where: { status: 'queued', nextAttemptAt: { [Op.lte]: new Date() } },
        order: [['id', 'ASC']],
        limit: BATCH,
      });
      for (const row of due) {
        if (closed) return; // shutting down: the rest waits in the table for the next start
        await deliver(row);
      }
      if (due.length < BATCH) return;
    }
  }

  function flush(): Promise<void> {
    if (!running) {
      running = deliverDue().finally(() => {
        running = null;
      });
      return running;
    }
    // one more run after the current one, shared by everyone who asks meanwhile
    again ??= running
      .catch(() => undefined)
      .then(() => {
        again = null;
        return flush();
      });
    return again;
  }

  function kick() {
    if (!started || closed) return;
    flush().then(
      () => {
        if (loopFailing) console.log('rigshelf: mail delivery loop is working again');
        loopFailing = false;
      },
      (err) => {
        if (!loopFailing) console.error(`rigshelf: mail delivery loop failed: ${describe(err)}`);
        loopFailing = true;
      },
    );
  }

  return {
    fake,

    async enqueue(to, content, transaction) {
      const recipients = [...new Set((Array.isArray(to) ? to : [to]).map((a) => a.trim()).filter(Boolean))];
      if (!recipients.length) return;
      const now = new Date();
      await MailMessage.bulkCreate(
        recipients.map((toAddress) => ({
          toAddress,
          subject: content.subject.slice(0, 255),
          textBody: content.text,
          htmlBody: content.html,
          nextAttemptAt: now,
          sentAt: null,
          lastError: null,
        })),
        { transaction },
      );
      if (transaction) transaction.afterCommit(() => kick());
      else kick();
    },

    flush,
    kick,

    start() {
      if (started || closed) return;
      started = true;
      timer = setInterval(kick, LOOP_MS);
      timer.unref();
      kick();
    },

    async close() {
      closed = true;
      if (timer) clearInterval(timer);
      await (again ?? running)?.catch(() => undefined);
      transport.close();
      await fake?.close();
    },
  };
}
