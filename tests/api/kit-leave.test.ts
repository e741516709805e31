import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('shoot kits · leaving a kit shared with you', () => {
  it('shoot kits · a member leaves a kit shared with them · taken off; the owner keeps it and cannot leave it', async () => {
    const owner = await makeUser();
    const crew = await makeUser();
    const o = await agentFor(t.app);
    await o.login(owner.email, owner.password);
    const c = await agentFor(t.app);
    await c.login(crew.email, crew.password);

    const kit = await o.post('/api/kits').send({ name: 'Harbour Lights — splinter unit' }).expect(201);
    await o.agent
      .put(`/api/kits/${kit.body.id}/shares`)
      .set('X-CSRF-Token', o.token)
      .send({ shares: [{ email: crew.email, access: 'read' }] })
      .expect(200);
    expect((await c.get(`/api/kits/${kit.body.id}`)).status).toBe(200);

    expect((await c.delete(`/api/kits/${kit.body.id}/shares/me`)).status).toBe(204);
    expect((await c.get(`/api/kits/${kit.body.id}`)).status).toBe(404);
    expect((await o.delete(`/api/kits/${kit.body.id}/shares/me`)).status).toBe(409);
    expect((await o.get(`/api/kits/${kit.body.id}`)).status).toBe(200);
  });
});
