import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { ClientKey, KitRecall, Notice, Rating, SetReport } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number; email: string };
let author: Agent;
let crew: Agent;
let crew2: Agent;
let moderator: Agent;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id, email: u.email });
}

async function published(by: Agent, data = submission()): Promise<{ id: number; slug: string }> {
  const res = await by
    .post('/api/parts')
    .field('data', JSON.stringify(data))
    .attach('model', boxStl(20, 30, 10), 'p.stl')
    .expect(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return { id: res.body.id, slug: (await by.get(`/api/parts/${res.body.id}`)).body.slug };
}

function report(a: Agent, partId: number, fields: Record<string, unknown>, key?: string) {
  const req = a.post(`/api/parts/${partId}/reports`);
  if (key) req.set('Idempotency-Key', key);
  return req.field('data', JSON.stringify({ production: 'The Salt Road', daysInUse: 12, material: 'PETG', conditions: [], outcome: 'held-up', ...fields }));
}

async function mails() {
  await t.mailer.flush();
  return t.mailer.fake!.messages();
}

const noticesOf = (userId: number, kind: string) => Notice.findAll({ where: { userId, kind } });

async function kitWith(owner: Agent, partId: number, name = 'Harbour Lights splinter unit'): Promise<number> {
  const kit = await owner.post('/api/kits').send({ name, production: 'Harbour Lights' }).expect(201);
  await owner.post(`/api/kits/${kit.body.id}/items`).send({ partId, quantity: 2 }).expect(201);
  return kit.body.id;
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  [author, crew, crew2, moderator] = await Promise.all([signedIn(), signedIn(), signedIn(), signedIn('moderator')]);
});
beforeEach(async () => {
  await t.mailer.flush();
  t.mailer.fake!.clear();
});
afterAll(async () => {
  await t.close();
});

describe('notice settings', () => {
  it('GET /api/notices/settings · a new member · every kind on for bell and mail', async () => {
    const res = await crew.get('/api/notices/settings').expect(200);
    expect(res.body.preferences.map((p: { kind: string }) => p.kind)).toEqual(['report_trouble', 'adapted', 'kit_shared', 'wanted_closed']);
    expect(res.body.preferences.every((p: { bell: boolean; mail: boolean }) => p.bell && p.mail)).toBe(true);
  });

  it('PUT /api/notices/settings · one kind switched off for mail · kept, others unchanged; bad kinds 422, visitors 401', async () => {
    const res = await crew2.agent
      .put('/api/notices/settings')
      .set('X-CSRF-Token', crew2.token)
      .send({ preferences: [{ kind: 'kit_shared', bell: true, mail: false }] })
      .expect(200);
    expect(res.body.preferences.find((p: { kind: string }) => p.kind === 'kit_shared')).toMatchObject({ bell: true, mail: false });
    expect(res.body.preferences.find((p: { kind: string }) => p.kind === 'adapted')).toMatchObject({ bell: true, mail: true });
    const bad = await crew2.agent
      .put('/api/notices/settings')
      .set('X-CSRF-Token', crew2.token)
      .send({ preferences: [{ kind: 'everything', bell: true, mail: false }] });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields['preferences.0.kind']).toMatch(/kinds of notice/);
    expect((await request(t.app).get('/api/notices/settings')).status).toBe(401);
  });
});

describe('contributor notices', () => {
  it('set report · cracked on someone else’s part · the author gets a notice and a mail; held up: nothing', async () => {
    const part = await published(author, submission({ title: 'Cheese plate riser' }));
    await report(crew, part.id, { outcome: 'held-up' }).expect(201);
    expect(await noticesOf(author.userId, 'report_trouble')).toHaveLength(0);
    await report(crew, part.id, { outcome: 'cracked', notes: 'Split along the layer lines at the screw.' }).expect(201);
    const [notice] = await noticesOf(author.userId, 'report_trouble');
    expect(notice.title).toBe('Set report: “Cheese plate riser” cracked');
    expect(notice.link).toBe(`/parts/${part.slug}#reports`);
    const sent = (await mails()).filter((m) => m.to.includes(author.email) && m.subject.startsWith('A set report'));
    expect(sent).toHaveLength(1);
    expect(sent[0].subject).toBe('A set report on your part: Cheese plate riser cracked');
    expect(sent[0].text).toContain('Split along the layer lines');
    expect(sent[0].text).toContain('/account#notices');
  });

  it('set report · the author switched mail off, then the bell · the other channel still arrives', async () => {
    const part = await published(author, submission({ title: 'Follow-focus whip clip' }));
    const put = (prefs: object) =>
      author.agent
        .put('/api/notices/settings')
        .set('X-CSRF-Token', author.token)
        .send({ preferences: [{ kind: 'report_trouble', ...prefs }] })
        .expect(200);
    await put({ bell: true, mail: false });
    await report(crew, part.id, { outcome: 'failed' }).expect(201);
    expect((await noticesOf(author.userId, 'report_trouble')).filter((n) => n.title.includes('Follow-focus'))).toHaveLength(1);
    expect((await mails()).filter((m) => m.to.includes(author.email) && m.subject.startsWith('A set report'))).toHaveLength(0);

    await put({ bell: false, mail: true });
    await report(crew2, part.id, { outcome: 'deformed' }).expect(201);
    expect((await noticesOf(author.userId, 'report_trouble')).filter((n) => n.title.includes('Follow-focus'))).toHaveLength(1);
    expect((await mails()).filter((m) => m.to.includes(author.email) && m.subject.includes('deformed'))).toHaveLength(1);
    await put({ bell: true, mail: true });
  });

  it('contributor notices · kit shared · a new member on the list hears once; saving the same list again tells nobody', async () => {
    const part = await published(author, submission({ title: 'Monitor yoke' }));
    const kitId = await kitWith(crew, part.id, 'Night exteriors');
    const share = () =>
      crew.agent
        .put(`/api/kits/${kitId}/shares`)
        .set('X-CSRF-Token', crew.token)
        .send({ shares: [{ email: crew2.email, access: 'read' }] })
        .expect(200);
    await share();
    const got = await noticesOf(crew2.userId, 'kit_shared');
    expect(got.map((n) => n.title)).toEqual(['A shoot kit was shared with you: Night exteriors']);
    // crew2 switched kit-shared mail off in the settings test above
    expect((await mails()).filter((m) => m.to.includes(crew2.email))).toHaveLength(0);
    await share();
    expect(await noticesOf(crew2.userId, 'kit_shared')).toHaveLength(1);
  });

  it('adaptation · approved for the first time · the parent’s author hears; a later revision: no second notice', async () => {
    const parent = await published(author, submission({ title: 'Rod clamp 15 mm' }));
    const child = await published(crew, submission({ title: 'Rod clamp 15 mm, low profile', parentId: parent.id, licence: 'CC-BY-4.0' }));
    const got = await noticesOf(author.userId, 'adapted');
    expect(got.map((n) => n.title)).toEqual(['Your part was adapted: Rod clamp 15 mm']);
    expect(got[0].link).toBe(`/parts/${child.slug}`);
    expect((await mails()).filter((m) => m.to.includes(author.email) && m.subject.includes('adapted your part'))).toHaveLength(1);
    await crew.patch(`/api/parts/${child.id}`).send({ summary: 'A lower clamp for tight cages, same 15 mm bore.' }).expect(200);
    await moderator.post(`/api/review/${child.id}/approve`).send({}).expect(200);
    expect(await noticesOf(author.userId, 'adapted')).toHaveLength(1);
  });

  it('contributor notices · wanted request closed as solved · members who answered hear; the requester does not', async () => {
    const part = await published(author, submission({ title: 'V-plate receiver bracket' }));
    const req = await crew
      .post('/api/wanted')
      .send({ title: 'Receiver bracket for a V-plate', details: 'Behind the top plate.', mounts: [], keySizes: [] })
      .expect(201);
    await author
      .post(`/api/wanted/${req.body.id}/answers`)
      .send({ part: String(part.id) })
      .expect(201);
    await crew.post(`/api/wanted/${req.body.id}/close`).send({ reason: 'solved', note: 'Printed two, both fit.' }).expect(200);
    const got = await noticesOf(author.userId, 'wanted_closed');
    expect(got.map((n) => n.title)).toEqual(['A request you answered is closed: Receiver bracket for a V-plate']);
    expect(got[0].body).toContain('Printed two, both fit.');
    expect(await noticesOf(crew.userId, 'wanted_closed')).toHaveLength(0);
  });

  it('contributor notices · set report refused (recipe of another part, 422) · no notice and no mail are left behind', async () => {
    const part = await published(author, submission({ title: 'Matte box arm' }));
    const before = (await noticesOf(author.userId, 'report_trouble')).length;
    await report(crew, part.id, { outcome: 'failed', recipeId: 999999 }).expect(422);
    expect(await noticesOf(author.userId, 'report_trouble')).toHaveLength(before);
    expect((await mails()).filter((m) => m.to.includes(author.email) && m.subject.startsWith('A set report'))).toHaveLength(0);
  });
});

describe('kit recalls', () => {
  it('kit recalls · retired part · every kit holding it shows the banner to owner and sharer; only the owner acknowledges', async () => {
    const part = await published(author, submission({ title: 'Top handle riser' }));
    const kitA = await kitWith(crew, part.id, 'Kit A');
    const kitB = await kitWith(crew2, part.id, 'Kit B');
    await crew.agent
      .put(`/api/kits/${kitA}/shares`)
      .set('X-CSRF-Token', crew.token)
      .send({ shares: [{ email: crew2.email, access: 'edit' }] })
      .expect(200);
    await moderator.post(`/api/review/${part.id}/retire`).send({ note: 'The thread insert pulls out under load.' }).expect(200);

    const a = await crew.get(`/api/kits/${kitA}/recalls`).expect(200);
    expect(a.body.items).toEqual([
      expect.objectContaining({
        kind: 'retired',
        partTitle: 'Top handle riser',
        partLink: `/parts/${part.slug}`,
        reason: 'Retired from the shelf: The thread insert pulls out under load.',
      }),
    ]);
    expect((await crew2.get(`/api/kits/${kitB}/recalls`)).body.items).toHaveLength(1);
    expect((await crew2.get(`/api/kits/${kitA}/recalls`)).body.items).toHaveLength(1);

    const id = a.body.items[0].id;
    const refused = await crew2.post(`/api/kits/${kitA}/recalls/${id}/acknowledge`).expect(403);
    expect(refused.body.error.message).toMatch(/owner/);
    expect((await author.get(`/api/kits/${kitA}/recalls`)).status).toBe(404);
    await crew.post(`/api/kits/${kitA}/recalls/${id}/acknowledge`).expect(204);
    expect((await crew.get(`/api/kits/${kitA}/recalls`)).body.items).toEqual([]);
    expect((await crew.post(`/api/kits/${kitA}/recalls/99999/acknowledge`)).status).toBe(404);
    expect((await crew2.get(`/api/kits/${kitB}/recalls`)).body.items).toHaveLength(1);
  });

  it('a new revision that changes the cautions · banner lists the new caution; an unchanged one · no banner', async () => {
    const part = await published(
      author,
      submission({ title: 'Monitor arm', safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false }, testedLoadKg: null }),
    );
    const kit = await kitWith(crew, part.id, 'Car rig');
    await author.patch(`/api/parts/${part.id}`).send({ summary: 'The same arm with clearer photos and a longer summary.' }).expect(200);
    await moderator.post(`/api/review/${part.id}/approve`).send({}).expect(200);
    expect((await crew.get(`/api/kits/${kit}/recalls`)).body.items).toEqual([]);

    await author
      .patch(`/api/parts/${part.id}`)
      .send({ safety: { carriesLoad: false, overhead: false, vehicle: true, heat: false } })
      .expect(200);
    await moderator.post(`/api/review/${part.id}/approve`).send({}).expect(200);
    const items = (await crew.get(`/api/kits/${kit}/recalls`)).body.items;
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ kind: 'cautions', partTitle: 'Monitor arm' });
    expect(items[0].reason).toContain('New caution: On a vehicle, vibration and sun both work on the part');
  });

  it('kit recalls · set reports raise a new warning (two PETG failures in heat) · banner on the kit, raised once', async () => {
    const part = await published(author, submission({ title: 'Dash mount' }));
    const kit = await kitWith(crew, part.id, 'Desert unit');
    await report(crew, part.id, { outcome: 'deformed', conditions: ['heat'], production: 'Dune Line' }).expect(201);
    expect((await crew.get(`/api/kits/${kit}/recalls`)).body.items).toEqual([]);
    await report(crew2, part.id, { outcome: 'failed', conditions: ['heat'], production: 'Dune Line' }).expect(201);
    await report(crew2, part.id, { outcome: 'held-up', conditions: [], production: 'Other job' }).expect(201);
    const items = (await crew.get(`/api/kits/${kit}/recalls`)).body.items;
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ kind: 'reports', partTitle: 'Dash mount' });
    expect(items[0].reason).toBe('Set reports now warn: PETG deformed or failed in heat in 2 of 2 reports.');
    expect(await KitRecall.count({ where: { partId: part.id } })).toBe(1);
  });
});

describe('writes queued offline (Idempotency-Key)', () => {
  let partId: number;
  beforeAll(async () => {
    partId = (await published(author, submission({ title: 'Slate holder' }))).id;
  });

  it('writes queued offline · set report sent twice with one key · filed once; the repeat answers 200 with the same id', async () => {
    const first = await report(crew, partId, { outcome: 'held-up', notes: 'Queued on set.' }, 'offline-report-0001').expect(201);
    const again = await report(crew, partId, { outcome: 'held-up', notes: 'Queued on set.' }, 'offline-report-0001').expect(200);
    expect(again.body).toEqual({ id: first.body.id });
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(await SetReport.count({ where: { partId, userId: crew.userId } })).toBe(1);
  });

  it('writes queued offline · set report sent twice at once with one key · one report, both answers name it', async () => {
    const [a, b] = await Promise.all([
      report(crew2, partId, { outcome: 'held-up' }, 'offline-report-race-1'),
      report(crew2, partId, { outcome: 'held-up' }, 'offline-report-race-1'),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.id).toBe(b.body.id);
    expect(await SetReport.count({ where: { partId, userId: crew2.userId } })).toBe(1);
  });

  it('writes queued offline · rating sent again after a newer one · the replay does not overwrite it', async () => {
    await crew.post(`/api/parts/${partId}/ratings`).set('Idempotency-Key', 'offline-rating-0001').send({ stars: 3 }).expect(201);
    await crew.post(`/api/parts/${partId}/ratings`).send({ stars: 5 }).expect(200);
    const replay = await crew.post(`/api/parts/${partId}/ratings`).set('Idempotency-Key', 'offline-rating-0001').send({ stars: 3 }).expect(200);
    expect(replay.headers['idempotent-replayed']).toBe('true');
    expect((await Rating.findOne({ where: { partId, userId: crew.userId } }))!.stars).toBe(5);
  });

  it('a key reused for another part · 422 naming the key; a malformed key · 422; nothing filed', async () => {
    const other = (await published(author, submission({ title: 'Clapper hook' }))).id;
    const reused = await report(crew, other, { outcome: 'held-up' }, 'offline-report-0001').expect(422);
    expect(reused.body.error.code).toBe('idempotency_key_reused');
    const bad = await crew.post(`/api/parts/${other}/ratings`).set('Idempotency-Key', 'no spaces allowed').send({ stars: 4 }).expect(422);
    expect(bad.body.error.message).toMatch(/Idempotency-Key/);
    expect(await SetReport.count({ where: { partId: other } })).toBe(0);
    expect(await Rating.count({ where: { partId: other } })).toBe(0);
    expect(await ClientKey.count({ where: { userId: crew.userId } })).toBe(2);
  });
});
