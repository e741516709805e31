import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { WantedDetail, WantedListItem } from '@shared/api/wanted';
import type { Role } from '@shared/types';
import { Notice, WantedAnswer, WantedPhoto, WantedRequest } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number; email: string };
let asker: Agent;
let maker: Agent;
let stranger: Agent;
let moderator: Agent;
let moderator2: Agent;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id, email: u.email });
}

async function submitted(by: Agent, title: string): Promise<number> {
  const res = await by
    .post('/api/parts')
    .field('data', JSON.stringify(submission({ title })))
    .attach('model', boxStl(30, 20, 10), 'part.stl');
  expect(res.status).toBe(201);
  return res.body.id;
}

async function mails() {
  await t.mailer.flush();
  return t.mailer.fake!.messages();
}

const request = {
  title: 'Receiver plate for a V-style battery on the KX-8 cage',
  details: 'Needs to sit behind the cage top plate, receiver facing up.',
  body: 'Korvel KX-8',
  mounts: ['v-style', '1/4"'],
  keySizes: [{ name: 'plate width', valueMm: 100, tolMm: 1 }],
  neededBy: '2026-05-04',
  searchedFor: 'receiver plate for v-style',
};

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  [asker, maker, stranger, moderator, moderator2] = await Promise.all([signedIn(), signedIn(), signedIn(), signedIn('moderator'), signedIn('moderator')]);
});
beforeEach(async () => {
  await t.mailer.flush();
  t.mailer.fake!.clear();
});
afterAll(async () => {
  await t.close();
});

describe('wanted · asking', () => {
  it('POST /api/wanted · JSON with body by name and mount names · 201 with the request as the board shows it', async () => {
    const res = await asker.post('/api/wanted').send(request).expect(201);
    const d = res.body as WantedDetail;
    expect(d.status).toBe('open');
    expect(d.body).toEqual({ slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8' });
    expect(d.mounts.map((m) => m.slug)).toEqual(['battery-v-style', 'screw-1-4-20']);
    expect(d.neededBy).toBe('2026-05-04');
    expect(d.searchedFor).toBe('receiver plate for v-style');
    expect(d.can).toEqual({ answer: true, close: true, closeAsSpam: false });
  });

  it('POST /api/wanted · multipart with a sketch · 201, the sketch cleaned and served as a thumbnail', async () => {
    const res = await asker
      .post('/api/wanted')
      .field('data', JSON.stringify({ ...request, title: 'Sketch: cable clamp for a 19 mm rod' }))
      .attach('photo', await plainPng(), 'sketch.png')
      .expect(201);
    await t.services.parts.photosSettled();
    const d = (await stranger.get(`/api/wanted/${res.body.id}`).expect(200)).body as WantedDetail;
    expect(d.photos).toHaveLength(1);
    expect(d.photos[0].processing).toBe('ready');
    const img = await stranger.get(d.photos[0].thumbnailUrl!).expect(200);
    expect(img.headers['content-type']).toBe('image/jpeg');
    // the start-up sweep knows wanted photos: it leaves them in place
    await t.services.parts.recover();
    await stranger.get(d.photos[0].displayUrl!).expect(200);
  });

  it('POST /api/wanted · a model file instead of a photo · 422 and nothing kept', async () => {
    const before = await WantedRequest.count();
    const photos = await WantedPhoto.count();
    const res = await asker
      .post('/api/wanted')
      .field('data', JSON.stringify(request))
      .attach('model', boxStl(10, 10, 10), 'x.stl')
      .expect(422);
    expect(res.body.error.fields.photo).toMatch(/photo or a sketch/);
    expect(await WantedRequest.count()).toBe(before);
    expect(await WantedPhoto.count()).toBe(photos);
  });

  it('POST /api/wanted · no title, a bad date, an unknown body · 422 with a message per field', async () => {
    const res = await asker
      .post('/api/wanted')
      .send({ ...request, title: 'x', neededBy: '2026-02-30' })
      .expect(422);
    expect(res.body.error.fields.title).toMatch(/what part you need/);
    expect(res.body.error.fields.neededBy).toMatch(/YYYY-MM-DD/);
    const body = await asker
      .post('/api/wanted')
      .send({ ...request, body: 'Zephyr 9' })
      .expect(422);
    expect(body.body.error.fields.body).toMatch(/No camera body is called "Zephyr 9"/);
  });

  it('wanted · GET /api/wanted · open requests, nearest needed-by first; visitors 401', async () => {
    await asker
      .post('/api/wanted')
      .send({ ...request, title: 'Monitor hood clip, needed soon', neededBy: '2026-04-01' })
      .expect(201);
    const res = await stranger.get('/api/wanted').expect(200);
    const items = res.body.items as WantedListItem[];
    expect(items[0].title).toBe('Monitor hood clip, needed soon');
    expect(items.every((i) => i.status === 'open')).toBe(true);
    const visitor = await agentFor(t.app);
    await visitor.get('/api/wanted').expect(401);
    await visitor.post('/api/wanted').send(request).expect(401);
  });
});

describe('wanted · answering and closing', () => {
  let id: number;
  beforeAll(async () => {
    id = (
      await asker
        .post('/api/wanted')
        .send({ ...request, title: 'V-style receiver plate, lifecycle' })
        .expect(201)
    ).body.id;
  });

  it('POST /:id/answers · someone else’s part in review · 422; their own part in review: 201, nobody told yet', async () => {
    const othersDraft = await submitted(stranger, 'Somebody else’s plate in review');
    const refused = await maker.post(`/api/wanted/${id}/answers`).send({ part: othersDraft }).expect(422);
    expect(refused.body.error.fields.part).toMatch(/no part with that id/);

    const own = await submitted(maker, 'V-style receiver plate for the KX-8 cage');
    const res = await maker
      .post(`/api/wanted/${id}/answers`)
      .send({ part: String(own), note: 'Printing a test one tonight.' })
      .expect(201);
    expect(res.body.onShelf).toBe(false);
    expect(await Notice.count({ where: { userId: asker.userId, kind: 'wanted' } })).toBe(0);
    await maker.post(`/api/wanted/${id}/answers`).send({ part: own }).expect(409);

    // the requester sees it as in review, without a link to the shelf
    const d = (await asker.get(`/api/wanted/${id}`).expect(200)).body as WantedDetail;
    expect(d.answerList).toHaveLength(1);
    expect(d.answerList[0].part).toMatchObject({ id: own, onShelf: false, status: 'in_review' });
    expect((await mails()).filter((m) => m.to.includes(asker.email))).toHaveLength(0);
  });

  it('review approve · the answering part goes on the shelf · the requester gets one notice and one mail', async () => {
    const answer = (await WantedAnswer.findOne({ where: { requestId: id } }))!;
    t.mailer.fake!.clear();
    await moderator.post(`/api/review/${answer.partId}/approve`).send({}).expect(200);
    const notices = await Notice.findAll({ where: { userId: asker.userId, kind: 'wanted' } });
    expect(notices).toHaveLength(1);
    expect(notices[0].title).toBe('A part for your request: V-style receiver plate, lifecycle');
    expect(notices[0].link).toBe(`/wanted/${id}`);
    const toAsker = (await mails()).filter((m) => m.to.includes(asker.email));
    expect(toAsker).toHaveLength(1);
    expect(toAsker[0].subject).toBe('A part for your request: V-style receiver plate, lifecycle');
    expect(toAsker[0].text).toContain('“V-style receiver plate for the KX-8 cage”');
    expect(toAsker[0].text).toContain('Printing a test one tonight.');
    expect((await WantedAnswer.findByPk(answer.id))!.notifiedAt).not.toBeNull();
  });

  it('POST /:id/answers · a published part of someone else · 201 and the requester is told at once', async () => {
    const shelfPart = await submitted(stranger, 'Battery plate riser');
    await moderator.post(`/api/review/${shelfPart}/approve`).send({}).expect(200);
    t.mailer.fake!.clear();
    const slug = (await maker.get(`/api/parts/${shelfPart}`).expect(200)).body.slug as string;
    const res = await maker
      .post(`/api/wanted/${id}/answers`)
      .send({ part: `http://localhost/parts/${slug}` })
      .expect(201);
    expect(res.body.onShelf).toBe(true);
    expect(await Notice.count({ where: { userId: asker.userId, kind: 'wanted' } })).toBe(2);
    expect((await mails()).filter((m) => m.to.includes(asker.email))).toHaveLength(1);
  });

  it('POST /:id/close · anyone but the author or a moderator · 403; the author as spam: 403', async () => {
    const res = await stranger.post(`/api/wanted/${id}/close`).send({ reason: 'solved' }).expect(403);
    expect(res.body.error.message).toMatch(/Only the crew member who asked/);
    const spam = await asker.post(`/api/wanted/${id}/close`).send({ reason: 'spam' }).expect(403);
    expect(spam.body.error.message).toMatch(/Only a moderator/);
  });

  it('POST /:id/close · the author, solved · 200; then answers and a second close: 409', async () => {
    const res = await asker.post(`/api/wanted/${id}/close`).send({ reason: 'solved', note: 'Printed two, both fit.' }).expect(200);
    expect(res.body).toEqual({ id, status: 'closed', closeReason: 'solved' });
    const d = (await asker.get(`/api/wanted/${id}`).expect(200)).body as WantedDetail;
    expect(d.closedBy?.id).toBe(asker.userId);
    expect(d.can).toEqual({ answer: false, close: false, closeAsSpam: false });
    const shelfPart = await submitted(stranger, 'Late answer');
    await moderator.post(`/api/review/${shelfPart}/approve`).send({}).expect(200);
    await maker.post(`/api/wanted/${id}/answers`).send({ part: shelfPart }).expect(409);
    await asker.post(`/api/wanted/${id}/close`).send({ reason: 'withdrawn' }).expect(409);
    const open = (await stranger.get('/api/wanted').expect(200)).body.items as WantedListItem[];
    expect(open.some((i) => i.id === id)).toBe(false);
    const closed = (await stranger.get('/api/wanted?status=closed').expect(200)).body.items as WantedListItem[];
    expect(closed.some((i) => i.id === id)).toBe(true);
  });

  it('POST /:id/close · a moderator closes spam · hidden from other members (404), the author and moderators still see it, the author is told', async () => {
    const spamId = (
      await stranger
        .post('/api/wanted')
        .send({ ...request, title: 'Cheap plates, visit my shop' })
        .expect(201)
    ).body.id;
    const res = await moderator.post(`/api/wanted/${spamId}/close`).send({ reason: 'spam', note: 'Advertising.' }).expect(200);
    expect(res.body.closeReason).toBe('spam');
    await asker.get(`/api/wanted/${spamId}`).expect(404);
    await asker.post(`/api/wanted/${spamId}/answers`).send({ part: 1 }).expect(404);
    const closed = (await asker.get('/api/wanted?status=closed').expect(200)).body.items as WantedListItem[];
    expect(closed.some((i) => i.id === spamId)).toBe(false);
    await stranger.get(`/api/wanted/${spamId}`).expect(200);
    await moderator2.get(`/api/wanted/${spamId}`).expect(200);
    expect(await Notice.count({ where: { userId: stranger.userId, kind: 'wanted' } })).toBe(1);
  });

  it('POST /:id/close · a moderator closes someone else’s request as withdrawn · 200', async () => {
    const other = (
      await asker
        .post('/api/wanted')
        .send({ ...request, title: 'Duplicate of an earlier request' })
        .expect(201)
    ).body.id;
    await moderator.post(`/api/wanted/${other}/close`).send({ reason: 'withdrawn', note: 'Same as the earlier one.' }).expect(200);
  });

  it('wanted · role matrix · visitors 401 everywhere; an admin closes spam like a moderator', async () => {
    const visitor = await agentFor(t.app);
    await visitor.get(`/api/wanted/${id}`).expect(401);
    await visitor.post(`/api/wanted/${id}/answers`).send({ part: 1 }).expect(401);
    await visitor.post(`/api/wanted/${id}/close`).send({ reason: 'spam' }).expect(401);
    const admin = await signedIn('admin');
    const spamId = (
      await stranger
        .post('/api/wanted')
        .send({ ...request, title: 'Buy followers for your reel' })
        .expect(201)
    ).body.id;
    const detail = (await admin.get(`/api/wanted/${spamId}`).expect(200)).body as WantedDetail;
    expect(detail.can).toEqual({ answer: true, close: true, closeAsSpam: true });
    await admin.post(`/api/wanted/${spamId}/close`).send({ reason: 'spam' }).expect(200);
  });

  it('POST /:id/close · an unknown reason · 422 naming the reasons', async () => {
    const res = await asker.post(`/api/wanted/${id}/close`).send({ reason: 'done' }).expect(422);
    expect(res.body.error.fields.reason).toMatch(/solved, withdrawn/);
  });

  it('wanted · GET /api/wanted?status=mine · the author’s own requests, open and closed', async () => {
    const items = (await asker.get('/api/wanted?status=mine').expect(200)).body.items as WantedListItem[];
    expect(items.every((i) => i.author.id === asker.userId)).toBe(true);
    expect(items.some((i) => i.status === 'closed')).toBe(true);
  });
});
