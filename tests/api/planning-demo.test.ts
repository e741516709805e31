import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { KitSummaryResponse } from '@shared/api/planning';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { agentFor, createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;

async function demo(role: 'member' | 'moderator' | 'admin') {
  const a = await agentFor(t.app);
  await a.login(DEMO_ACCOUNTS.find((d) => d.role === role)!.email, DEMO_PASSWORD).then((r) => expect(r.status).toBe(200));
  return a;
}

beforeAll(async () => {
  t = await createTestApp({}, { demo: true });
});
afterAll(async () => {
  await t.close();
});

describe('planning · demo kit', () => {
  it('demo kit · the member’s car-unit kit · three shelf parts, a PLA heat warning, shared read-only with the key grip', async () => {
    const member = await demo('member');
    const printers = (await member.get('/api/printers')).body.items;
    expect(printers.map((p: { name: string }) => p.name).sort()).toEqual(['Big box', 'Cart printer']);
    const kits = (await member.get('/api/kits')).body.items;
    expect(kits).toHaveLength(1);
    expect(kits[0]).toMatchObject({ name: 'The Salt Road — car unit', heatExposure: 'vehicle-sun', access: 'owner', itemCount: 3 });

    const summary = (await member.get(`/api/kits/${kits[0].id}/summary`).expect(200)).body as KitSummaryResponse;
    expect(summary.items.map((i) => i.title)).toContain('Dashboard monitor yoke');
    const pla = summary.items.find((i) => i.material === 'PLA')!;
    expect(pla.heat!.ok).toBe(false);
    expect(pla.heat!.saferMaterials).toContain('ASA');
    const yoke = summary.items.find((i) => i.title === 'Dashboard monitor yoke')!;
    expect(yoke.heat!.ok).toBe(true);
    expect(yoke.cautions.map((c) => c.text).join(' ')).toMatch(/safety cable/);
    expect(summary.totals.unestimated).toEqual([]);
    expect(summary.totals.energyIncluded).toBe('all');
    expect(summary.buyOrPrint.payback!.kits).toBeGreaterThan(0);

    const keyGrip = await demo('moderator');
    expect((await keyGrip.get(`/api/kits/${kits[0].id}`)).body.access).toBe('read');
    expect((await keyGrip.patch(`/api/kits/${kits[0].id}`).send({ name: 'Renamed' })).status).toBe(403);
    expect((await (await demo('admin')).get(`/api/kits/${kits[0].id}`)).status).toBe(404);
  });
});
