import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

type Who = 'anonymous' | Role;

async function as(who: Who) {
  const a = await agentFor(t.app);
  if (who !== 'anonymous') {
    const { email, password } = await makeUser(who);
    await a.login(email, password);
  }
  return a;
}

describe('admin routes · role matrix', () => {
  const expected: Record<Who, number> = { anonymous: 401, member: 403, moderator: 403, admin: 200 };

  for (const who of Object.keys(expected) as Who[]) {
    it(`admin routes · GET /api/admin/users as ${who} · ${expected[who]}`, async () => {
      const a = await as(who);
      expect((await a.get('/api/admin/users')).status).toBe(expected[who]);
    });

    it(`admin routes · POST /api/admin/bodies as ${who} · ${expected[who] === 200 ? 201 : expected[who]}`, async () => {
      const a = await as(who);
      const res = await a.post('/api/admin/bodies').send({ maker: 'Matrix', model: `Cam ${who}` });
      expect(res.status).toBe(expected[who] === 200 ? 201 : expected[who]);
    });

    it(`admin routes · PATCH and DELETE /api/admin/bodies/:slug as ${who} · ${expected[who]} / ${expected[who] === 200 ? 204 : expected[who]}`, async () => {
      const admin = await as('admin');
      const created = await admin.post('/api/admin/bodies').send({ maker: 'Matrix', model: `Target ${who}` });
      const slug = created.body.body.slug;
      const a = await as(who);
      expect((await a.patch(`/api/admin/bodies/${slug}`).send({ aliases: ['T'] })).status).toBe(expected[who]);
      expect((await a.delete(`/api/admin/bodies/${slug}`)).status).toBe(expected[who] === 200 ? 204 : expected[who]);
    });

    it(`admin routes · PATCH /api/admin/users/:id as ${who} · ${expected[who]}`, async () => {
      const target = await makeUser();
      const a = await as(who);
      expect((await a.patch(`/api/admin/users/${target.user.id}`).send({ role: 'moderator' })).status).toBe(expected[who]);
    });
  }
});

describe('admin · camera bodies', () => {
  it('camera bodies · a new body, then the same again · slug made from maker and model; the duplicate refused', async () => {
    const a = await as('admin');
    const res = await a.post('/api/admin/bodies').send({ maker: 'Ostrava Imaging', model: 'Vega S35 Mk II', aliases: ['Vega 2'] });
    expect(res.status).toBe(201);
    expect(res.body.body).toEqual({ slug: 'ostrava-imaging-vega-s35-mk-ii', maker: 'Ostrava Imaging', model: 'Vega S35 Mk II', aliases: ['Vega 2'] });
    expect((await a.post('/api/admin/bodies').send({ maker: 'Ostrava Imaging', model: 'Vega S35 Mk II' })).status).toBe(409);
    const vocab = await request(t.app).get('/api/vocab');
    expect(vocab.body.bodies.map((b: { slug: string }) => b.slug)).toContain('ostrava-imaging-vega-s35-mk-ii');
  });

  it('camera bodies · a body without a model, an unknown slug · 422 and 404', async () => {
    const a = await as('admin');
    expect((await a.post('/api/admin/bodies').send({ maker: 'Nobody' })).status).toBe(422);
    expect((await a.patch('/api/admin/bodies/no-such-body').send({ model: 'X' })).status).toBe(404);
  });
});

describe('admin · changing accounts', () => {
  it('accounts · listed · no password hashes', async () => {
    const a = await as('admin');
    const res = await a.get('/api/admin/users');
    expect(res.body.users.length).toBeGreaterThan(0);
    for (const u of res.body.users) expect(u).not.toHaveProperty('passwordHash');
  });

  it('accounts · a member promoted to moderator · the change shows at their next request', async () => {
    const member = await makeUser();
    const m = await agentFor(t.app);
    await m.login(member.email, member.password);
    const a = await as('admin');
    const res = await a.patch(`/api/admin/users/${member.user.id}`).send({ role: 'moderator' });
    expect(res.body.user.role).toBe('moderator');
    expect((await m.get('/api/auth/me')).body.user.role).toBe('moderator');
  });

  it('accounts · an unknown role · 422 naming the allowed roles', async () => {
    const member = await makeUser();
    const a = await as('admin');
    const res = await a.patch(`/api/admin/users/${member.user.id}`).send({ role: 'producer' });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.role).toMatch(/member, moderator, admin/);
  });

  it('accounts · an empty change or unknown fields · 422', async () => {
    const member = await makeUser();
    const a = await as('admin');
    expect((await a.patch(`/api/admin/users/${member.user.id}`).send({})).status).toBe(422);
    expect((await a.patch(`/api/admin/users/${member.user.id}`).send({ email: 'x@y.test' })).status).toBe(422);
  });

  it('accounts · an account that does not exist, a bad id · 404 and 422', async () => {
    const a = await as('admin');
    expect((await a.patch('/api/admin/users/999999').send({ role: 'member' })).status).toBe(404);
    expect((await a.patch('/api/admin/users/abc').send({ role: 'member' })).status).toBe(422);
  });

  it('accounts · an admin changing their own role or status · refused (no lock-out)', async () => {
    const admin = await makeUser('admin');
    const a = await agentFor(t.app);
    await a.login(admin.email, admin.password);
    const res = await a.patch(`/api/admin/users/${admin.user.id}`).send({ role: 'member' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/another admin/);
  });

  it('accounts · a suspended account restored · it can sign in again', async () => {
    const member = await makeUser('member', { status: 'suspended' });
    const a = await as('admin');
    await a.patch(`/api/admin/users/${member.user.id}`).send({ status: 'active' }).expect(200);
    const m = await agentFor(t.app);
    expect((await m.login(member.email, member.password)).status).toBe(200);
  });

  it('admin routes · a session cookie without sign-in · closed', async () => {
    const res = await request(t.app).get('/api/admin/users');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthorized');
  });
});
