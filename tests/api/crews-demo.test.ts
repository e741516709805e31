import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { DEMO_CREW_NAME, DEMO_CREW_PART_TITLE, DEMO_SECOND_MEMBER } from '../../server/demo/0017-demo-crew-shelf';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;

async function demo(email: string) {
  const a = await agentFor(t.app);
  expect((await a.login(email, DEMO_PASSWORD)).status).toBe(200);
  return a;
}

// seeding the whole demo shelf (meshes, photos, password hashes) is slow on a busy machine
beforeAll(async () => {
  t = await createTestApp({}, { demo: 'full' });
  await t.services.search.idle();
}, 240_000);
afterAll(async () => {
  await t.close();
});

describe('demo scenario · the crew', () => {
  it('demo crew · the lead, the second AC and the key grip · in one crew with a waiting invitation', async () => {
    const lead = await demo(DEMO_ACCOUNTS.find((a) => a.role === 'member')!.email);
    const crews = (await lead.get('/api/crews').expect(200)).body.items;
    expect(crews).toEqual([expect.objectContaining({ name: DEMO_CREW_NAME, myRole: 'lead', memberCount: 3, currency: 'EUR', taxRatePct: 19 })]);
    const crew = (await lead.get(`/api/crews/${crews[0].id}`).expect(200)).body;
    expect(crew.members.map((m: { displayName: string }) => m.displayName)).toEqual(expect.arrayContaining([DEMO_SECOND_MEMBER.displayName]));
    expect(crew.invitations).toEqual([expect.objectContaining({ status: 'waiting' })]);
    expect(crew.partCount).toBe(1);
  });

  it('demo crew part · approved at the review desk · found by the crew, not by another member', async () => {
    const second = await demo(DEMO_SECOND_MEMBER.email);
    const found = await second.get('/api/search?q=slate+holder').expect(200);
    expect(found.body.results.map((r: { title: string }) => r.title)).toContain(DEMO_CREW_PART_TITLE);
    const kits = (await second.get('/api/kits').expect(200)).body.items;
    expect(kits.length).toBe(1);

    const other = await makeUser();
    const outsider = await agentFor(t.app);
    await outsider.login(other.email, other.password);
    const hidden = await outsider.get('/api/search?q=slate+holder').expect(200);
    expect(hidden.body.results.map((r: { title: string }) => r.title)).not.toContain(DEMO_CREW_PART_TITLE);
  });
});
