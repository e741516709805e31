// The crew-only rule over every route that returns parts or files: a part published to one crew is
// seen by that crew's members and by moderators and admins, and by nobody else, in any answer.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number; email: string };

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id, email: u.email });
}

async function inviteLink(email: string): Promise<string> {
  await t.mailer.flush();
  const mail = t.mailer
    .fake!.messages()
    .filter((m) => m.to.includes(email))
    .at(-1)!;
  return /\/invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
}

// words no other part uses, so a leak shows as text anywhere in an answer
const SECRET_TITLE = 'Zephyrwick bracket for the Varrow rig';
const SECRET_WORD = 'zephyrwick';

let lead: Agent;
let author: Agent;
let crewMate: Agent;
let outsider: Agent;
let moderator: Agent;
let secondModerator: Agent;
let admin: Agent;
let anon: Awaited<ReturnType<typeof agentFor>>;
let crewId: number;
let secret: { id: number; slug: string; modelId: number; photoId: number };
let publicId: number;
let kitId: number;
let outsiderBuild: number;
let crewWanted: number;
let outsiderWanted: number;

const everyone = () =>
  [
    ['anonymous', anon, false],
    ['outsider member', outsider, false],
    ['crew member', crewMate, true],
    ['crew lead', lead, true],
    ['moderator', moderator, true],
    ['admin', admin, true],
  ] as const;

function leaks(body: unknown): boolean {
  const text = (typeof body === 'string' ? body : JSON.stringify(body ?? '')).toLowerCase();
  return text.includes(SECRET_WORD) || text.includes(secret.slug);
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  anon = await agentFor(t.app);
  [lead, author, crewMate, outsider, moderator, secondModerator, admin] = [
    await signedIn(),
    await signedIn(),
    await signedIn(),
    await signedIn(),
    await signedIn('moderator'),
    await signedIn('moderator'),
    await signedIn('admin'),
  ];
  crewId = (await lead.post('/api/crews').send({ name: 'Camera dept, Varrow', currency: 'EUR' }).expect(201)).body.id;
  for (const who of [author, crewMate]) {
    await lead.post(`/api/crews/${crewId}/invitations`).send({ email: who.email }).expect(201);
    await who.post(`/api/invitations/${await inviteLink(who.email)}/accept`).expect(200);
  }

  // an outsider cannot publish to a crew they are not in
  const refused = await outsider
    .post('/api/parts')
    .field('data', JSON.stringify(submission({ title: 'Not mine to hide', visibility: { crewId } })))
    .attach('model', boxStl(20, 20, 10), 'x.stl');
  expect(refused.status).toBe(422);
  expect(refused.body.error.fields.visibility).toMatch(/crew you are in/);

  const made = await author
    .post('/api/parts')
    .field(
      'data',
      JSON.stringify(submission({ title: SECRET_TITLE, summary: 'Holds the zephyrwick receiver on the Varrow rig rods.', visibility: { crewId } })),
    )
    .attach('model', boxStl(40, 30, 12), 'zephyrwick.stl')
    .attach('photo', await plainPng(), 'zephyrwick.png');
  expect(made.status).toBe(201);
  // crew-only parts still pass the review desk
  expect((await moderator.get('/api/review/queue').expect(200)).body.items.map((i: { partId?: number; id?: number }) => i.partId ?? i.id)).toContain(
    made.body.id,
  );
  await moderator.post(`/api/review/${made.body.id}/approve`).send({}).expect(200);
  await t.services.parts.photosSettled();
  const detail = (await author.get(`/api/parts/${made.body.id}`).expect(200)).body;
  expect(detail.visibility).toEqual({ crewId, crewName: 'Camera dept, Varrow' });
  secret = {
    id: detail.id,
    slug: detail.slug,
    modelId: detail.files.find((f: { kind: string }) => f.kind === 'model').id,
    photoId: detail.files.find((f: { kind: string }) => f.kind === 'photo').id,
  };

  const pub = await outsider
    .post('/api/parts')
    .field('data', JSON.stringify(submission({ title: 'Open receiver bracket', category: 'monitors-video' })))
    .attach('model', boxStl(40, 30, 12), 'open.stl');
  publicId = pub.body.id;
  await moderator.post(`/api/review/${publicId}/approve`).send({}).expect(200);

  // a crew adaptation's parent stays hidden from outsiders; evidence on the crew part
  await crewMate
    .post(`/api/parts/${secret.id}/ratings`)
    .send({ stars: 5, comment: 'The zephyrwick holds.' })
    .expect((r) => expect(r.status).toBeLessThan(300));

  // a kit with both parts, shared with the outsider by hand and with the crew as a whole
  kitId = (await author.post('/api/kits').send({ name: 'Varrow prep', production: 'Varrow' }).expect(201)).body.id;
  await author.post(`/api/kits/${kitId}/items`).send({ partId: secret.id, quantity: 2 }).expect(201);
  await author.post(`/api/kits/${kitId}/items`).send({ partId: publicId, quantity: 1 }).expect(201);
  await author.agent
    .put(`/api/kits/${kitId}/shares`)
    .set('X-CSRF-Token', author.token)
    .send({ shares: [{ userId: outsider.userId, access: 'edit' }] })
    .expect(200);
  await author.agent
    .put(`/api/kits/${kitId}/crew-shares`)
    .set('X-CSRF-Token', author.token)
    .send({ crewShares: [{ crewId, access: 'read' }] })
    .expect(200);

  // wanted requests: the crew's own is answered with the crew part; an outsider's cannot be
  crewWanted = (await crewMate.post('/api/wanted').send({ title: 'Receiver holder for rods', details: 'For the car week.' }).expect(201)).body.id;
  await author
    .post(`/api/wanted/${crewWanted}/answers`)
    .send({ part: String(secret.id), note: 'This one.' })
    .expect(201);
  outsiderWanted = (await outsider.post('/api/wanted').send({ title: 'Any receiver holder', details: 'Anything.' }).expect(201)).body.id;
  const blocked = await author.post(`/api/wanted/${outsiderWanted}/answers`).send({ part: String(secret.id), note: 'Try this.' });
  expect(blocked.status).toBe(422);
  expect(blocked.body.error.fields.part).toMatch(/crew the person who asked is not in/);

  outsiderBuild = (
    await outsider
      .post('/api/builds')
      .send({ name: 'Car rig', body: 'korvel-kx8', mounts: ['rods-15-60'], keySizes: [] })
      .expect(201)
  ).body.id;
  await t.services.search.idle();
  void secondModerator;
});

afterAll(async () => {
  await t.close();
});

describe('crew-only parts · role matrix', () => {
  it('crew-only parts · part page by id and by slug · seen by the crew and moderators, 404 for everyone else', async () => {
    for (const [who, agent, sees] of everyone()) {
      for (const key of [secret.id, secret.slug]) {
        const res = await agent.get(`/api/parts/${key}`);
        expect(res.status, `${who} /api/parts/${key}`).toBe(sees ? 200 : 404);
        if (!sees) expect(leaks(res.body), who).toBe(false);
      }
    }
  });

  it('crew-only parts · shelf list and search, with counts and facets · crew-only parts only for those who see them', async () => {
    const totals = new Map<string, number>();
    for (const [who, agent, sees] of everyone()) {
      const list = await agent.get('/api/parts').expect(200);
      expect(
        list.body.items.some((p: { id: number }) => p.id === secret.id),
        `${who} list`,
      ).toBe(sees);
      if (!sees) expect(leaks(list.body), `${who} list`).toBe(false);

      const found = await agent.get(`/api/search?q=${SECRET_WORD}`).expect(200);
      expect(found.body.total, `${who} search`).toBe(sees ? 1 : 0);
      if (!sees) expect(leaks(found.body), `${who} search`).toBe(false);

      const all = await agent.get('/api/search').expect(200);
      totals.set(who, all.body.total);
      const facetCount = JSON.stringify(all.body.facets);
      if (!sees) expect(leaks(all.body) || facetCount.includes(SECRET_WORD), `${who} facets`).toBe(false);
      expect(all.body.results.some((r: { id: number }) => r.id === secret.id)).toBe(sees);
    }
    // the hidden part is missing from the outsider's totals, exactly once
    expect(totals.get('outsider member')).toBe(totals.get('crew member')! - 1);
    expect(totals.get('anonymous')).toBe(totals.get('outsider member'));
    expect(totals.get('moderator')).toBe(totals.get('crew member'));
    // facets: the category count differs by the hidden part only
    const facetsOf = async (agent: typeof anon) => (await agent.get('/api/search').expect(200)).body.facets;
    expect(JSON.stringify(await facetsOf(outsider))).toBe(JSON.stringify(await facetsOf(anon)));
    expect(JSON.stringify(await facetsOf(outsider))).not.toBe(JSON.stringify(await facetsOf(crewMate)));
  });

  it('crew-only parts · search by camera build · the outsider never gets the crew part', async () => {
    const res = await outsider.get(`/api/search?build=${outsiderBuild}&q=receiver`).expect(200);
    expect(res.body.results.map((r: { id: number }) => r.id)).toContain(publicId);
    expect(leaks(res.body)).toBe(false);
  });

  it('crew-only parts · files: download, photo sizes and estimate by file id · 404 (or 401) outside the crew', async () => {
    for (const [who, agent, sees] of everyone()) {
      const download = await agent.get(`/api/parts/${secret.id}/files/${secret.modelId}/download`);
      expect(download.status, `${who} download`).toBe(sees ? 200 : who === 'anonymous' ? 401 : 404);
      for (const size of ['thumb', 'display']) {
        const image = await agent.get(`/api/parts/${secret.id}/files/${secret.photoId}/image/${size}`);
        expect(image.status, `${who} ${size}`).toBe(sees ? 200 : 404);
      }
      const estimate = await agent
        .post('/api/estimate')
        .send({ fileId: secret.modelId, material: 'PETG', nozzleMm: 0.4, layerMm: 0.2, walls: 3, topBottomLayers: 4, infillPct: 20 });
      if (sees) expect(estimate.status, `${who} estimate`).toBe(200);
      else {
        expect([401, 404], `${who} estimate`).toContain(estimate.status);
        expect(leaks(estimate.body)).toBe(false);
      }
    }
  });

  it('crew-only parts · evidence, history and profiles · nothing about the crew part outside the crew', async () => {
    for (const [who, agent, sees] of everyone()) {
      for (const path of ['ratings', 'reports', 'proven']) {
        const res = await agent.get(`/api/parts/${secret.id}/${path}`);
        expect(res.status, `${who} ${path}`).toBe(sees ? 200 : 404);
        if (!sees) expect(leaks(res.body)).toBe(false);
      }
      const history = await agent.get(`/api/parts/${secret.id}/history`);
      if (!sees) expect([401, 404], `${who} history`).toContain(history.status);
      const profile = await agent.get(`/api/users/${author.userId}/profile`).expect(200);
      expect(
        profile.body.parts.some((p: { id: number }) => p.id === secret.id),
        `${who} profile`,
      ).toBe(sees);
      if (!sees) expect(leaks(profile.body)).toBe(false);
    }
  });

  it('crew-only parts · kits · the crew reads the whole kit, the outsider it was shared with sees only the open part', async () => {
    for (const [who, agent, sees] of everyone()) {
      if (who === 'anonymous') {
        expect((await agent.get(`/api/kits/${kitId}`)).status).toBe(401);
        continue;
      }
      const isModerator = who === 'moderator' || who === 'admin';
      const res = await agent.get(`/api/kits/${kitId}`);
      if (isModerator) {
        expect(res.status, who).toBe(404); // kits are private to their owner and shares
        continue;
      }
      expect(res.status, who).toBe(200);
      const partIds = res.body.items.map((i: { part: { id: number } }) => i.part.id);
      expect(partIds.includes(secret.id), `${who} kit items`).toBe(sees);
      expect(partIds).toContain(publicId);
      const summary = await agent.get(`/api/kits/${kitId}/summary`).expect(200);
      const csv = await agent.get(`/api/kits/${kitId}/export.csv`).expect(200);
      const list = await agent.get('/api/kits').expect(200);
      expect(list.body.items.find((k: { id: number }) => k.id === kitId).itemCount).toBe(sees ? 2 : 1);
      if (!sees) {
        for (const body of [res.body, summary.body, csv.text, list.body]) expect(leaks(body), who).toBe(false);
      } else expect(leaks(summary.body)).toBe(true);
    }
    // an outsider with edit access cannot add the crew part, nor change or remove its item
    const add = await outsider.post(`/api/kits/${kitId}/items`).send({ partId: secret.id, quantity: 1 });
    expect(add.status).toBe(422);
    const hiddenItem = (await author.get(`/api/kits/${kitId}`).expect(200)).body.items.find((i: { part: { id: number } }) => i.part.id === secret.id).id;
    expect((await outsider.patch(`/api/kits/${kitId}/items/${hiddenItem}`).send({ quantity: 5 })).status).toBe(404);
    expect((await outsider.delete(`/api/kits/${kitId}/items/${hiddenItem}`)).status).toBe(404);
  });

  it('crew-only parts · wanted answers and notices · the crew part shows to the crew only', async () => {
    for (const [who, agent, sees] of everyone()) {
      if (who === 'anonymous') continue;
      const res = await agent.get(`/api/wanted/${crewWanted}`).expect(200);
      expect(
        res.body.answerList.some((a: { part: { id: number } }) => a.part.id === secret.id),
        `${who} wanted`,
      ).toBe(sees);
      if (!sees) expect(leaks(res.body)).toBe(false);
      const other = await agent.get(`/api/wanted/${outsiderWanted}`).expect(200);
      expect(leaks(other.body)).toBe(false);
      const notices = await agent.get('/api/notices').expect(200);
      if (!sees) expect(leaks(notices.body), `${who} notices`).toBe(false);
    }
    // the crew member who asked was told, by notice and mail
    const told = await crewMate.get('/api/notices').expect(200);
    expect(leaks(told.body)).toBe(true);
    await t.mailer.flush();
    const outsiderMail = t.mailer.fake!.messages().filter((m) => m.to.includes(outsider.email));
    expect(outsiderMail.some((m) => leaks(m.text) || leaks(m.subject))).toBe(false);
  });

  it('crew-only parts · visibility · the author publishes to everyone and outsiders find it; back to the crew and they lose it', async () => {
    expect((await outsider.patch(`/api/parts/${secret.id}`).send({ visibility: 'everyone' })).status).toBe(404);
    expect((await crewMate.patch(`/api/parts/${secret.id}`).send({ visibility: 'everyone' })).status).toBe(403);
    const open = await author.patch(`/api/parts/${secret.id}`).send({ visibility: 'everyone' });
    expect(open.status).toBe(200);
    expect(open.body.visibility).toBe('everyone');
    expect(open.body.status).toBe('published');
    await t.services.search.idle();
    expect((await outsider.get(`/api/search?q=${SECRET_WORD}`).expect(200)).body.total).toBe(1);
    expect((await anon.get(`/api/parts/${secret.slug}`)).status).toBe(200);
    await author.patch(`/api/parts/${secret.id}`).send({ visibility: { crewId } }).expect(200);
    await t.services.search.idle();
    expect((await outsider.get(`/api/search?q=${SECRET_WORD}`).expect(200)).body.total).toBe(0);
    expect((await anon.get(`/api/parts/${secret.slug}`)).status).toBe(404);
    // a crew with crew-only parts cannot be deleted
    const gone = await lead.delete(`/api/crews/${crewId}`);
    expect(gone.status).toBe(409);
  });

  it('crew-only parts · leaving the crew · a member who leaves loses the crew parts at once', async () => {
    await crewMate.delete(`/api/crews/${crewId}/members/${crewMate.userId}`).expect(204);
    expect((await crewMate.get(`/api/parts/${secret.id}`)).status).toBe(404);
    expect((await crewMate.get(`/api/search?q=${SECRET_WORD}`).expect(200)).body.total).toBe(0);
    expect((await crewMate.get(`/api/kits/${kitId}`)).status).toBe(404);
  });

  it('crew-only parts · a moderator edits the crew part through the form · the unchanged visibility it sends is accepted', async () => {
    const res = await moderator
      .patch(`/api/parts/${secret.id}`)
      .send({ summary: 'Holds the zephyrwick receiver on the Varrow rig’s 15 mm rods.', visibility: { crewId } });
    expect(res.status).toBe(200);
    expect(res.body.visibility).toMatchObject({ crewId });
    expect((await moderator.patch(`/api/parts/${secret.id}`).send({ visibility: 'everyone' })).status).toBe(403);
  });
});
