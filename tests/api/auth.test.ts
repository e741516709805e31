import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { SESSION_COOKIE } from '../../server/app';
import { loadConfig } from '../../server/config';
import { Session } from '../../server/db/models';
import { LOGIN_DELAY_STEP_MS } from '../../server/modules/auth/routes';
import { ACCOUNT_ANSWER_FLOOR_MS } from '../../server/modules/auth/service';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});
// the counters live in the database, shared by every app built over it (as by every instance):
// each test starts with none, whatever limits the apps of earlier tests had
beforeEach(async () => {
  await t.sequelize.query('DELETE FROM rate_limits');
});

function sessionCookie(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  return cookies.find((c) => c.startsWith(`${SESSION_COOKIE}=`))?.split(';')[0];
}

describe('auth · register, sign in, me, sign out', () => {
  it('register · a new address · 202 "check your mail", nobody signed in, an unconfirmed account that can sign in', async () => {
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/register').send({ email: 'New.Loader@Crew.test', password: 'long enough pass', displayName: 'Nia Loader' });
    expect(res.status).toBe(202);
    expect(res.body.message).toMatch(/Check your mail.*new\.loader@crew\.test.*confirm/);
    expect(res.body.user).toBeUndefined();
    expect((await a.get('/api/auth/me')).status).toBe(401);
    const login = await a.login('new.loader@crew.test', 'long enough pass');
    expect(login.status).toBe(200);
    expect(login.body.user).toMatchObject({ email: 'new.loader@crew.test', role: 'member', status: 'active', emailVerified: false });
    expect(login.body.user.passwordHash).toBeUndefined();
  });

  it('register · an address that already has an account · the same 202 answer, the password unchanged', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const known = await a.post('/api/auth/register').send({ email, password: 'another long phrase', displayName: 'Twin' });
    const fresh = await a.post('/api/auth/register').send({ email: `fresh-${Date.now()}@crew.test`, password: 'another long phrase', displayName: 'Twin' });
    expect(known.status).toBe(202);
    expect(fresh.status).toBe(202);
    expect(known.body.message.replace(email, '<address>')).toBe(fresh.body.message.replace(/fresh-\d+@crew\.test/, '<address>'));
    expect((await a.login(email, 'another long phrase')).status).toBe(401);
    expect((await a.login(email, password)).status).toBe(200);
  });

  it('register · known and new addresses · both answers take at least the same floor (timing does not tell)', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    for (const address of [email, `floor-${Date.now()}@crew.test`]) {
      const started = performance.now();
      expect((await a.post('/api/auth/register').send({ email: address, password: 'another long phrase', displayName: 'Floor' })).status).toBe(202);
      // a lower bound only (never an upper one): deterministic on a loaded machine
      expect(performance.now() - started).toBeGreaterThanOrEqual(ACCOUNT_ANSWER_FLOOR_MS - 5);
    }
  });

  it('auth · sign in, me, sign out · 204 and then me is 401', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const login = await a.login(email, password);
    expect(login.status).toBe(200);
    expect(login.body.user).toEqual({
      id: expect.any(Number),
      email,
      displayName: expect.any(String),
      role: 'member',
      status: 'active',
      crewRole: null,
      createdAt: expect.any(String),
      emailVerified: true,
    });
    expect(sessionCookie(login)).toBeDefined();
    expect(login.headers['set-cookie']?.[0]).toMatch(/HttpOnly/i);
    expect(login.headers['set-cookie']?.[0]).toMatch(/SameSite=Lax/i);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    expect((await a.post('/api/auth/logout')).status).toBe(204);
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('auth · a wrong password or an unknown e-mail · the same generic 401', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    const wrong = await a.login(email, 'not the password');
    const unknown = await a.login('nobody@crew.test', 'not the password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
  });

  it('auth · sign-in · the session id changes', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const before = sessionCookie(await a.agent.get('/api/auth/csrf'));
    const after = sessionCookie(await a.login(email, password));
    expect(before).toBeDefined();
    expect(after).toBeDefined();
    expect(after).not.toBe(before);
  });
});

describe('auth · suspended accounts', () => {
  it('auth · sign-in to a suspended account · a clear 403', async () => {
    const { email, password } = await makeUser('member', { status: 'suspended' });
    const a = await agentFor(t.app);
    const res = await a.login(email, password);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('account_suspended');
  });

  it('auth · an admin suspends an account · its open sessions end', async () => {
    const member = await makeUser();
    const admin = await makeUser('admin');
    const m = await agentFor(t.app);
    await m.login(member.email, member.password);
    const ad = await agentFor(t.app);
    await ad.login(admin.email, admin.password);
    expect((await m.get('/api/auth/me')).status).toBe(200);
    expect((await ad.patch(`/api/admin/users/${member.user.id}`).send({ status: 'suspended' })).status).toBe(200);
    expect((await m.get('/api/auth/me')).status).toBe(401);
  });

  it('auth · account suspended behind its back (e.g. directly in the database) · the session stops', async () => {
    const member = await makeUser();
    const m = await agentFor(t.app);
    await m.login(member.email, member.password);
    await member.user.update({ status: 'suspended' });
    expect((await m.get('/api/auth/me')).status).toBe(401);
  });
});

describe('auth · sessions live in MariaDB', () => {
  it('sessions · an app restart · the session is kept', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const login = await a.login(email, password);
    const cookie = sessionCookie(login)!;

    const restarted = await createTestApp();
    try {
      const me = await request(restarted.app).get('/api/auth/me').set('Cookie', cookie);
      expect(me.status).toBe(200);
      expect(me.body.user.email).toBe(email);
    } finally {
      await restarted.close();
    }
  });
});

describe('auth · CSRF', () => {
  it('CSRF · a state-changing request without the token · 403 with a clear message', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/login').send({ email, password });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
    expect(res.body.error.message).toMatch(/X-CSRF-Token/);
  });

  it('CSRF · a wrong token · refused', async () => {
    const a = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/logout').set('X-CSRF-Token', 'not-the-token');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('CSRF · a token of another session · refused', async () => {
    const a = await agentFor(t.app);
    const b = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/logout').set('X-CSRF-Token', b.token);
    expect(res.status).toBe(403);
  });
});

describe('auth · rate limits', () => {
  it('sign-in limits · failed sign-ins on one account · a clear 429', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '3', LOGIN_LIMIT_PER_IP: '100' });
    try {
      const { email } = await makeUser();
      const a = await agentFor(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 4; i++) statuses.push((await a.login(email, 'wrong password')).status);
      expect(statuses).toEqual([401, 401, 401, 429]);
      const last = await a.login(email, 'wrong password');
      expect(last.body.error.code).toBe('too_many_attempts');
      expect(last.body.error.message).toMatch(/Wait 15 minutes/);
    } finally {
      await limited.close();
    }
  });

  it('per network address · past a tenth of the limit · failures are slowed down before any is refused', async () => {
    // LOGIN_LIMIT_PER_IP 4: the first failure is free, the next ones wait 250, 500, 750 ms, the fifth is refused
    const limited = await createTestApp({ LOGIN_LIMIT_PER_IP: '4', LOGIN_LIMIT_PER_ACCOUNT: '100' });
    try {
      const a = await agentFor(limited.app);
      const statuses: number[] = [];
      const started = performance.now();
      for (let i = 0; i < 4; i++) statuses.push((await a.login(`someone${i}@crew.test`, 'wrong password')).status);
      // a lower bound only: the waits happened (never an upper bound, which a loaded machine would break)
      expect(performance.now() - started).toBeGreaterThanOrEqual((1 + 2 + 3) * LOGIN_DELAY_STEP_MS - 20);
      expect(statuses).toEqual([401, 401, 401, 401]);
      const refused = await a.login('someone4@crew.test', 'wrong password');
      expect(refused.status).toBe(429);
      expect(refused.body.error.message).toMatch(/from this network/);
    } finally {
      await limited.close();
    }
  });

  it('per network address · over the limit · a correct password for an account with no recent failures still signs in', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_IP: '2', LOGIN_LIMIT_PER_ACCOUNT: '100' });
    try {
      const member = await makeUser();
      const a = await agentFor(limited.app);
      for (let i = 0; i < 3; i++) await a.login(`crewmate${i}@crew.test`, 'wrong password');
      expect((await a.login('crewmate9@crew.test', 'wrong password')).status).toBe(429);
      const ok = await a.login(member.email, member.password);
      expect(ok.status).toBe(200);
      expect(ok.body.user.email).toBe(member.email);
    } finally {
      await limited.close();
    }
  });

  it('per network address · over the limit · an account that already failed gets the same 429 for a right and a wrong password (no oracle)', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_IP: '2', LOGIN_LIMIT_PER_ACCOUNT: '100' });
    try {
      const target = await makeUser();
      const fresh = await makeUser();
      const a = await agentFor(limited.app);
      for (let i = 0; i < 3; i++) await a.login(target.email, `guess number ${i}`);
      const right = await a.login(target.email, target.password);
      const wrong = await a.login(target.email, 'yet another guess');
      expect(right.status).toBe(429);
      expect(wrong.status).toBe(429);
      expect(right.body).toEqual(wrong.body);
      // over the limit, a wrong password for an untouched account answers exactly like the refusal
      const firstWrong = await a.login(fresh.email, 'a first wrong guess');
      expect(firstWrong.status).toBe(429);
      expect(firstWrong.body).toEqual(right.body);
      // and that one failure puts the account under attack: its right password is refused now too
      expect((await a.login(fresh.email, fresh.password)).body).toEqual(right.body);
    } finally {
      await limited.close();
    }
  });

  it('per account · the address with spaces, a tab or capitals · counts on the same account', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '3', LOGIN_LIMIT_PER_IP: '1000' });
    try {
      const { email } = await makeUser();
      const a = await agentFor(limited.app);
      const variants = [` ${email}`, `${email} `, `\t${email}`, email.replace(/^./, (c) => c.toUpperCase())];
      const statuses: number[] = [];
      for (const variant of variants) statuses.push((await a.login(variant, 'wrong password')).status);
      expect(statuses).toEqual([401, 401, 401, 429]);
    } finally {
      await limited.close();
    }
  });

  it('register · too many from one network · a clear 429', async () => {
    const limited = await createTestApp({ MAIL_LIMIT_PER_IP: '2' });
    try {
      const a = await agentFor(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++) {
        statuses.push(
          (await a.post('/api/auth/register').send({ email: `flood-${i}-${Date.now()}@crew.test`, password: 'long enough pass', displayName: 'Flood' })).status,
        );
      }
      expect(statuses).toEqual([202, 202, 429]);
    } finally {
      await limited.close();
    }
  });

  it('register · one target address, written differently · limited per address (mails to one inbox)', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '2', MAIL_LIMIT_PER_IP: '100' });
    try {
      const a = await agentFor(limited.app);
      const address = `target-${Date.now()}@crew.test`;
      const statuses: number[] = [];
      for (const variant of [address, ` ${address.toUpperCase()}`, `${address}\t`]) {
        statuses.push((await a.post('/api/auth/register').send({ email: variant, password: 'long enough pass', displayName: 'Flood' })).status);
      }
      expect(statuses).toEqual([202, 202, 429]);
      await limited.mailer.flush();
      expect(limited.mailer.fake!.messages().filter((m) => m.to.includes(address))).toHaveLength(2);
    } finally {
      await limited.close();
    }
  });
});

describe('auth · passwords (NIST SP 800-63B §5.1.1.2)', () => {
  const register = async (password: string, email = `pw-${Date.now()}-${Math.random().toString(36).slice(2)}@crew.test`) =>
    (await agentFor(t.app)).post('/api/auth/register').send({ email, password, displayName: 'Pass Word' });

  it("register · repeated, sequential, common, or the account's own address · 422 with a field message", async () => {
    // SP 800-63B §5.1.1.2: compare against breached/common values, repetitive or sequential
    // characters, and context-specific words (the service's name, the username)
    const email = `nia.loader-${Date.now()}@crew.test`;
    const cases: [string, RegExp][] = [
      ['aaaaaaaaaa', /repeated or consecutive/],
      [' '.repeat(10), /repeated or consecutive/],
      ['1234567890', /repeated or consecutive/],
      ['password12', /common passwords/],
      ['Sunshine!2024', /common passwords/],
      [email, /e-mail address/],
      [`${email.split('@')[0]}!!`, /e-mail address/],
      ['rigshelf2026', /name of the shelf/],
    ];
    for (const [password, message] of cases) {
      const res = await register(password, email);
      expect(res.status, password).toBe(422);
      expect(res.body.error.fields.password, password).toMatch(message);
    }
  });

  it('register · a 64-character passphrase with spaces and no digits or symbols · accepted', async () => {
    // SP 800-63B §5.1.1.2: allow at least 64 characters, spaces included, and impose no composition rules
    const passphrase = 'gaffer tape holds the sandbag while the grip sings about the dolly';
    expect(passphrase.length).toBeGreaterThanOrEqual(64);
    expect((await register(passphrase)).status).toBe(202);
  });

  it('reset · a common password · 422 on the field, and the link still works afterwards', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    await a.post('/api/auth/password-reset/request').send({ email });
    await t.mailer.flush();
    const mail = t.mailer
      .fake!.messages()
      .filter((m) => m.to.includes(email))
      .at(-1)!;
    const token = /reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const weak = await a.post('/api/auth/password-reset').send({ token, password: 'password12' });
    expect(weak.status).toBe(422);
    expect(weak.body.error.fields.password).toMatch(/common passwords/);
    const own = await a.post('/api/auth/password-reset').send({ token, password: `${email}` });
    expect(own.body.error.fields.password).toMatch(/e-mail address/);
    expect((await a.post('/api/auth/password-reset').send({ token, password: 'a fresh long phrase' })).status).toBe(200);
  });
});

describe('auth · session lifetime', () => {
  async function signedInSession() {
    const member = await makeUser();
    const a = await agentFor(t.app);
    expect((await a.login(member.email, member.password)).status).toBe(200);
    const row = (await Session.findOne({ where: { userId: member.user.id } }))!;
    return { a, row };
  }
  const backdate = async (row: Session, hours: number) => {
    const data = JSON.parse(row.data!);
    expect(typeof data.signedInAt).toBe('number');
    data.signedInAt = Date.now() - hours * 3600_000;
    await row.update({ data: JSON.stringify(data) });
  };

  it('session · signed in longer ago than SESSION_ABSOLUTE_HOURS · ends even though it was in use (401)', async () => {
    const { a, row } = await signedInSession();
    expect((await a.get('/api/auth/me')).status).toBe(200);
    await backdate(row, t.config.SESSION_ABSOLUTE_HOURS + 1);
    expect((await a.get('/api/auth/me')).status).toBe(401);
    expect(await Session.findOne({ where: { sid: row.sid } })).toBeNull();
  });

  it('session · signed in a little less than SESSION_ABSOLUTE_HOURS ago · still signed in', async () => {
    const { a, row } = await signedInSession();
    await backdate(row, t.config.SESSION_ABSOLUTE_HOURS - 1);
    expect((await a.get('/api/auth/me')).status).toBe(200);
  });
});

describe('config · start-up warnings', () => {
  const base = { ...process.env, SESSION_SECRET: 'x'.repeat(40), DB_PASSWORD: 'p', SMTP_FAKE: '1' };
  it('TRUST_PROXY · unset in production · warns that cookies go out without Secure; set or not production: no warning', () => {
    const prod = loadConfig({ ...base, NODE_ENV: 'production', TRUST_PROXY: undefined });
    expect(prod.TRUST_PROXY).toBe(false);
    expect(prod.warnings.join(' ')).toMatch(/TRUST_PROXY.*Secure/);
    expect(loadConfig({ ...base, NODE_ENV: 'production', TRUST_PROXY: '1' }).warnings).toEqual([]);
    expect(loadConfig({ ...base, NODE_ENV: 'development', TRUST_PROXY: undefined }).warnings).toEqual([]);
  });

  it('config · defaults · the sign-in limit per network address is generous and sessions have an absolute end', () => {
    const c = loadConfig({ ...base, LOGIN_LIMIT_PER_IP: undefined, SESSION_ABSOLUTE_HOURS: undefined });
    expect(c.LOGIN_LIMIT_PER_IP).toBe(300);
    expect(c.SESSION_ABSOLUTE_HOURS).toBe(720);
  });
});

describe('API errors', () => {
  it('API errors · a validation failure · 422 with a message per field', async () => {
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/register').send({ email: 'not-an-email', password: 'short' });
    expect(res.status).toBe(422);
    expect(res.body).toEqual({
      error: {
        code: 'validation_failed',
        message: expect.any(String),
        fields: { email: expect.any(String), password: expect.stringMatching(/at least 10/), displayName: expect.any(String) },
      },
    });
  });

  it('API errors · an unknown API path · 404 JSON error', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: 'There is no API endpoint GET /api/no-such-thing.' } });
  });

  it('API errors · malformed JSON · 400', async () => {
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/login').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_json');
  });
});
