import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BuildInfo, BuildSearchResponse } from '@shared/api/builds';
import { MAX_BUILDS } from '@shared/schemas/builds';
import type { Role } from '@shared/types';
import { Build } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number };
let owner: Agent;
let other: Agent;
let moderator: Agent;
let admin: Agent;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id });
}

async function published(data: unknown) {
  const author = await signedIn();
  const res = await author
    .post('/api/parts')
    .field('data', JSON.stringify(data))
    .attach('model', boxStl(30, 20, 10), 'part.stl');
  expect(res.status).toBe(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return res.body.id as number;
}

const carWeek = { name: 'A-camera, car week', body: 'KX8', mounts: ['LWS', 'screw-1-4-20'], keySizes: [{ name: 'lens barrel', valueMm: 80, tolMm: 0.5 }] };
const none = { carriesLoad: false, overhead: false, vehicle: false, heat: false };

let cradle: number;
let gear: number;
let shoeCover: number;
let cap: number;

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  [owner, other, moderator, admin] = await Promise.all([signedIn(), signedIn(), signedIn('moderator'), signedIn('admin')]);
  // invented parts, each a clip or a holder of some kind, so "clip" finds all four
  cradle = await published(submission({ title: 'Receiver clip cradle for 15 mm rods' }));
  gear = await published(
    submission({
      title: 'Lens gear clip ring',
      category: 'lens-focus',
      bodies: [],
      mounts: [{ slug: 'gear-0-8' }],
      keyDimensions: [{ name: 'barrel bore', valueMm: 80.4, tolMm: 0.3 }],
      safety: none,
      testedLoadKg: null,
    }),
  );
  shoeCover = await published(
    submission({
      title: 'Shoe clip cover',
      category: 'protection-caps',
      bodies: ['peregrine-p1'],
      mounts: [{ slug: 'accessory-shoe' }],
      keyDimensions: [],
      safety: none,
      testedLoadKg: null,
    }),
  );
  cap = await published(
    submission({ title: 'Port clip cap', category: 'protection-caps', bodies: [], mounts: [], keyDimensions: [], safety: none, testedLoadKg: null }),
  );
  t.services.search.scheduleRebuild();
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

describe('builds · CRUD', () => {
  let id: number;

  it('POST /api/builds · body by alias, mounts by crew names · 201 with slugs, labels and sizes', async () => {
    const res = await owner.post('/api/builds').send(carWeek).expect(201);
    const b = res.body as BuildInfo;
    expect(res.headers.location).toBe(`/api/builds/${b.id}`);
    expect(b.name).toBe('A-camera, car week');
    expect(b.body).toEqual({ slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8' });
    expect(b.mounts.map((m) => m.slug)).toEqual(['rods-15-60', 'screw-1-4-20']);
    expect(b.keySizes).toEqual([{ name: 'lens barrel', valueMm: 80, tolMm: 0.5 }]);
    id = b.id;
  });

  it('GET /api/builds · the owner · lists only their own', async () => {
    await other.post('/api/builds').send({ name: 'B-camera', body: null }).expect(201);
    const res = await owner.get('/api/builds').expect(200);
    expect(res.body.items.map((b: BuildInfo) => b.name)).toEqual(['A-camera, car week']);
  });

  it('PATCH /api/builds/:id · new name and no body · 200 with the change, the rest kept', async () => {
    const res = await owner.patch(`/api/builds/${id}`).send({ name: 'A-camera, car week (night)', body: null }).expect(200);
    expect(res.body.name).toBe('A-camera, car week (night)');
    expect(res.body.body).toBeNull();
    expect(res.body.mounts).toHaveLength(2);
    await owner.patch(`/api/builds/${id}`).send({ body: 'korvel-kx8', name: carWeek.name }).expect(200);
  });

  it('POST /api/builds · unknown body · 422 naming the closest bodies', async () => {
    const res = await owner
      .post('/api/builds')
      .send({ ...carWeek, body: 'Korvel KX-9' })
      .expect(422);
    expect(res.body.error.fields.body).toMatch(/No camera body is called "Korvel KX-9"\. Did you mean .*Korvel KX-8/);
    expect(await Build.count({ where: { ownerId: owner.userId } })).toBe(1);
  });

  it('POST /api/builds · unknown mount, no name, size in metres · 422 with a message per field', async () => {
    const res = await owner
      .post('/api/builds')
      .send({ name: '', mounts: ['bayonet'], keySizes: [{ name: 'monitor width', valueMm: 2500 }] })
      .expect(422);
    expect(res.body.error.fields.name).toMatch(/Name the build/);
    expect(res.body.error.fields['mounts']).toMatch(/Unknown mount standard "bayonet"/);
    expect(res.body.error.fields['keySizes.0.valueMm']).toMatch(/more than 2 m/);
  });

  it('PATCH /api/builds/:id · an unknown field or nothing · 422 saying what a build has', async () => {
    const res = await owner.patch(`/api/builds/${id}`).send({ colour: 'red' }).expect(422);
    expect(Object.values(res.body.error.fields).join(' ')).toMatch(/name, body, mounts and keySizes/);
    await owner.patch(`/api/builds/${id}`).send({}).expect(422);
  });

  it('builds · role matrix · visitors 401; other members, moderators and admins 404 on someone else’s build', async () => {
    const visitor = await agentFor(t.app);
    await visitor.get('/api/builds').expect(401);
    await visitor.post('/api/builds').send(carWeek).expect(401);
    for (const a of [other, moderator, admin]) {
      await a.get(`/api/builds/${id}`).expect(404);
      await a.patch(`/api/builds/${id}`).send({ name: 'mine now' }).expect(404);
      await a.delete(`/api/builds/${id}`).expect(404);
    }
    const res = await owner.get(`/api/builds/${id}`).expect(200);
    expect(res.body.name).toBe(carWeek.name);
  });

  it('POST /api/builds · past the limit · 409 saying to delete one first', async () => {
    const u = await signedIn();
    await Build.bulkCreate(Array.from({ length: MAX_BUILDS }, (_, i) => ({ ownerId: u.userId, name: `Build ${i}`, bodyId: null, mounts: [], keySizes: [] })));
    const res = await u.post('/api/builds').send({ name: 'One more' }).expect(409);
    expect(res.body.error.message).toMatch(/Delete one/);
  });

  it('DELETE /api/builds/:id · the owner · 204, then 404', async () => {
    const res = await owner.post('/api/builds').send({ name: 'Short-lived' }).expect(201);
    await owner.delete(`/api/builds/${res.body.id}`).expect(204);
    await owner.get(`/api/builds/${res.body.id}`).expect(404);
  });
});

describe('search · build=', () => {
  let id: number;
  beforeAll(async () => {
    id = (await owner.get('/api/builds').expect(200)).body.items[0].id;
  });

  it('GET /api/search?build= · "clip" · fitting parts first, each with its badge and reason', async () => {
    const res = await owner.get(`/api/search?q=clip&build=${id}`).expect(200);
    const body = res.body as BuildSearchResponse;
    expect(body.build).toEqual({ id, name: carWeek.name });
    const verdicts = Object.fromEntries(body.results.map((r) => [r.id, r.fit.verdict]));
    // worked examples of shared/build-fit.ts (tests/unit/build-fit.test.ts)
    expect(verdicts).toEqual({ [cradle]: 'fits', [cap]: 'may-fit', [gear]: 'not', [shoeCover]: 'not' });
    expect(body.results.map((r) => r.fit.verdict)).toEqual(['fits', 'may-fit', 'not', 'not']);
    expect(body.results[0].fit.summary).toBe('Made for the Korvel KX-8 · Shares 15 mm rods at 60 mm, 1/4-20 UNC screw');
    expect(body.fitCounts).toEqual({ fits: 1, 'may-fit': 1, not: 2 });
    expect(body.total).toBe(4);
  });

  it('GET /api/search?build= · paged · the fit order runs across pages', async () => {
    const p1 = (await owner.get(`/api/search?q=clip&build=${id}&pageSize=2`).expect(200)).body as BuildSearchResponse;
    const p2 = (await owner.get(`/api/search?q=clip&build=${id}&pageSize=2&page=2`).expect(200)).body as BuildSearchResponse;
    expect([...p1.results, ...p2.results].map((r) => r.fit.verdict)).toEqual(['fits', 'may-fit', 'not', 'not']);
  });

  it('GET /api/search?build= · with filters · filters still apply', async () => {
    const res = await owner.get(`/api/search?build=${id}&category=protection-caps`).expect(200);
    expect(res.body.results.map((r: { id: number }) => r.id).sort()).toEqual([shoeCover, cap].sort());
  });

  it('GET /api/search?build= · another member’s build · 404; a visitor: 401; not a number: 422', async () => {
    await other.get(`/api/search?q=clip&build=${id}`).expect(404);
    await moderator.get(`/api/search?q=clip&build=${id}`).expect(404);
    const visitor = await agentFor(t.app);
    const res = await visitor.get(`/api/search?q=clip&build=${id}`).expect(401);
    expect(res.body.error.message).toMatch(/Sign in to search with one of your builds/);
    const bad = await owner.get('/api/search?q=clip&build=mine').expect(422);
    expect(bad.body.error.fields.build).toMatch(/build=3/);
  });

  it('GET /api/search?build= · "clip cradle" · the part matching both words stays first, fitting partial matches follow', async () => {
    const body = (await owner.get(`/api/search?q=${encodeURIComponent('clip cradle')}&build=${id}`).expect(200)).body as BuildSearchResponse;
    expect(body.results[0].id).toBe(cradle);
    expect(body.results[0].missing).toEqual([]);
    const rest = body.results.slice(1);
    expect(rest.every((r) => r.missing.length > 0)).toBe(true);
    expect(rest.map((r) => r.fit.verdict)).toEqual(['may-fit', 'not', 'not']);
  });

  it('GET /api/search · without build · the plain search, no fit marks', async () => {
    const res = await owner.get('/api/search?q=clip').expect(200);
    expect(res.body.results[0].fit).toBeUndefined();
    expect(res.body.build).toBeUndefined();
  });
});
