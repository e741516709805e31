import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BuildInfo, BuildSearchResponse } from '@shared/api/builds';
import type { WantedListItem } from '@shared/api/wanted';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { DEMO_BUILD_NAME } from '../../server/demo/0011-demo-builds-and-wanted';
import { agentFor, createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
let member: Awaited<ReturnType<typeof agentFor>>;

beforeAll(async () => {
  t = await createTestApp({}, { demo: true });
  await t.services.search.idle();
  member = await agentFor(t.app);
  await member.login(DEMO_ACCOUNTS.find((a) => a.role === 'member')!.email, DEMO_PASSWORD).then((r) => expect(r.status).toBe(200));
});
afterAll(async () => {
  await t.close();
});

describe('demo scenario · builds and wanted parts', () => {
  it('demo member · their builds · the car-week build on the KX-8 with rods, V-style, 1/4-20, shoe and lens gear', async () => {
    const items = (await member.get('/api/builds').expect(200)).body.items as BuildInfo[];
    const carWeek = items.find((b) => b.name === DEMO_BUILD_NAME)!;
    expect(carWeek.body?.slug).toBe('korvel-kx8');
    expect(carWeek.mounts.map((m) => m.slug)).toEqual(['rods-15-60', 'battery-v-style', 'screw-1-4-20', 'accessory-shoe', 'gear-0-8']);
  });

  it('demo shelf · searched with the car-week build · best proven first: the receiver cradle (made for the KX-8) fits and leads, every fitting part before any other', async () => {
    const items = (await member.get('/api/builds').expect(200)).body.items as BuildInfo[];
    const id = items.find((b) => b.name === DEMO_BUILD_NAME)!.id;
    const res = (await member.get(`/api/search?build=${id}&sort=proven`).expect(200)).body as BuildSearchResponse;
    expect(res.results[0].slug).toBe('receiver-cradle-for-15-mm-rods');
    expect(res.results[0].fit.verdict).toBe('fits');
    const verdicts = res.results.map((r) => r.fit.verdict);
    expect(verdicts.lastIndexOf('fits')).toBeLessThan(verdicts.indexOf('not'));
    // the gear ring: a gear the build uses, and its bore meets the build's lens barrel
    const gear = res.results.find((r) => r.slug === 'lens-gear-ring-module-0-8-for-80-mm-barrels')!;
    expect(gear.fit).toMatchObject({ verdict: 'fits', summary: 'Shares 0.8 module gear · barrel bore 80.4 ± 0.3 mm meets your lens barrel 80 ± 0.5 mm' });
    // the plate spacer is made for another body only
    const spacer = res.results.find((r) => r.slug === 'v-style-plate-spacer-6-mm')!;
    expect(spacer.fit).toMatchObject({ verdict: 'not', summary: 'Made for Ostrava Imaging Vega S35, not the Korvel KX-8' });
  });

  it('demo board · open wanted requests · two, one already answered', async () => {
    const items = (await member.get('/api/wanted').expect(200)).body.items as WantedListItem[];
    expect(items).toHaveLength(2);
    expect(items.map((i) => i.answers).sort()).toEqual([0, 1]);
  });
});
