import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CrewInfo } from '@shared/api/crews';
import type { Role } from '@shared/types';
import { CrewInvitation } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

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

async function join(lead: Agent, crewId: number, who: Agent, role: 'lead' | 'member' = 'member') {
  await lead.post(`/api/crews/${crewId}/invitations`).send({ email: who.email, role }).expect(201);
  const token = await inviteLink(who.email);
  await who.post(`/api/invitations/${token}/accept`).expect(200);
}

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('crews · lifecycle', () => {
  it('crews · a member creates a crew · becomes its lead, with currency and tax rate kept', async () => {
    const lead = await signedIn();
    const res = await lead.post('/api/crews').send({ name: 'Camera dept, Low Tide', production: 'Low Tide Pictures', currency: 'eur', taxRatePct: 19 });
    expect(res.status).toBe(201);
    const crew = res.body as CrewInfo;
    expect(crew).toMatchObject({ name: 'Camera dept, Low Tide', currency: 'EUR', taxRatePct: 19, myRole: 'lead', memberCount: 1 });
    expect(crew.members).toEqual([expect.objectContaining({ userId: lead.userId, role: 'lead' })]);
    const list = await lead.get('/api/crews').expect(200);
    expect(list.body.items.map((c: CrewInfo) => c.id)).toContain(crew.id);
  });

  it('crews · bad input · 422 with the field named, nothing created', async () => {
    const lead = await signedIn();
    const res = await lead.post('/api/crews').send({ name: 'x', currency: 'EURO' });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['name', 'currency']));
    expect((await lead.get('/api/crews').expect(200)).body.items).toEqual([]);
    const anon = await agentFor(t.app);
    expect((await anon.get('/api/crews')).status).toBe(401);
  });

  it('crews · an invitation by mail is accepted by the invited account · they join with the crew role given', async () => {
    const lead = await signedIn();
    const crewId = (await lead.post('/api/crews').send({ name: 'Grip and camera', currency: 'GBP' }).expect(201)).body.id;
    const invited = await signedIn();
    const sent = await lead.post(`/api/crews/${crewId}/invitations`).send({ email: invited.email.toUpperCase() });
    expect(sent.status).toBe(201);
    expect(sent.body).toMatchObject({ email: invited.email, role: 'member', status: 'waiting' });
    const token = await inviteLink(invited.email);
    const preview = await (await agentFor(t.app)).get(`/api/invitations/${token}`).expect(200);
    expect(preview.body).toMatchObject({ crewName: 'Grip and camera', role: 'member' });

    const stranger = await signedIn();
    const wrong = await stranger.post(`/api/invitations/${token}/accept`);
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.message).toMatch(/another e-mail address/);

    const ok = await invited.post(`/api/invitations/${token}/accept`);
    expect(ok.status).toBe(200);
    expect(ok.body.myRole).toBe('member');
    const again = await invited.post(`/api/invitations/${token}/accept`);
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('invitation_used');
    // an invitation for someone already in the crew is refused
    expect((await lead.post(`/api/crews/${crewId}/invitations`).send({ email: invited.email })).status).toBe(409);
  });

  it('crews · an expired or replaced invitation · 400 that says so, nobody joins', async () => {
    const lead = await signedIn();
    const crewId = (await lead.post('/api/crews').send({ name: 'Second unit', currency: 'USD' }).expect(201)).body.id;
    const late = await signedIn();
    await lead.post(`/api/crews/${crewId}/invitations`).send({ email: late.email }).expect(201);
    const first = await inviteLink(late.email);
    await lead.post(`/api/crews/${crewId}/invitations`).send({ email: late.email }).expect(201);
    const second = await inviteLink(late.email);
    expect((await late.post(`/api/invitations/${first}/accept`)).body.error.code).toBe('invitation_withdrawn');
    await CrewInvitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { crewId, email: late.email, withdrawnAt: null } });
    const res = await late.post(`/api/invitations/${second}/accept`);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invitation_expired');
    expect((await late.get(`/api/crews/${crewId}`)).status).toBe(404);
  });

  it('crews · leads manage members, a member leaves, the last lead cannot · right answers for each', async () => {
    const lead = await signedIn();
    const crewId = (await lead.post('/api/crews').send({ name: 'Night shoot', currency: 'EUR' }).expect(201)).body.id;
    const a = await signedIn();
    const b = await signedIn();
    await join(lead, crewId, a);
    await join(lead, crewId, b);

    // a member cannot change roles, invite, rename or remove others
    expect((await a.patch(`/api/crews/${crewId}/members/${b.userId}`).send({ role: 'lead' })).status).toBe(403);
    expect((await a.post(`/api/crews/${crewId}/invitations`).send({ email: 'x@crew.test' })).status).toBe(403);
    expect((await a.patch(`/api/crews/${crewId}`).send({ name: 'Renamed' })).status).toBe(403);
    expect((await a.delete(`/api/crews/${crewId}/members/${b.userId}`)).status).toBe(403);
    expect((await a.delete(`/api/crews/${crewId}`)).status).toBe(403);

    // the only lead can neither leave nor step down
    const leave = await lead.delete(`/api/crews/${crewId}/members/${lead.userId}`);
    expect(leave.status).toBe(409);
    expect(leave.body.error.message).toMatch(/only lead/);
    expect((await lead.patch(`/api/crews/${crewId}/members/${lead.userId}`).send({ role: 'member' })).status).toBe(409);

    // with a second lead, the first may leave
    const promoted = await lead.patch(`/api/crews/${crewId}/members/${a.userId}`).send({ role: 'lead' });
    expect(promoted.status).toBe(200);
    expect(promoted.body.members.find((m: { userId: number }) => m.userId === a.userId).role).toBe('lead');
    await lead.delete(`/api/crews/${crewId}/members/${lead.userId}`).expect(204);
    expect((await lead.get(`/api/crews/${crewId}`)).status).toBe(404);

    // a member leaves on their own; a lead removes another
    await b.delete(`/api/crews/${crewId}/members/${b.userId}`).expect(204);
    const c = await signedIn();
    await join(a, crewId, c);
    await a.delete(`/api/crews/${crewId}/members/${c.userId}`).expect(204);
    const info = await a.get(`/api/crews/${crewId}`).expect(200);
    expect(info.body.members.map((m: { userId: number }) => m.userId)).toEqual([a.userId]);
  });

  it('crews · outsiders, moderators and a lead updating · 404 for outsiders, moderators look, leads change', async () => {
    const lead = await signedIn();
    const crewId = (await lead.post('/api/crews').send({ name: 'Studio B', currency: 'EUR' }).expect(201)).body.id;
    const outsider = await signedIn();
    expect((await outsider.get(`/api/crews/${crewId}`)).status).toBe(404);
    expect((await outsider.patch(`/api/crews/${crewId}`).send({ name: 'Mine now' })).status).toBe(404);
    const moderator = await signedIn('moderator');
    const seen = await moderator.get(`/api/crews/${crewId}`).expect(200);
    expect(seen.body.myRole).toBeNull();
    expect((await moderator.patch(`/api/crews/${crewId}`).send({ name: 'Changed' })).status).toBe(403);
    const changed = await lead.patch(`/api/crews/${crewId}`).send({ taxRatePct: 7.5, production: '' });
    expect(changed.status).toBe(200);
    expect(changed.body).toMatchObject({ taxRatePct: 7.5, production: null, name: 'Studio B' });
    await lead.delete(`/api/crews/${crewId}`).expect(204);
    expect((await lead.get(`/api/crews/${crewId}`)).status).toBe(404);
  });
});

describe('kits · shared with a whole crew', () => {
  it('kits · kit crew shares · only crews the owner is in; edit lets every member change items, read does not', async () => {
    const owner = await signedIn();
    const crewId = (await owner.post('/api/crews').send({ name: 'Prep crew', currency: 'EUR' }).expect(201)).body.id;
    const mate = await signedIn();
    await join(owner, crewId, mate);
    const stranger = await signedIn();
    const otherCrew = (await stranger.post('/api/crews').send({ name: 'Elsewhere', currency: 'EUR' }).expect(201)).body.id;
    const kitId = (await owner.post('/api/kits').send({ name: 'Rain day' }).expect(201)).body.id;
    const put = (body: object) => owner.agent.put(`/api/kits/${kitId}/crew-shares`).set('X-CSRF-Token', owner.token).send(body);

    const refused = await put({ crewShares: [{ crewId: otherCrew, access: 'read' }] });
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toMatch(/crew you are in/);
    expect((await mate.get(`/api/kits/${kitId}`)).status).toBe(404);

    expect((await put({ crewShares: [{ crewId, access: 'read' }] })).body.crewShares).toEqual([{ crewId, crewName: 'Prep crew', access: 'read' }]);
    const seen = await mate.get(`/api/kits/${kitId}`).expect(200);
    expect(seen.body.access).toBe('read');
    expect((await mate.get('/api/kits').expect(200)).body.items.map((k: { id: number }) => k.id)).toContain(kitId);
    expect((await mate.patch(`/api/kits/${kitId}`).send({ name: 'Mine' })).status).toBe(403);
    // only the owner chooses crews
    expect((await mate.agent.put(`/api/kits/${kitId}/crew-shares`).set('X-CSRF-Token', mate.token).send({ crewShares: [] })).status).toBe(403);

    await put({ crewShares: [{ crewId, access: 'edit' }] }).expect(200);
    expect((await mate.patch(`/api/kits/${kitId}`).send({ name: 'Rain day, second unit' })).status).toBe(200);

    // leaving the crew ends the access
    await mate.delete(`/api/crews/${crewId}/members/${mate.userId}`).expect(204);
    expect((await mate.get(`/api/kits/${kitId}`)).status).toBe(404);
  });
});
