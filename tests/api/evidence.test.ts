import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { AuditEvent, ReportPhoto, SetReport } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { jpegWithGps } from '../helpers/photos';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number };
let author: Agent;
let crew: Agent[];
let moderator: Agent;
let partId: number;
let recipeId: number;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id });
}

async function publishedPart(data = submission()): Promise<number> {
  const res = await author
    .post('/api/parts')
    .field('data', JSON.stringify(data))
    .attach('model', boxStl(20, 30, 10), 'p.stl')
    .expect(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return res.body.id;
}

function report(a: Agent, id: number, fields: Record<string, unknown>) {
  return a.post(`/api/parts/${id}/reports`).field('data', JSON.stringify({ production: 'The Salt Road', daysInUse: 12, ...fields }));
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  author = await signedIn();
  moderator = await signedIn('moderator');
  crew = await Promise.all([signedIn(), signedIn(), signedIn(), signedIn()]);
  partId = await publishedPart();
  recipeId = (await crew[0].get(`/api/parts/${partId}`)).body.recipes[0].id;
});
afterAll(async () => {
  await t.close();
});

describe('ratings', () => {
  it('ratings · a second rating by one member · replaces the first', async () => {
    const first = await crew[0].post(`/api/parts/${partId}/ratings`).send({ stars: 4, comment: 'Solid on a handheld week.' });
    expect(first.status).toBe(201);
    const second = await crew[0].post(`/api/parts/${partId}/ratings`).send({ stars: 5 });
    expect(second.status).toBe(200);
    const list = await crew[1].get(`/api/parts/${partId}/ratings`);
    expect(list.body.items.filter((i: { author: { id: number } }) => i.author.id === crew[0].userId)).toHaveLength(1);
    expect(list.body.summary).toMatchObject({ count: 1, mean: 5 });
    expect((await crew[0].get(`/api/parts/${partId}/ratings`)).body.mine).toMatchObject({ stars: 5 });
  });

  it('ratings · an author rating their own part · refused', async () => {
    const res = await author.post(`/api/parts/${partId}/ratings`).send({ stars: 5 });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/own part/);
  });

  it('ratings · a part not on the shelf · cannot be rated', async () => {
    const res = await author
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('model', boxStl(5, 5, 5), 'x.stl')
      .expect(201);
    expect((await crew[1].post(`/api/parts/${res.body.id}/ratings`).send({ stars: 3 })).status).toBe(404);
    expect((await moderator.post(`/api/parts/${res.body.id}/ratings`).send({ stars: 3 })).status).toBe(409);
  });

  it('ratings · 0 or 6 stars, a visitor · 422, and 403 (no session)', async () => {
    expect((await crew[1].post(`/api/parts/${partId}/ratings`).send({ stars: 0 })).status).toBe(422);
    expect((await crew[1].post(`/api/parts/${partId}/ratings`).send({ stars: 6 })).status).toBe(422);
    expect((await request(t.app).post(`/api/parts/${partId}/ratings`).send({ stars: 3 })).status).toBe(403);
  });
});

describe('set reports', () => {
  it('set reports · filed with the recipe it was printed with · accepted, photo metadata stripped', async () => {
    const res = await report(crew[0], partId, { conditions: ['heat', 'vehicle'], recipeId, outcome: 'held-up', notes: 'Dashboard all day.' }).attach(
      'photo',
      await jpegWithGps(),
      'car.jpg',
    );
    expect(res.status).toBe(201);
    await t.services.parts.photosSettled();
    const list = await crew[2].get(`/api/parts/${partId}/reports`);
    const mine = list.body.items.find((i: { id: number }) => i.id === res.body.id);
    expect(mine).toMatchObject({ material: 'PETG', recipeId, outcome: 'held-up', conditions: ['heat', 'vehicle'] });
    const photo = await crew[2]
      .get(mine.photos[0].displayUrl)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(photo.status).toBe(200);
    expect((photo.body as Buffer).includes(Buffer.from('Exif'))).toBe(false);
  });

  it("set reports · no recipe given · takes the reporter's own material, asks for one when missing", async () => {
    expect((await report(crew[1], partId, { outcome: 'worn-but-working', material: 'ASA', infillPct: 30, walls: 4 })).status).toBe(201);
    const missing = await report(crew[1], partId, { outcome: 'held-up' });
    expect(missing.status).toBe(422);
    expect(missing.body.error.fields.material).toMatch(/recipe/);
  });

  it('set reports · a recipe of another part or an unknown outcome · refused', async () => {
    const otherPart = await publishedPart(submission({ title: 'Other part' }));
    const otherRecipe = (await crew[0].get(`/api/parts/${otherPart}`)).body.recipes[0].id;
    expect((await report(crew[1], partId, { outcome: 'held-up', recipeId: otherRecipe })).status).toBe(422);
    expect((await report(crew[1], partId, { outcome: 'exploded', material: 'PLA' })).status).toBe(422);
  });

  it('set reports · listed · filtered by material, condition and outcome', async () => {
    const byMaterial = await crew[3].get(`/api/parts/${partId}/reports?material=ASA`);
    expect(byMaterial.body.items.every((i: { material: string }) => i.material === 'ASA')).toBe(true);
    const byCondition = await crew[3].get(`/api/parts/${partId}/reports?condition=vehicle`);
    expect(byCondition.body.items.every((i: { conditions: string[] }) => i.conditions.includes('vehicle'))).toBe(true);
    expect(byCondition.body.items.length).toBeGreaterThan(0);
    const byOutcome = await crew[3].get(`/api/parts/${partId}/reports?outcome=failed`);
    expect(byOutcome.body.items).toEqual([]);
    expect((await crew[3].get(`/api/parts/${partId}/reports?condition=lava`)).status).toBe(422);
  });

  it('set reports · refused · nothing left behind', async () => {
    const before = [await SetReport.count(), await ReportPhoto.count()];
    const res = await report(crew[1], partId, { outcome: 'held-up' }).attach('photo', await jpegWithGps(), 'p.jpg');
    expect(res.status).toBe(422);
    expect([await SetReport.count(), await ReportPhoto.count()]).toEqual(before);
  });
});

describe('proven score, warnings and hiding', () => {
  it('proven figures · a part with reports · per material and condition, with the rating summary', async () => {
    const res = await crew[0].get(`/api/parts/${partId}/proven`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reports: 2, heldUp: 2, byMaterial: { PETG: { reports: 1, heldUp: 1 }, ASA: { reports: 1, heldUp: 1 } } });
    expect(res.body.proven).toBeGreaterThan(0);
    expect(res.body.byCondition.heat).toMatchObject({ reports: 1, heldUp: 1 });
    expect(res.body.rating).toMatchObject({ count: 1, mean: 5 });
    expect(typeof res.body.rating.adjusted).toBe('number');
  });

  it('warnings · two PLA failures in heat · a heat warning; gone when a moderator hides one', async () => {
    const id = await publishedPart(submission({ title: 'Dash cam cradle' }));
    const a = await report(crew[0], id, { outcome: 'deformed', material: 'PLA', conditions: ['heat'] }).expect(201);
    await report(crew[1], id, { outcome: 'deformed', material: 'PLA', conditions: ['heat', 'vehicle'] }).expect(201);
    await report(crew[2], id, { outcome: 'held-up', material: 'ASA', conditions: ['heat'] }).expect(201);
    const before = await crew[3].get(`/api/parts/${id}/proven`);
    expect(before.body.warnings.map((w: { text: string }) => w.text)).toEqual(['PLA deformed in heat in 2 of 2 reports']);
    expect(before.body.reports).toBe(3);

    expect((await crew[3].post(`/api/reports/${a.body.id}/flag`).send({ reason: 'Written by the rival rental house.' })).status).toBe(201);
    const flags = await moderator.get('/api/review/flags');
    expect(flags.body.items.some((f: { type: string; id: number }) => f.type === 'report' && f.id === a.body.id)).toBe(true);
    expect((await crew[3].post(`/api/review/reports/${a.body.id}/hide`).send({ note: 'Members cannot hide.' })).status).toBe(403);
    await moderator.post(`/api/review/reports/${a.body.id}/hide`).send({ note: 'Not a real shoot report.' }).expect(200);

    const after = await crew[3].get(`/api/parts/${id}/proven`);
    expect(after.body.warnings).toEqual([]);
    expect(after.body.reports).toBe(2);
    const list = await crew[3].get(`/api/parts/${id}/reports`);
    expect(list.body.items.some((i: { id: number }) => i.id === a.body.id)).toBe(false);
    const audit = await AuditEvent.findOne({ where: { partId: id, action: 'hide_report' } });
    expect(audit?.note).toBe('Not a real shoot report.');
    const history = await moderator.get(`/api/parts/${id}/history`);
    expect(history.body.items.map((e: { action: string }) => e.action)).toContain('hide_report');
  });

  it('hiding · a hidden rating · out of the summary', async () => {
    const id = await publishedPart(submission({ title: 'Rated part' }));
    const low = await crew[0].post(`/api/parts/${id}/ratings`).send({ stars: 1, comment: 'abusive words' }).expect(201);
    await crew[1].post(`/api/parts/${id}/ratings`).send({ stars: 5 }).expect(201);
    await moderator.post(`/api/review/ratings/${low.body.id}/hide`).send({ note: 'Abusive comment.' }).expect(200);
    const ratings = await crew[2].get(`/api/parts/${id}/ratings`);
    expect(ratings.body.summary).toMatchObject({ count: 1, mean: 5 });
    expect((await moderator.post(`/api/review/ratings/${low.body.id}/hide`).send({ note: 'Again please.' })).status).toBe(409);
  });

  it('hiding · members flagging their own entries · refused', async () => {
    const id = await publishedPart(submission({ title: 'Own flag part' }));
    const mine = await crew[0].post(`/api/parts/${id}/ratings`).send({ stars: 2 }).expect(201);
    expect((await crew[0].post(`/api/ratings/${mine.body.id}/flag`).send({ reason: 'Oops, my own.' })).status).toBe(409);
  });
});

describe("evidence about one's own part", () => {
  it("moderation · a moderator's own part · they cannot hide its ratings or reports (403) nor see their flags; another moderator can", async () => {
    const owner = await signedIn('moderator');
    const res = await owner
      .post('/api/parts')
      .field('data', JSON.stringify(submission({ title: 'Moderator-made clamp' })))
      .attach('model', boxStl(20, 30, 10), 'm.stl')
      .expect(201);
    const id = res.body.id as number;
    await moderator.post(`/api/review/${id}/approve`).send({}).expect(200);
    const failed = await report(crew[0], id, { outcome: 'failed', material: 'PLA', conditions: ['heat'] }).expect(201);
    const low = await crew[1].post(`/api/parts/${id}/ratings`).send({ stars: 1, comment: 'Snapped on day two.' }).expect(201);
    await crew[2].post(`/api/reports/${failed.body.id}/flag`).send({ reason: 'Looks wrong to me.' }).expect(201);

    const hideReport = await owner.post(`/api/review/reports/${failed.body.id}/hide`).send({ note: 'I do not like this one.' });
    expect(hideReport.status).toBe(403);
    expect(hideReport.body.error.message).toMatch(/your own part, so another moderator has to decide/);
    expect((await owner.post(`/api/review/ratings/${low.body.id}/hide`).send({ note: 'Nor this one.' })).status).toBe(403);
    const ownQueue = (await owner.get('/api/review/flags')).body.items as { id: number; type: string }[];
    expect(ownQueue.some((f) => f.type === 'report' && f.id === failed.body.id)).toBe(false);
    expect(
      ((await moderator.get('/api/review/flags')).body.items as { id: number; type: string }[]).some((f) => f.type === 'report' && f.id === failed.body.id),
    ).toBe(true);
    // nothing was hidden, and the other moderator still decides
    expect((await crew[3].get(`/api/parts/${id}/reports`)).body.items.some((i: { id: number }) => i.id === failed.body.id)).toBe(true);
    await moderator.post(`/api/review/reports/${failed.body.id}/hide`).send({ note: 'Checked: a test print, not a shoot.' }).expect(200);
  });

  it("proven figure · the author's own reports and one member's repeats on a production · do not inflate it", async () => {
    const id = await publishedPart(submission({ title: 'Self-reported bracket' }));
    for (let i = 0; i < 5; i++) await report(author, id, { outcome: 'held-up', material: 'PETG', production: `Own shoot ${i}` }).expect(201);
    for (let i = 0; i < 3; i++)
      await report(crew[0], id, { outcome: 'held-up', material: 'PETG', production: i % 2 ? 'night ferry' : 'Night Ferry ' }).expect(201);
    await report(crew[1], id, { outcome: 'failed', material: 'PETG' }).expect(201);
    const proven = (await crew[2].get(`/api/parts/${id}/proven`)).body;
    expect(proven).toMatchObject({ reports: 2, heldUp: 1, notCounted: 7 });
    // every report stays visible in the list; only the figure leaves them out
    expect((await crew[2].get(`/api/parts/${id}/reports`)).body.items).toHaveLength(9);
    const profile = (await request(t.app).get(`/api/users/${author.userId}/profile`)).body.parts.find((p: { id: number }) => p.id === id);
    expect(profile).toMatchObject({ reports: 2, heldUp: 1 });
  });
});

describe('contributor profile', () => {
  it('contributor profile · published parts · listed with how they held up', async () => {
    const res = await request(t.app).get(`/api/users/${author.userId}/profile`);
    expect(res.status).toBe(200);
    const part = res.body.parts.find((p: { id: number }) => p.id === partId);
    expect(part).toMatchObject({ reports: 2, heldUp: 2 });
    expect(res.body.user).not.toHaveProperty('email');
  });
});
