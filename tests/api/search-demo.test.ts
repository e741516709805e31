// The demo shelf searched the way a new crew member types: each query names the part it means.
// The demo shelf (server/demo/0003-demo-parts.ts) has a receiver cradle for 15 mm rods, a
// V-style plate spacer, a lens gear ring, a rod cable clip, a dashboard monitor yoke and a
// cold-shoe cover (waiting in review, so not found).
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SearchResponse } from '@shared/api/search';
import { createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, { demo: true });
  await t.services.search.start();
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

async function search(params: Record<string, string>): Promise<SearchResponse> {
  const res = await request(t.app).get(`/api/search?${new URLSearchParams(params)}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}
const slugs = async (params: Record<string, string>) => (await search(params)).results.map((r) => r.slug);

const CRADLE = 'receiver-cradle-for-15-mm-rods';
const SPACER = 'v-style-plate-spacer-6-mm';
const CLIP = 'snap-on-cable-clip-for-15-mm-rods';
const GEAR = 'lens-gear-ring-module-0-8-for-80-mm-barrels';
const YOKE = 'dashboard-monitor-yoke';

describe('search · the demo shelf as crews type', () => {
  it.each([
    ['receiver plate', CRADLE],
    ['wireless video receiver', CRADLE],
    ['RX', CRADLE],
    ['v-style', SPACER],
    ['V style', SPACER],
    ['v-mount', SPACER],
    ['battery mount', SPACER],
    ['cheese plate', SPACER],
    ['monitor battery plate adapter', SPACER],
    ['follow-focus gear', GEAR],
    ['focus gear', GEAR],
    // the cold-shoe cover waits in review; the yoke is the published part with an accessory shoe
    ['cold shoe', YOKE],
    ['coldshoe', YOKE],
    ['accessory shoe', YOKE],
    ['dashboard monitor', YOKE],
    ['snap-on', CLIP],
    ['snapon clip', CLIP],
  ])('search on the demo shelf · %j · the intended part first', async (q, slug) => {
    const res = await search({ q });
    expect(res.results[0]?.slug, JSON.stringify(res.results.map((r) => [r.slug, r.score, r.matched, r.missing]))).toBe(slug);
  });

  it('search on the demo shelf · "15mm rod" · read as "15 mm rod": the two rod parts, the same answer', async () => {
    const glued = await search({ q: '15mm rod' });
    const apart = await search({ q: '15 mm rod' });
    expect(glued.results.map((r) => r.slug).sort()).toEqual([CLIP, CRADLE].sort());
    expect(apart.results.map((r) => r.slug)).toEqual(glued.results.map((r) => r.slug));
    expect(glued.results[0].missing).toEqual([]);
  });

  it('search on the demo shelf · some words match · never an empty page, and says which words did not', async () => {
    // no demo part is a receiver bracket for V-style plates: each half finds its part
    const res = await search({ q: 'receiver bracket for v-style' });
    expect(
      res.results
        .map((r) => r.slug)
        .slice(0, 2)
        .sort(),
    ).toEqual([CRADLE, SPACER].sort());
    const cradle = res.results.find((r) => r.slug === CRADLE)!;
    expect(cradle.matched).toContain('receiver');
    expect(cradle.missing).toEqual(expect.arrayContaining(['bracket', 'v-style']));
  });

  it('search on the demo shelf · a camera body by maker and model or any alias, however spaced · taken', async () => {
    for (const body of ['korvel-kx8', 'KX8', 'kx 8', 'Korvel KX-8', 'korvel 8']) {
      expect((await slugs({ body })).sort(), body).toEqual([CRADLE]);
    }
    expect((await slugs({ q: 'kx8' }))[0]).toBe(CRADLE);
    expect((await slugs({ q: 'Halden 6 receiver' }))[0]).toBe(CRADLE);
  });

  it('search on the demo shelf · an unknown body · 400 naming the closest known bodies', async () => {
    const res = await request(t.app).get('/api/search?body=KX9').expect(400);
    expect(res.body.error.message).toMatch(/No camera body is called "KX9"/);
    expect(res.body.error.message).toMatch(/Korvel KX-8/);
  });

  it('search on the demo shelf · a 15 ± 0.1 rod bore · the 15.2 ± 0.2 clamp found, the closest nominal first', async () => {
    // receiver cradle: rod bore 15.2 ± 0.2 → [15.0, 15.4] touches the asked [14.9, 15.1];
    // cable clip: 15.2 ± 0.3 → [14.9, 15.5] overlaps it too; both nominals are 0.2 away
    expect((await slugs({ dim: 'rod bore:15:0.1' })).sort()).toEqual([CLIP, CRADLE].sort());
    expect(await slugs({ dim: 'rod bore:15.2:0' })).toHaveLength(2);
    // 14.6 ± 0.1 → [14.5, 14.7]: disjoint from both
    expect(await slugs({ dim: 'rod bore:14.6:0.1' })).toEqual([]);
    // 14.8 ± 0.1 → [14.7, 14.9] touches only the clip's [14.9, 15.5]
    expect(await slugs({ dim: 'rod bore:14.8:0.1' })).toEqual([CLIP]);
  });
});
