import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SESSION_COOKIE } from '../../server/app';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

function sessionCookie(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  return cookies.find((c) => c.startsWith(`${SESSION_COOKIE}=`))?.split(';')[0];
}

describe('auth · register, sign in, me, sign out', () => {
  it('registers an active member and signs them in', async () => {
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/register').send({ email: 'New.Loader@Crew.test', password: 'long enough pass', displayName: 'Nia Loader' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'new.loader@crew.test', role: 'member', status: 'active' });
    expect(res.body.user.passwordHash).toBeUndefined();
    await a.refresh();
    expect((await a.get('/api/auth/me')).body.user.email).toBe('new.loader@crew.test');
  });

  it('refuses a second account with the same e-mail with 409 and a field message', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/register').send({ email, password: 'long enough pass', displayName: 'Twin' });
    expect(res.status).toBe(409);
    expect(res.body.error.fields.email).toMatch(/already exists/);
  });

  it('signs in, answers me, signs out (204) and then me is 401', async () => {
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

  it('answers a wrong password and an unknown e-mail with the same generic 401', async () => {
    const { email } = await makeUser();
    const a = await agentFor(t.app);
    const wrong = await a.login(email, 'not the password');
    const unknown = await a.login('nobody@crew.test', 'not the password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
  });

  it('changes the session id at sign-in', async () => {
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
  it('refuses sign-in to a suspended account with a clear 403', async () => {
    const { email, password } = await makeUser('member', { status: 'suspended' });
    const a = await agentFor(t.app);
    const res = await a.login(email, password);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('account_suspended');
  });

  it('ends the open sessions of an account when an admin suspends it', async () => {
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

  it('stops a session when the account is suspended behind its back (e.g. directly in the database)', async () => {
    const member = await makeUser();
    const m = await agentFor(t.app);
    await m.login(member.email, member.password);
    await member.user.update({ status: 'suspended' });
    expect((await m.get('/api/auth/me')).status).toBe(401);
  });
});

describe('auth · sessions live in MariaDB', () => {
  it('keeps a session across an app restart', async () => {
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
  it('refuses a state-changing request without the token with 403 and a clear message', async () => {
    const { email, password } = await makeUser();
    const a = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/login').send({ email, password });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
    expect(res.body.error.message).toMatch(/X-CSRF-Token/);
  });

  it('refuses a wrong token', async () => {
    const a = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/logout').set('X-CSRF-Token', 'not-the-token');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('refuses a token that belongs to another session', async () => {
    const a = await agentFor(t.app);
    const b = await agentFor(t.app);
    const res = await a.agent.post('/api/auth/logout').set('X-CSRF-Token', b.token);
    expect(res.status).toBe(403);
  });
});

describe('auth · rate limits', () => {
  it('limits failed sign-ins per account with a clear 429', async () => {
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

  it('limits sign-in attempts per IP address', async () => {
    const limited = await createTestApp({ LOGIN_LIMIT_PER_IP: '2', LOGIN_LIMIT_PER_ACCOUNT: '100' });
    try {
      const a = await agentFor(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++) statuses.push((await a.login(`someone${i}@crew.test`, 'wrong password')).status);
      expect(statuses).toEqual([401, 401, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('API errors', () => {
  it('answers validation failures with 422 and a message per field', async () => {
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

  it('answers unknown API paths with a 404 JSON error', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: 'There is no API endpoint GET /api/no-such-thing.' } });
  });

  it('answers malformed JSON with 400', async () => {
    const a = await agentFor(t.app);
    const res = await a.post('/api/auth/login').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_json');
  });
});
