import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;
let author: Agent;
let crew: Agent;
let moderator: Agent;
const ids: Record<string, number> = {};

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return a;
}

async function published(title: string): Promise<number> {
  const res = await author
    .post('/api/parts')
    .field('data', JSON.stringify(submission({ title })))
    .attach('model', boxStl(20, 20, 20), 'p.stl')
    .expect(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return res.body.id;
}

// one report per job: repeats by one member on one production count once toward the proven figure
async function reports(id: number, outcomes: string[]) {
  for (const [i, outcome] of outcomes.entries()) {
    await crew
      .post(`/api/parts/${id}/reports`)
      .field('data', JSON.stringify({ production: `Night Ferry, block ${i + 1}`, daysInUse: 3, outcome, material: 'PETG' }))
      .expect(201);
  }
}

const search = (query: string) => request(t.app).get(`/api/search?${query}`);

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  author = await signedIn();
  crew = await signedIn();
  moderator = await signedIn('moderator');
  ids.onePerfect = await published('Ranking clamp one perfect');
  ids.fortyGood = await published('Ranking clamp forty good');
  ids.unreported = await published('Ranking clamp unreported');
  await reports(ids.onePerfect, ['held-up']);
  await reports(ids.fortyGood, [...Array(38).fill('held-up'), 'failed', 'cracked']);
  await crew.post(`/api/parts/${ids.unreported}/ratings`).send({ stars: 5 }).expect(201);
  await crew.post(`/api/parts/${ids.onePerfect}/ratings`).send({ stars: 3 }).expect(201);
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

describe('search · best proven', () => {
  it('best proven · forty good set reports and one perfect one · the forty first, unreported parts last', async () => {
    const res = await search('q=ranking%20clamp&sort=proven').expect(200);
    expect(res.body.results.map((r: { id: number }) => r.id)).toEqual([ids.fortyGood, ids.onePerfect, ids.unreported]);
    const forty = res.body.results[0];
    expect(forty).toMatchObject({ reports: 40, heldUp: 38, ratingCount: 0, rating: null });
    expect(res.body.results[1]).toMatchObject({ reports: 1, heldUp: 1 });
    expect(forty.proven).toBeGreaterThan(res.body.results[1].proven);
  });

  it('best proven · ratings · shown with their count; minimum rating filters', async () => {
    const all = await search('q=ranking%20clamp').expect(200);
    expect(all.body.results.find((r: { id: number }) => r.id === ids.unreported)).toMatchObject({ rating: 5, ratingCount: 1 });
    const good = await search('q=ranking%20clamp&minRating=4').expect(200);
    expect(good.body.results.map((r: { id: number }) => r.id)).toEqual([ids.unreported]);
  });

  it('best proven · new evidence · followed without rebuilding the text index', async () => {
    const builds = t.services.search.stats().builds;
    await crew.post(`/api/parts/${ids.fortyGood}/ratings`).send({ stars: 4 }).expect(201);
    await t.services.search.idle();
    const res = await search('q=ranking%20clamp&minRating=4').expect(200);
    expect(res.body.results.map((r: { id: number }) => r.id).sort()).toEqual([ids.fortyGood, ids.unreported].sort());
    expect(t.services.search.stats().builds).toBe(builds);
  });
});

describe('search · camera-body vocabulary', () => {
  it('camera-body vocabulary · an admin adds an alias · the part is found by it', async () => {
    const admin = await signedIn('admin');
    expect((await search('q=blackbird').expect(200)).body.total).toBe(0);
    await admin
      .patch('/api/admin/bodies/korvel-kx8')
      .send({ aliases: ['KX8', 'Korvel 8', 'Blackbird'] })
      .expect(200);
    await t.services.search.idle();
    const res = await search('q=blackbird').expect(200);
    expect(res.body.results.map((r: { id: number }) => r.id).sort()).toEqual(Object.values(ids).sort());
  });
});
