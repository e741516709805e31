import { createHash } from 'node:crypto';
import { createServer, type AddressInfo } from 'node:net';
import nodemailer from 'nodemailer';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { MailboxMessage, OutboxItem, Role } from '@shared/types';
import { loadConfig } from '../../server/config';
import { AccountToken, MailMessage, User } from '../../server/db/models';
import { hashToken } from '../../server/modules/auth/tokens';
import { startFakeSmtp } from '../../server/modules/mail/fake-smtp';
import { createMailer, MAX_ATTEMPTS, type Mailer } from '../../server/modules/mail/outbox';
import { mailTemplates } from '../../server/modules/mail/templates';
import { agentFor, createTestApp, makeUser, testConfig, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});
// rate-limit counters live in the database, shared by every app built over it: each test starts with none
beforeEach(async () => {
  await t.sequelize.query('DELETE FROM rate_limits');
});

let n = 0;
const address = (what: string) => `${what}-${++n}-${Date.now()}@crew.test`;

async function mailsTo(to: string): Promise<MailboxMessage[]> {
  await t.mailer.flush();
  return t.mailer.fake!.messages().filter((m) => m.to.includes(to));
}

function tokenIn(mail: MailboxMessage, path: string): string {
  const match = new RegExp(`${path}\\?token=([A-Za-z0-9_-]+)`).exec(mail.text);
  if (!match) throw new Error(`no ${path} link in: ${mail.text}`);
  return match[1];
}

async function register(displayName = 'Nia Loader') {
  const email = address('new');
  const a = await agentFor(t.app);
  const res = await a.post('/api/auth/register').send({ email, password: 'long enough pass', displayName });
  expect(res.status).toBe(202);
  // registering signs nobody in; the new member signs in (before or after confirming)
  expect((await a.login(email, 'long enough pass')).status).toBe(200);
  const [mail] = await mailsTo(email);
  return { a, email, mail, token: tokenIn(mail, '/verify-email') };
}

async function as(who: 'anonymous' | Role) {
  const a = await agentFor(t.app);
  if (who !== 'anonymous') {
    const { email, password } = await makeUser(who);
    expect((await a.login(email, password)).status).toBe(200);
  }
  return a;
}

async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  const { port } = server.address() as AddressInfo;
  await new Promise<void>((r) => server.close(() => r()));
  return port;
}

describe('mail · verification at registration', () => {
  it('registration · a new account · queues a confirmation mail with a working link to the new address', async () => {
    const { a, email, mail, token } = await register();
    expect(mail.to).toEqual([email]);
    expect(mail.from).toContain('shelf@rigshelf.test');
    expect(mail.subject).toBe('Confirm your e-mail address for Rigshelf');
    expect(mail.text).toContain(`${t.config.PUBLIC_URL}/verify-email?token=${token}`);
    expect(mail.html).toContain(`${t.config.PUBLIC_URL}/verify-email?token=${token}`);
    expect((await a.get('/api/auth/me')).body.user.emailVerified).toBe(false);

    const res = await a.post('/api/auth/verify-email').send({ token });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email, emailVerified: true });
    expect((await a.get('/api/auth/me')).body.user.emailVerified).toBe(true);
  });

  it('tokens · in the database · only their sha256 is kept', async () => {
    const { email, token } = await register();
    const user = await User.findOne({ where: { email } });
    const rows = await AccountToken.findAll({ where: { userId: user!.id } });
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(rows.map((r) => r.get({ plain: true })))).not.toContain(token);
    expect(Buffer.from(token, 'base64url')).toHaveLength(32);
  });

  it('verify · the same link twice · answers 400 token_used the second time', async () => {
    const { a, token } = await register();
    expect((await a.post('/api/auth/verify-email').send({ token })).status).toBe(200);
    const again = await a.post('/api/auth/verify-email').send({ token });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('token_used');
    expect(again.body.error.message).toMatch(/already used/);
  });

  it('verify · an expired link · answers 400 token_expired and says how to get a new one', async () => {
    const { a, token } = await register();
    await AccountToken.update({ expiresAt: new Date(Date.now() - 60_000) }, { where: { tokenHash: hashToken(token) } });
    const res = await a.post('/api/auth/verify-email').send({ token });
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({ code: 'token_expired', message: 'This link has expired. Ask for a new one from your account page.' });
    expect((await a.get('/api/auth/me')).body.user.emailVerified).toBe(false);
  });

  it('verify · a made-up, a mangled or a reset token · answers 400 token_invalid', async () => {
    const a = await agentFor(t.app);
    for (const token of ['A'.repeat(43), 'abc', `${(await register()).token}x`]) {
      const res = await a.post('/api/auth/verify-email').send({ token });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('token_invalid');
      expect(res.body.error.message).toMatch(/not valid/);
    }
    const missing = await a.post('/api/auth/verify-email').send({});
    expect(missing.status).toBe(422);
    expect(missing.body.error.fields.token).toMatch(/missing its code/);
  });

  it('resend · signed in and not yet confirmed · 202 and a new mail; anonymous 401; confirmed 409', async () => {
    const { a, email, token } = await register();
    const res = await a.post('/api/auth/verify-email/resend');
    expect(res.status).toBe(202);
    expect(res.body.message).toContain(email);
    const mails = await mailsTo(email);
    expect(mails).toHaveLength(2);
    const second = tokenIn(mails[1], '/verify-email');
    expect(second).not.toBe(token);

    expect((await (await agentFor(t.app)).post('/api/auth/verify-email/resend')).status).toBe(401);

    expect((await a.post('/api/auth/verify-email').send({ token: second })).status).toBe(200);
    const done = await a.post('/api/auth/verify-email/resend');
    expect(done.status).toBe(409);
    expect(done.body.error.code).toBe('already_verified');
  });

  it('verification mail · a hostile display name · is escaped in the HTML and plain in the text', async () => {
    const hostile = '<img src=x onerror=alert(1)>';
    const { mail } = await register(hostile);
    expect(mail.html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(mail.html).not.toContain('<img');
    expect(mail.text).toContain(`Hi ${hostile},`);
  });
});

describe('mail · registration with a known address', () => {
  it('registration · an address that already has an account · its owner gets a "someone tried" mail with sign-in and reset links, no confirmation link', async () => {
    const { email, user } = await makeUser();
    const a = await agentFor(t.app);
    expect((await a.post('/api/auth/register').send({ email: ` ${email.toUpperCase()}`, password: 'long enough pass', displayName: 'Twin' })).status).toBe(202);
    const [mail] = await mailsTo(email);
    expect(mail.subject).toBe('Someone tried to sign up with your address');
    expect(mail.text).toContain(`Hi ${user.displayName}`);
    expect(mail.text).toContain(`${t.config.PUBLIC_URL}/forgot-password`);
    expect(mail.text).toContain(`${t.config.PUBLIC_URL}/sign-in`);
    expect(mail.text).not.toContain('/verify-email');
    expect(await User.count({ where: { email } })).toBe(1);
  });
});

describe('mail · password reset', () => {
  it('request · an existing and an unknown address · identical 202 answers, and only the existing one gets mail', async () => {
    const { email } = await makeUser();
    const unknown = address('nobody');
    const a = await agentFor(t.app);
    const known = await a.post('/api/auth/password-reset/request').send({ email });
    const none = await a.post('/api/auth/password-reset/request').send({ email: unknown });
    expect(known.status).toBe(202);
    expect(none.status).toBe(202);
    expect(none.body).toEqual(known.body);
    expect(known.body.message).toMatch(/If an account uses that address/);
    const sent = await mailsTo(email);
    expect(sent).toHaveLength(1);
    expect(sent[0].subject).toBe('Reset your Rigshelf password');
    expect(sent[0].text).toContain(`${t.config.PUBLIC_URL}/reset-password?token=`);
    expect(await mailsTo(unknown)).toHaveLength(0);
    expect(await MailMessage.count({ where: { toAddress: unknown } })).toBe(0);
  });

  it('reset · with the mailed token · changes the password, ends other sessions, and the token cannot be reused', async () => {
    const { email, password } = await makeUser();
    const elsewhere = await agentFor(t.app);
    expect((await elsewhere.login(email, password)).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(200);

    const a = await agentFor(t.app);
    await a.post('/api/auth/password-reset/request').send({ email }).expect(202);
    const token = tokenIn((await mailsTo(email))[0], '/reset-password');

    const res = await a.post('/api/auth/password-reset').send({ token, password: 'a brand new passphrase' });
    expect(res.status).toBe(200);
    expect(res.body.message).toMatch(/Sign in with the new password/);

    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    const b = await agentFor(t.app);
    expect((await b.login(email, password)).status).toBe(401);
    expect((await b.login(email, 'a brand new passphrase')).status).toBe(200);

    const reused = await a.post('/api/auth/password-reset').send({ token, password: 'yet another passphrase' });
    expect(reused.status).toBe(400);
    expect(reused.body.error.code).toBe('token_used');
    expect((await (await agentFor(t.app)).login(email, 'yet another passphrase')).status).toBe(401);
  });

  it('reset · signed in as the same account · ends that session too', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    await a.login(email, password);
    await a.post('/api/auth/password-reset/request').send({ email }).expect(202);
    const token = tokenIn((await mailsTo(email))[0], '/reset-password');
    expect((await a.post('/api/auth/password-reset').send({ token, password: 'a brand new passphrase' })).status).toBe(200);
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('reset · an expired token · answers 400 token_expired and keeps the old password', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    await a.post('/api/auth/password-reset/request').send({ email }).expect(202);
    const token = tokenIn((await mailsTo(email))[0], '/reset-password');
    await AccountToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(token) } });
    const res = await a.post('/api/auth/password-reset').send({ token, password: 'a brand new passphrase' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('token_expired');
    expect(res.body.error.message).toMatch(/Ask for a new one/);
    expect((await (await agentFor(t.app)).login(email, password)).status).toBe(200);
  });

  it('request · a second time · ends the older link; the newest one works', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    await a.post('/api/auth/password-reset/request').send({ email }).expect(202);
    await a.post('/api/auth/password-reset/request').send({ email }).expect(202);
    const [first, second] = (await mailsTo(email)).map((m) => tokenIn(m, '/reset-password'));
    const old = await a.post('/api/auth/password-reset').send({ token: first, password: 'a brand new passphrase' });
    expect(old.status).toBe(400);
    expect(old.body.error.code).toBe('token_expired');
    expect((await a.post('/api/auth/password-reset').send({ token: second, password: 'a brand new passphrase' })).status).toBe(200);
  });

  it('reset · a verification token or a short password · 400 token_invalid / 422 with the password rule', async () => {
    const { token } = await register();
    const a = await agentFor(t.app);
    const wrongKind = await a.post('/api/auth/password-reset').send({ token, password: 'a brand new passphrase' });
    expect(wrongKind.status).toBe(400);
    expect(wrongKind.body.error.code).toBe('token_invalid');
    const short = await a.post('/api/auth/password-reset').send({ token, password: 'short' });
    expect(short.status).toBe(422);
    expect(short.body.error.fields.password).toMatch(/at least 10/);
  });

  it('request · without the CSRF token · is refused with 403', async () => {
    const a = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/password-reset/request').send({ email: address('x') });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('request · too many from one network · a clear 429', async () => {
    const limited = await createTestApp({ MAIL_LIMIT_PER_IP: '2' });
    try {
      const a = await agentFor(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++) statuses.push((await a.post('/api/auth/password-reset/request').send({ email: address('flood') })).status);
      expect(statuses).toEqual([202, 202, 429]);
      const last = await a.post('/api/auth/password-reset/request').send({ email: address('flood') });
      expect(last.body.error.code).toBe('too_many_attempts');
      expect(last.body.error.message).toMatch(/Wait 15 minutes/);
    } finally {
      await limited.close();
    }
  });
});

describe('mail · outbox delivery', () => {
  let broken: Mailer;
  beforeAll(async () => {
    broken = await createMailer({ config: testConfig({ SMTP_FAKE: '0', SMTP_PORT: String(await closedPort()) }), sequelize: t.sequelize });
  });
  afterAll(async () => {
    await broken.close();
  });

  it('failure · the SMTP server is down · the row stays queued with attempts 1 and the error, admins see it, a retry delivers it', async () => {
    const to = address('down');
    const { user } = await makeUser();
    // the caller's own change and its mail commit together, whatever delivery does later
    await t.sequelize.transaction(async (transaction) => {
      await user.update({ crewRole: 'Loader, Halfmoon Unit' }, { transaction });
      await broken.enqueue(to, mailTemplates.verifyEmail({ displayName: 'Down', link: 'http://x.test/', expiresHours: 48 }), transaction);
    });
    await broken.flush();
    expect((await User.findByPk(user.id))!.crewRole).toBe('Loader, Halfmoon Unit');

    const row = await MailMessage.findOne({ where: { toAddress: to } });
    expect(row).not.toBeNull();
    expect(row!.status).toBe('queued');
    expect(row!.attempts).toBe(1);
    expect(row!.lastError).toMatch(/ECONNREFUSED/);
    expect(row!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() + 10_000);

    const admin = await as('admin');
    const list = await admin.get('/api/admin/mail');
    expect(list.status).toBe(200);
    const item = (list.body.items as OutboxItem[]).find((i) => i.to === to);
    expect(item).toEqual({
      id: row!.id,
      to,
      subject: 'Confirm your e-mail address for Rigshelf',
      status: 'queued',
      attempts: 1,
      lastError: expect.stringMatching(/ECONNREFUSED/),
      createdAt: expect.any(String),
      sentAt: null,
    });
    expect(list.body.items[0].id).toBeGreaterThanOrEqual(row!.id); // newest first

    // not due yet: a flush through the working fake leaves it alone
    expect(await mailsTo(to)).toHaveLength(0);
    const retried = await admin.post(`/api/admin/mail/${row!.id}/retry`);
    expect(retried.status).toBe(200);
    expect(retried.body.item).toMatchObject({ id: row!.id, status: 'queued' });
    const delivered = await mailsTo(to);
    expect(delivered).toHaveLength(1);
    await row!.reload();
    expect(row!.status).toBe('sent');
    expect(row!.attempts).toBe(2);
    expect(row!.sentAt).toBeInstanceOf(Date);
    // the mail may hold a one-time link: its bodies go once it is delivered
    expect(row!.textBody).toBeNull();
    expect(row!.htmlBody).toBeNull();

    const again = await admin.post(`/api/admin/mail/${row!.id}/retry`);
    expect(again.status).toBe(409);
    expect((await admin.post('/api/admin/mail/999999/retry')).status).toBe(404);
  });

  it(`failure · the ${MAX_ATTEMPTS}th attempt fails · the mail is marked failed until an admin retries it`, async () => {
    const to = address('gone');
    await broken.enqueue(to, mailTemplates.verifyEmail({ displayName: 'Gone', link: 'http://x.test/', expiresHours: 48 }));
    await MailMessage.update({ attempts: MAX_ATTEMPTS - 1 }, { where: { toAddress: to } });
    await broken.flush();
    const row = (await MailMessage.findOne({ where: { toAddress: to } }))!;
    expect(row.status).toBe('failed');
    expect(row.attempts).toBe(MAX_ATTEMPTS);

    const admin = await as('admin');
    const item = ((await admin.get('/api/admin/mail')).body.items as OutboxItem[]).find((i) => i.id === row.id);
    expect(item?.status).toBe('failed');
    expect((await admin.post(`/api/admin/mail/${row.id}/retry`)).status).toBe(200);
    expect(await mailsTo(to)).toHaveLength(1);
    await row.reload();
    expect(row.status).toBe('sent');
  });

  it('failure · the server refuses the mail for good (5xx) · marked failed at once', async () => {
    const tiny = await startFakeSmtp({ host: '127.0.0.1', port: 0, maxBytes: 200 });
    const strict = await createMailer({ config: testConfig({ SMTP_FAKE: '0', SMTP_PORT: String(tiny.port) }), sequelize: t.sequelize });
    try {
      const to = address('big');
      await strict.enqueue(to, mailTemplates.verifyEmail({ displayName: 'Big', link: 'http://x.test/', expiresHours: 48 }));
      await strict.flush();
      const row = (await MailMessage.findOne({ where: { toAddress: to } }))!;
      expect(row.status).toBe('failed');
      expect(row.attempts).toBe(1);
      expect(row.lastError).toMatch(/552/);
      expect(tiny.messages()).toHaveLength(0);
    } finally {
      await strict.close();
      await tiny.close();
    }
  });

  it('enqueue · inside a transaction that rolls back · leaves no mail behind', async () => {
    const to = address('rollback');
    await expect(
      t.sequelize.transaction(async (transaction) => {
        await t.mailer.enqueue(to, mailTemplates.verifyEmail({ displayName: 'R', link: 'http://x.test/', expiresHours: 48 }), transaction);
        throw new Error('the decision failed');
      }),
    ).rejects.toThrow('the decision failed');
    expect(await MailMessage.count({ where: { toAddress: to } })).toBe(0);
    expect(await mailsTo(to)).toHaveLength(0);
  });

  it('enqueue · several recipients · one row and one delivery each', async () => {
    const to = [address('crew-a'), address('crew-b')];
    await t.mailer.enqueue(to, mailTemplates.newSubmission({ partTitle: 'Cable clip', contributor: 'Wren', link: 'http://x.test/', isRevision: false }));
    expect(await MailMessage.count({ where: { toAddress: to } })).toBe(2);
    expect(await mailsTo(to[0])).toHaveLength(1);
    expect(await mailsTo(to[1])).toHaveLength(1);
  });

  it('background loop · started · delivers soon after the enqueue commits, without a flush', async () => {
    const app = await createTestApp();
    try {
      app.mailer.start();
      const to = address('loop');
      await app.sequelize.transaction((transaction) =>
        app.mailer.enqueue(to, mailTemplates.verifyEmail({ displayName: 'L', link: 'http://x.test/', expiresHours: 48 }), transaction),
      );
      await expect.poll(() => app.mailer.fake!.messages().filter((m) => m.to.includes(to)).length, { timeout: 5000 }).toBe(1);
    } finally {
      await app.close();
    }
  });
});

describe('mail · the local fake SMTP server', () => {
  it('fake · more mail than it keeps · drops the oldest first', async () => {
    const fake = await startFakeSmtp({ host: '127.0.0.1', port: 0, keep: 2 });
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, ignoreTLS: true });
    try {
      for (const subject of ['one', 'two', 'three']) {
        await transport.sendMail({ from: 'a@crew.test', to: 'b@crew.test', subject, text: subject });
      }
      expect(fake.messages().map((m) => m.subject)).toEqual(['two', 'three']);
      fake.clear();
      expect(fake.messages()).toEqual([]);
    } finally {
      transport.close();
      await fake.close();
    }
  });

  it('fake · asked to listen beyond loopback · refuses', async () => {
    await expect(startFakeSmtp({ host: '0.0.0.0', port: 0 })).rejects.toThrow(/loopback only/);
  });

  it('config · the fake with a non-loopback SMTP_HOST · stops start-up naming the variable; off by default in production', () => {
    expect(() => loadConfig({ ...process.env, SMTP_FAKE: '1', SMTP_HOST: 'mail.example.org' })).toThrow(/SMTP_HOST/);
    expect(loadConfig({ ...process.env, NODE_ENV: 'production', SMTP_FAKE: undefined }).SMTP_FAKE).toBe(false);
    expect(loadConfig({ ...process.env, NODE_ENV: 'development', SMTP_FAKE: undefined, PORT: '4000', PUBLIC_URL: undefined }).PUBLIC_URL).toBe(
      'http://127.0.0.1:4000',
    );
  });
});

describe('mail · who may read it', () => {
  const expected = { anonymous: 401, member: 403, moderator: 403, admin: 200 } as const;
  for (const who of Object.keys(expected) as (keyof typeof expected)[]) {
    it(`mail routes · GET /api/admin/mail, POST its retry and GET /api/dev/mailbox as ${who} · ${expected[who]}`, async () => {
      const a = await as(who);
      expect((await a.get('/api/admin/mail')).status).toBe(expected[who]);
      expect((await a.get('/api/dev/mailbox')).status).toBe(expected[who]);
      const retry = await a.post('/api/admin/mail/999999/retry');
      expect(retry.status).toBe(who === 'admin' ? 404 : expected[who]);
    });
  }

  it('dev mailbox · as admin · lists the fake’s mail newest first', async () => {
    const first = address('first');
    const second = address('second');
    await t.mailer.enqueue(first, mailTemplates.verifyEmail({ displayName: 'F', link: 'http://x.test/', expiresHours: 48 }));
    await t.mailer.flush();
    await t.mailer.enqueue(second, mailTemplates.verifyEmail({ displayName: 'S', link: 'http://x.test/', expiresHours: 48 }));
    await t.mailer.flush();
    const res = await (await as('admin')).get('/api/dev/mailbox');
    const items = res.body.items as MailboxMessage[];
    expect(items[0].to).toEqual([second]);
    expect(items[1].to).toEqual([first]);
    expect(items[0]).toEqual({
      id: expect.any(Number),
      from: expect.stringContaining('shelf@rigshelf.test'),
      to: [second],
      subject: 'Confirm your e-mail address for Rigshelf',
      text: expect.stringContaining('Hi S,'),
      html: expect.stringContaining('Hi S,'),
      receivedAt: expect.any(String),
    });
  });

  it('dev mailbox · in production, even with the fake on · is an unknown API path (404)', async () => {
    const prod = await createTestApp({ NODE_ENV: 'production', SMTP_FAKE: '1' });
    try {
      const anonymous = await request(prod.app).get('/api/dev/mailbox');
      expect(anonymous.status).toBe(404);
      expect(anonymous.body.error.code).toBe('not_found');
      const { email, password } = await makeUser('admin');
      const admin = await agentFor(prod.app);
      expect((await admin.login(email, password)).status).toBe(200);
      expect((await admin.get('/api/dev/mailbox')).status).toBe(404);
      expect((await admin.get('/api/admin/mail')).status).toBe(200);
    } finally {
      await prod.close();
    }
  });

  it('dev mailbox · with the fake off · is an unknown API path (404)', async () => {
    const off = await createTestApp({ SMTP_FAKE: '0', SMTP_PORT: String(await closedPort()) });
    try {
      expect(off.mailer.fake).toBeNull();
      expect((await request(off.app).get('/api/dev/mailbox')).status).toBe(404);
    } finally {
      await off.close();
    }
  });
});
