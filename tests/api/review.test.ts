import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Role } from '@shared/types';
import { AuditEvent, PartRevision } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl, boxStlWithReversedFacets } from '../helpers/meshes';
import { seedBodies, setReadyRecipe, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { user: Awaited<ReturnType<typeof makeUser>>['user'] };
let member: Agent;
let other: Agent;
let modA: Agent;
let modB: Agent;

async function signedIn(role: Role = 'member', displayName?: string): Promise<Agent> {
  const u = await makeUser(role);
  if (displayName) await u.user.update({ displayName });
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { user: u.user });
}

function submit(a: Agent, data: unknown = submission()) {
  return a
    .post('/api/parts')
    .field('data', JSON.stringify(data))
    .attach('model', boxStl(20, 30, 10), 'part.stl');
}

async function submitted(a: Agent = member, data?: unknown): Promise<number> {
  const res = await submit(a, data);
  expect(res.status).toBe(201);
  return res.body.id;
}

async function mails() {
  await t.mailer.flush();
  return t.mailer.fake!.messages();
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  member = await signedIn('member', 'Wren Test');
  other = await signedIn('member');
  modA = await signedIn('moderator', 'Mod Alder');
  modB = await signedIn('moderator', 'Mod Birch');
});
// mail queued by earlier tests is delivered first, so each test sees only its own
beforeEach(async () => {
  await t.mailer.flush();
  t.mailer.fake!.clear();
});
afterAll(async () => {
  await t.close();
});

describe('review · queue', () => {
  it('review queue · submissions waiting · oldest first with age, contributor, category, safety flags and warnings', async () => {
    const first = await submitted(member, submission({ title: 'Oldest in the queue' }));
    await PartRevision.update({ submittedAt: new Date(Date.now() - 5 * 3600_000) }, { where: { partId: first } });
    const warm = await submitted(other, submission({ title: 'Cold PETG', recipes: [{ ...setReadyRecipe, hotendC: 190 }] }));
    const res = await modA.get('/api/review/queue');
    expect(res.status).toBe(200);
    const ids = res.body.items.map((i: { partId: number }) => i.partId);
    expect(ids.indexOf(first)).toBeLessThan(ids.indexOf(warm));
    const item = res.body.items.find((i: { partId: number }) => i.partId === first);
    expect(item).toMatchObject({
      title: 'Oldest in the queue',
      contributor: { displayName: 'Wren Test' },
      category: { slug: 'monitors-video' },
      safety: { carriesLoad: true },
      isRevisionOfPublished: false,
    });
    expect(item.ageHours).toBeGreaterThanOrEqual(4.9);
    expect(item.warnings).toContain('No photo of a real print');
    const cold = res.body.items.find((i: { partId: number }) => i.partId === warm);
    expect(cold.warnings.join(' ')).toMatch(/Hotend 190 °C is below PETG/);
  });

  it('review · a model with three facets wound backwards · the moderator sees it in the warnings before approving', async () => {
    const res = await member
      .post('/api/parts')
      .field('data', JSON.stringify(submission({ title: 'Backwards facets' })))
      .attach('model', boxStlWithReversedFacets(20, 30, 10, 3), 'bracket.stl');
    expect(res.status).toBe(201);
    const queue = await modA.get('/api/review/queue');
    const item = queue.body.items.find((i: { partId: number }) => i.partId === res.body.id);
    expect(item.warnings).toContain('bracket.stl: 3 facets wound backwards');
    expect(item.warnings).toContain('bracket.stl: volume counted with the wrongly wound facets flipped');
    const part = await modA.get(`/api/parts/${res.body.id}`);
    // 20 × 30 × 10 = 6,000 mm³ (box volume) once the three facets are counted flipped.
    expect(part.body.files[0].analysis).toMatchObject({ reversedFacets: 3, windingConsistent: false, volumeRepaired: true, watertight: true });
    expect(part.body.files[0].analysis.volumeMm3).toBeCloseTo(6000, 6);
  });

  it('review queue · members · closed to them; moderators and admins only', async () => {
    const admin = await signedIn('admin');
    expect((await request(t.app).get('/api/review/queue')).status).toBe(401);
    expect((await member.get('/api/review/queue')).status).toBe(403);
    expect((await modA.get('/api/review/queue')).status).toBe(200);
    expect((await admin.get('/api/review/queue')).status).toBe(200);
  });
});

describe('review · decisions', () => {
  it('review · approve · the part goes on the shelf for everyone, with the decision on record', async () => {
    const id = await submitted();
    expect((await other.get(`/api/parts/${id}`)).status).toBe(404);
    const res = await modA.post(`/api/review/${id}/approve`).send({ note: 'Fits the rods fine.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id, status: 'published', revision: { number: 1, status: 'published' } });
    expect((await other.get(`/api/parts/${id}`)).status).toBe(200);
    expect((await request(t.app).get(`/api/parts/${id}`)).status).toBe(200);
    const history = await modB.get(`/api/parts/${id}/history`);
    expect(history.body.items.map((e: { action: string }) => e.action)).toEqual(['submit', 'approve']);
    expect(history.body.items[1]).toMatchObject({ note: 'Fits the rods fine.', actor: { displayName: 'Mod Alder' } });
  });

  it('review · an illegal transition · 409 with a clear message', async () => {
    const id = await submitted();
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
    const again = await modB.post(`/api/review/${id}/reject`).send({ note: 'Too late for this.' });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/on the shelf, so it cannot be rejected/);
    expect(again.body.error.message).toMatch(/Mod Alder decided/);
    const retireInReview = await modA.post(`/api/review/${await submitted()}/retire`).send({ note: 'Not yet published.' });
    expect(retireInReview.status).toBe(409);
  });

  it('review · send back, edit, approve · the note is required; the edit puts it back in review; then it can be approved', async () => {
    const id = await submitted();
    const noNote = await modA.post(`/api/review/${id}/send-back`).send({});
    expect(noNote.status).toBe(422);
    expect(noNote.body.error.fields.note).toMatch(/note/);
    const res = await modA.post(`/api/review/${id}/send-back`).send({ note: 'Add a photo of the print on the rod.' });
    expect(res.body).toMatchObject({ status: 'sent_back' });
    expect((await member.get(`/api/parts/${id}`)).body.status).toBe('sent_back');

    await member.patch(`/api/parts/${id}`).send({ summary: 'Now with a clearer summary for the desk.' }).expect(200);
    expect((await member.get(`/api/parts/${id}`)).body.status).toBe('in_review');
    const history = await member.get(`/api/parts/${id}/history`);
    expect(history.body.items.map((e: { action: string }) => e.action)).toEqual(['submit', 'send_back', 'resubmit']);
    // the resubmission is the second version the desk sees, in the desk, the queue and the history
    expect(history.body.items.map((e: { revision: number | null }) => e.revision)).toEqual([1, 1, 2]);
    expect((await modB.get(`/api/review/${id}`)).body.submission.revision.number).toBe(2);
    const queue = await modB.get('/api/review/queue');
    expect(queue.body.items.find((i: { partId: number }) => i.partId === id)).toMatchObject({ revisionNumber: 2 });
    expect(history.body.items[1].note).toBe('Add a photo of the print on the rod.');
    await modB.post(`/api/review/${id}/approve`).send({}).expect(200);
  });

  it('review · a sent-back part resubmitted unchanged · accepted', async () => {
    const id = await submitted();
    await modA.post(`/api/review/${id}/send-back`).send({ note: 'Check the bore, then resubmit.' }).expect(200);
    const res = await member.post(`/api/parts/${id}/submit`);
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('in_review');
    expect((await member.post(`/api/parts/${id}/submit`)).status).toBe(409);
  });

  it('review · reject · a reason is required and the rejection is final', async () => {
    const id = await submitted();
    expect((await modA.post(`/api/review/${id}/reject`).send({ note: '' })).status).toBe(422);
    await modA.post(`/api/review/${id}/reject`).send({ note: 'This is a copy of another part.' }).expect(200);
    expect((await member.get(`/api/parts/${id}`)).body.status).toBe('rejected');
    expect((await member.patch(`/api/parts/${id}`).send({ title: 'Try again' })).status).toBe(409);
    expect((await modB.post(`/api/review/${id}/approve`).send({})).status).toBe(409);
  });

  it('review · retire a published part · a reason is required; it leaves the catalogue listing', async () => {
    const id = await submitted();
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
    const res = await modB.post(`/api/review/${id}/retire`).send({ note: 'Cracked on two shoots; see the set reports.' });
    expect(res.body.status).toBe('retired');
    const shelf = await request(t.app).get('/api/parts');
    expect(shelf.body.items.some((p: { id: number }) => p.id === id)).toBe(false);
    expect((await modA.post(`/api/review/${id}/retire`).send({ note: 'Twice is once too many.' })).status).toBe(409);
  });

  it('review · a moderator deciding on their own submission · refused (four eyes)', async () => {
    const own = await submitted(modA);
    const res = await modA.post(`/api/review/${own}/approve`).send({});
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/own submission/);
    await modB.post(`/api/review/${own}/approve`).send({}).expect(200);
    expect((await modA.post(`/api/review/${own}/retire`).send({ note: 'My own part, retiring it.' })).status).toBe(403);
  });

  it("review · a moderator edited someone else's published part · four eyes kept", async () => {
    const id = await submitted();
    await modB.post(`/api/review/${id}/approve`).send({}).expect(200);
    await modA.patch(`/api/parts/${id}`).send({ summary: 'A moderator rewrote this summary line.' }).expect(200);
    expect((await modA.post(`/api/review/${id}/approve`).send({})).status).toBe(403);
    await modB.post(`/api/review/${id}/approve`).send({}).expect(200);
  });

  it("four eyes · a moderator rewrites someone else's submission and replaces its model · cannot approve it (403), the history says who changed what, another moderator approves", async () => {
    const id = await submitted(member, submission({ summary: 'The contributor wrote this summary line.' }));
    const oldModel = (await member.get(`/api/parts/${id}`)).body.files.find((f: { kind: string }) => f.kind === 'model');
    await modA.patch(`/api/parts/${id}`).send({ summary: 'A moderator rewrote this summary line.' }).expect(200);
    await modA
      .post(`/api/parts/${id}/files`)
      .attach('model', boxStl(22, 30, 10), 'swapped.stl')
      .expect(201);
    await modA.delete(`/api/parts/${id}/files/${oldModel.id}`).expect(200);

    const approve = await modA.post(`/api/review/${id}/approve`).send({});
    expect(approve.status).toBe(403);
    expect(approve.body.error.message).toMatch(/You changed this revision yourself, so another moderator has to approve it/);
    const desk = (await modA.get(`/api/review/${id}`)).body;
    expect(desk.editedByYou).toBe(true);
    expect(desk.allowedActions).not.toContain('approve');
    expect(desk.allowedActions).toContain('send-back');

    // the contributor sees each change, who made it and what it was
    const history = (await member.get(`/api/parts/${id}/history`)).body.items as { action: string; actor: { displayName: string }; changes: string[] | null }[];
    const edits = history.filter((e) => e.action === 'edit');
    expect(edits).toHaveLength(3);
    expect(edits.every((e) => e.actor.displayName === 'Mod Alder')).toBe(true);
    expect(edits.flatMap((e) => e.changes)).toEqual([
      'Summary: “The contributor wrote this summary line.” → “A moderator rewrote this summary line.”',
      'Files added: swapped.stl',
      'Files removed: part.stl',
    ]);
    expect((await member.get('/api/notices')).body.items.some((n: { title: string }) => /Changed by Mod Alder/.test(n.title))).toBe(true);

    await modB.post(`/api/review/${id}/approve`).send({}).expect(200);
  });

  it('four eyes · the author edits their own submission · no edit event, and any other moderator may approve', async () => {
    const id = await submitted();
    await member.patch(`/api/parts/${id}`).send({ summary: 'The author tightened the summary.' }).expect(200);
    expect(await AuditEvent.count({ where: { partId: id, action: 'edit' } })).toBe(0);
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
  });

  it('review · two moderators deciding at once · exactly one wins; the other is told', async () => {
    const id = await submitted();
    const [a, b] = await Promise.all([modA.post(`/api/review/${id}/approve`).send({ note: 'A' }), modB.post(`/api/review/${id}/approve`).send({ note: 'B' })]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    expect(await AuditEvent.count({ where: { partId: id, action: 'approve' } })).toBe(1);
    expect(await PartRevision.count({ where: { partId: id, status: 'published' } })).toBe(1);
  });

  it('review · members on every decision route · refused', async () => {
    const id = await submitted();
    for (const action of ['approve', 'send-back', 'reject', 'retire']) {
      expect((await other.post(`/api/review/${id}/${action}`).send({ note: 'Not my call to make.' })).status).toBe(403);
      expect((await request(t.app).post(`/api/review/${id}/${action}`)).status).toBe(403); // no session, no CSRF token
    }
    expect((await other.get(`/api/review/${id}`)).status).toBe(403);
  });

  it('review · a part that does not exist · 404', async () => {
    expect((await modA.post('/api/review/999999/approve').send({})).status).toBe(404);
  });
});

describe('review · revisions of a published part', () => {
  it('revisions · a change to a published part · shows what changed; approving replaces the published revision', async () => {
    const id = await submitted(member, submission({ title: 'Yoke v1' }));
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
    await member
      .patch(`/api/parts/${id}`)
      .send({ title: 'Yoke v2', safety: { carriesLoad: true, overhead: true, vehicle: false, heat: false } })
      .expect(200);

    const queue = await modA.get('/api/review/queue');
    expect(queue.body.items.find((i: { partId: number }) => i.partId === id)).toMatchObject({ isRevisionOfPublished: true, revisionNumber: 2 });
    const detail = await modA.get(`/api/review/${id}`);
    expect(detail.body.changes).toEqual(
      expect.arrayContaining([
        { field: 'title', label: 'Title', before: 'Yoke v1', after: 'Yoke v2' },
        { field: 'safety.overhead', label: 'Used overhead', before: 'no', after: 'yes' },
      ]),
    );
    expect(detail.body.allowedActions).toEqual(['approve', 'send-back', 'reject']);
    expect(detail.body.checklist.length).toBe(7);

    expect((await other.get(`/api/parts/${id}`)).body.title).toBe('Yoke v1');
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
    expect((await other.get(`/api/parts/${id}`)).body.title).toBe('Yoke v2');
    expect(await PartRevision.count({ where: { partId: id, status: 'superseded' } })).toBe(1);
  });

  it('revisions · a change rejected · the published revision stays; the contributor may try again', async () => {
    const id = await submitted(member, submission({ title: 'Stable' }));
    await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
    await member.patch(`/api/parts/${id}`).send({ title: 'Risky change' }).expect(200);
    await modA.post(`/api/review/${id}/reject`).send({ note: 'That change breaks the fit.' }).expect(200);
    const seen = await other.get(`/api/parts/${id}`);
    expect(seen.body).toMatchObject({ title: 'Stable', status: 'published' });
    const retry = await member.patch(`/api/parts/${id}`).send({ title: 'Careful change' });
    expect(retry.status).toBe(200);
    expect(retry.body.revision).toMatchObject({ number: 3, status: 'in_review' });
  });
});

describe('review · history permissions', () => {
  it('review history · moderators, the contributor, anyone else · everything, their decisions, nothing', async () => {
    const id = await submitted();
    await modA.post(`/api/review/${id}/approve`).send({ note: 'ok' }).expect(200);
    expect((await modB.get(`/api/parts/${id}/history`)).status).toBe(200);
    expect((await member.get(`/api/parts/${id}/history`)).status).toBe(200);
    expect((await other.get(`/api/parts/${id}/history`)).status).toBe(403);
    expect((await request(t.app).get(`/api/parts/${id}/history`)).status).toBe(401);
    const unpublished = await submitted();
    expect((await other.get(`/api/parts/${unpublished}/history`)).status).toBe(404);
  });
});

describe('review · notices and mail', () => {
  it('review notices · a new submission · moderators told by notice and mail, not the contributor', async () => {
    const before = (await modB.get('/api/notices')).body.unread;
    await submitted(member, submission({ title: 'Bell test part' }));
    const after = await modB.get('/api/notices');
    expect(after.body.unread).toBe(before + 1);
    expect(after.body.items[0]).toMatchObject({ kind: 'review', title: 'New submission: Bell test part', read: false });
    const sent = await mails();
    const toModB = sent.filter((m) => m.to.includes(modB.user.email));
    expect(toModB.length).toBe(1);
    expect(sent.some((m) => m.to.includes(member.user.email))).toBe(false);
  });

  it('review notices · a decision · the contributor told with the note; a hostile title escaped in the HTML', async () => {
    const hostile = '<img src=x onerror=alert(1)>';
    const id = await submitted(member, submission({ title: hostile }));
    t.mailer.fake!.clear();
    await modA.post(`/api/review/${id}/send-back`).send({ note: 'Please add <b>real</b> photos.' }).expect(200);
    const sent = (await mails()).filter((m) => m.to.includes(member.user.email));
    expect(sent).toHaveLength(1);
    expect(sent[0].text).toContain('Please add <b>real</b> photos.');
    expect(sent[0].html).not.toContain('<img src=x');
    expect(sent[0].html).not.toContain('<b>real</b>');
    expect(sent[0].html).toContain('&lt;img src=x onerror=alert(1)&gt;');

    const bell = await member.get('/api/notices');
    const notice = bell.body.items.find((n: { kind: string }) => n.kind === 'decision');
    expect(notice.body).toBe('Please add <b>real</b> photos.');
    await member.post(`/api/notices/${notice.id}/read`).expect(204);
    await member.post('/api/notices/read-all').expect(204);
    expect((await member.get('/api/notices')).body.unread).toBe(0);
    expect((await other.post(`/api/notices/${notice.id}/read`)).status).toBe(404);
  });
});
