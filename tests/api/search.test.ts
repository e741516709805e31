import { copyFileSync, readFileSync, writeFileSync } from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SearchResponse } from '@shared/api/search';
import { searchQuerySchema } from '@shared/schemas/search';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { jpegWithGps } from '../helpers/photos';
import { seedBodies, setReadyRecipe, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;
let author: Agent;
let modA: Agent;

async function signedIn(role: 'member' | 'moderator') {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return a;
}

const recipe = {
  PETG: setReadyRecipe,
  ASA: { ...setReadyRecipe, material: 'ASA', hotendC: 250, bedC: 100 },
  TPU: { ...setReadyRecipe, material: 'TPU', hotendC: 225, bedC: 40, speedMmS: 25 },
  PLA: { ...setReadyRecipe, material: 'PLA', hotendC: 210, bedC: 60 },
};

interface Entry {
  data: Record<string, unknown>;
  size: [number, number, number];
  photo?: boolean;
}

const base = {
  description: '',
  bodies: [],
  mounts: [],
  keyDimensions: [],
  safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false },
  testedLoadKg: null,
};

// An invented shelf: part names, makers and camera bodies are made up (bodies from the demo list).
const CATALOGUE = {
  plate: {
    photo: true,
    size: [110, 75, 20],
    data: {
      ...base,
      title: 'V-style battery plate adapter',
      category: 'power-batteries',
      licence: 'CC-BY-4.0',
      summary: 'Puts a V-style battery on the back of the cage, off the rods.',
      bodies: ['korvel-kx8'],
      mounts: [{ slug: 'battery-v-style' }, { slug: 'rods-15-60' }],
      recipes: [recipe.PETG, recipe.ASA],
    },
  },
  riser: {
    size: [60, 40, 20],
    data: {
      ...base,
      title: 'Cheese riser block',
      category: 'shoe-top',
      licence: 'CC-BY-ND-4.0',
      summary: 'Lifts a top handle by 20 mm on a quarter-twenty screw.',
      bodies: ['halden-h6'],
      mounts: [{ slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'screw hole', valueMm: 6.5, tolMm: 0.1 }],
      recipes: [recipe.PETG],
    },
  },
  yoke: {
    size: [150, 30, 90],
    data: {
      ...base,
      title: 'Director monitor yoke',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'Holds a 7-inch director monitor on a stand or arm.',
      mounts: [{ slug: 'screw-3-8-16' }, { slug: 'accessory-shoe' }],
      recipes: [recipe.PETG],
    },
  },
  clamp: {
    size: [50, 30, 25],
    data: {
      ...base,
      title: 'Rod clamp with thumb screw',
      category: 'rods-mounting',
      licence: 'CC-BY-4.0',
      summary: 'Grabs one lightweight rod and takes any small accessory.',
      mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'Rod bore', valueMm: 15.3, tolMm: 0.1 }],
      recipes: [recipe.PETG],
    },
  },
  gear: {
    size: [90, 90, 8],
    data: {
      ...base,
      title: 'Follow-focus gear ring, 80 mm',
      category: 'lens-focus',
      licence: 'CC-BY-4.0',
      summary: 'A flexible gear ring that grips a lens barrel without tape.',
      mounts: [{ slug: 'gear-0-8' }],
      keyDimensions: [{ name: 'inner diameter', valueMm: 80, tolMm: 0.2 }],
      recipes: [recipe.TPU],
    },
  },
  slate: {
    size: [130, 60, 15],
    data: {
      ...base,
      title: 'Slate light holder',
      category: 'cases-storage',
      licence: 'CC-BY-4.0',
      summary: 'Clips the small slate light to the side of the camera cart.',
      description: 'Has a pocket for the spare battery of the light.',
      recipes: [recipe.PETG],
    },
  },
  handle: {
    size: [140, 35, 45],
    data: {
      ...base,
      title: 'Short top handle',
      category: 'shoe-top',
      licence: 'CC-BY-4.0',
      summary: 'A low top handle that clears the viewfinder.',
      bodies: ['ostrava-vega-s35'],
      mounts: [{ slug: 'screw-3-8-16' }],
      recipes: [recipe.PETG],
    },
  },
  clip: {
    size: [30, 20, 10],
    data: {
      ...base,
      title: 'Cable clip for studio rods',
      category: 'cable-management',
      licence: 'MIT',
      summary: 'Keeps a power cable tidy along the bottom rods.',
      mounts: [{ slug: 'rods-19-104' }],
      recipes: [recipe.PLA],
    },
  },
  dovetail: {
    size: [101.6, 38, 12],
    data: {
      ...base,
      title: 'Dovetail bridge plate',
      category: 'rods-mounting',
      licence: 'CC-BY-4.0',
      summary: 'A short plate that drops into a 38 mm clamp under the body.',
      mounts: [{ slug: 'dovetail-38' }],
      keyDimensions: [{ name: 'plate width', valueMm: 101.6, tolMm: 0.2 }],
      recipes: [recipe.PETG],
    },
  },
  sled: {
    // stands 120 tall as drawn: fits a 120 × 80 × 40 space only lying down
    size: [40, 120, 80],
    data: {
      ...base,
      title: 'Wireless receiver sled',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'Holds a video receiver upright on the camera shoe.',
      mounts: [{ slug: 'accessory-shoe' }],
      recipes: [recipe.PETG],
    },
  },
} satisfies Record<string, Entry>;
type Name = keyof typeof CATALOGUE;
const ids = {} as Record<Name, number>;
const nameOf = (id: number) => (Object.keys(ids) as Name[]).find((n) => ids[n] === id) ?? `#${id}`;

async function submitPart(entry: Entry): Promise<number> {
  let req = author
    .post('/api/parts')
    .field('data', JSON.stringify(submission(entry.data)))
    .attach('model', boxStl(...entry.size), 'part.stl');
  if (entry.photo) req = req.attach('photo', await jpegWithGps(), 'print.jpg');
  const res = await req;
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id;
}

async function approve(id: number) {
  await t.services.parts.photosSettled();
  await modA.post(`/api/review/${id}/approve`).send({}).expect(200);
}

function searchRaw(params: Record<string, string | string[]>) {
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) for (const item of Array.isArray(v) ? v : [v]) qs.append(k, item);
  return request(t.app).get(`/api/search?${qs}`);
}

async function search(params: Record<string, string | string[]>): Promise<SearchResponse> {
  const res = await searchRaw({ pageSize: '100', ...params });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}

async function names(params: Record<string, string | string[]>): Promise<string[]> {
  return (await search(params)).results.map((r) => nameOf(r.id));
}

const withMount = (slug: string) =>
  (Object.keys(CATALOGUE) as Name[]).filter((n) => (CATALOGUE[n].data.mounts as { slug: string }[]).some((m) => m.slug === slug));

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  author = await signedIn('member');
  modA = await signedIn('moderator');
  for (const [name, entry] of Object.entries(CATALOGUE) as [Name, Entry][]) {
    ids[name] = await submitPart(entry);
    await approve(ids[name]);
  }
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

describe('search · relevance', () => {
  it('search relevance · "battery plate" · the V-style plate adapter first', async () => {
    expect((await names({ q: 'battery plate' }))[0]).toBe('plate');
  });

  it('search relevance · a title match and a description-only match · the title match ranks higher', async () => {
    const found = await names({ q: 'battery' });
    expect(found).toEqual(['plate', 'slate']);
  });

  it('search relevance · a camera-body model name or alias · finds its parts', async () => {
    expect(await names({ q: 'Vega S35' })).toEqual(['handle']);
    expect(await names({ q: 's35' })).toEqual(['handle']);
    expect(await names({ q: 'KX-8' })).toEqual(['plate']);
  });

  it('search relevance · 1/4" and quarter inch · find the 1/4-20 parts', async () => {
    const expected = withMount('screw-1-4-20').sort();
    expect(expected).toEqual(['clamp', 'riser']);
    expect((await names({ q: '1/4"' })).sort()).toEqual(expected);
    expect((await names({ q: 'quarter inch' })).sort()).toEqual(expected);
    // the riser matches both; the clamp only the screw, and comes after it
    const both = await search({ q: 'quarter inch riser' });
    expect(both.results.map((r) => nameOf(r.id))).toEqual(['riser', 'clamp']);
    expect(both.results[1]).toMatchObject({ matched: ['quarter inch'], missing: ['riser'] });
  });

  it('search relevance · LWS and 15mm rods · find the 15 mm rod parts', async () => {
    const expected = withMount('rods-15-60').sort();
    expect((await names({ q: 'LWS' })).sort()).toEqual(expected);
    const found = await search({ q: '15mm rods clamp' });
    expect(nameOf(found.results[0].id)).toBe('clamp');
    expect(found.results[0]).toMatchObject({ matched: ['15mm rods', 'clamp'], missing: [] });
    expect(found.results.slice(1).every((r) => r.missing.length === 1)).toBe(true);
  });

  it('search relevance · a typo · still finds the plate', async () => {
    expect((await names({ q: 'baterry' }))[0]).toBe('plate');
    expect((await names({ q: 'baterry plate' }))[0]).toBe('plate');
  });

  it('search relevance · a word being typed · completed', async () => {
    expect(await names({ q: 'recei' })).toEqual(['sled']);
  });

  it('search relevance · a result · carries thumbnail, sizes, mounts, bodies and a score', async () => {
    const { results } = await search({ q: 'battery plate' });
    expect(results[0]).toEqual({
      id: ids.plate,
      slug: 'v-style-battery-plate-adapter',
      title: 'V-style battery plate adapter',
      summary: 'Puts a V-style battery on the back of the cage, off the rods.',
      sizeMm: [expect.closeTo(110, 2), expect.closeTo(75, 2), expect.closeTo(20, 2)],
      mounts: [
        { slug: 'battery-v-style', label: 'V-style battery plate' },
        { slug: 'rods-15-60', label: '15 mm rods at 60 mm' },
      ],
      bodies: [{ slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8' }],
      rating: null,
      ratingCount: 0,
      proven: 0,
      reports: 0,
      heldUp: 0,
      thumbnail: expect.stringMatching(new RegExp(`^/api/parts/${ids.plate}/files/\\d+/image/thumb$`)),
      score: expect.any(Number),
      matched: ['battery plate'],
      missing: [],
    });
    expect(results[0].score).toBeGreaterThan(0);
    const thumb = await request(t.app).get(results[0].thumbnail!);
    expect(thumb.status).toBe(200);
  });

  it('search relevance · query syntax · run', async () => {
    expect(await names({ q: 'title:battery' })).toEqual(['plate']);
    // "rod" is in the plate's summary, the rod mounts' labels and the category "Rods & mounting";
    // the clamp also says "thumb screw", the clip "studio rods"
    expect((await names({ q: '+rod -thumb' })).sort()).toEqual(['clip', 'dovetail', 'plate']);
    expect((await names({ q: 'rods -studio' })).sort()).toEqual(['clamp', 'dovetail', 'plate']);
  });
});

describe('search · filters', () => {
  it('search filters · no text and no filters · every part, newest first', async () => {
    const all = await search({});
    expect(all.total).toBe(10);
    expect(all.results.map((r) => nameOf(r.id))).toEqual((Object.keys(CATALOGUE) as Name[]).reverse());
  });

  it('search filters · mount standard by slug or by name · filtered', async () => {
    expect((await names({ mount: 'screw-1-4-20' })).sort()).toEqual(['clamp', 'riser']);
    expect((await names({ mount: '1/4"' })).sort()).toEqual(['clamp', 'riser']);
    expect((await names({ mount: ['accessory-shoe', 'gear-0-8'] })).sort()).toEqual(['gear', 'sled', 'yoke']);
  });

  it('search filters · camera body, category and material · filtered', async () => {
    expect(await names({ body: 'korvel-kx8' })).toEqual(['plate']);
    expect((await names({ category: 'shoe-top' })).sort()).toEqual(['handle', 'riser']);
    expect(await names({ material: 'tpu' })).toEqual(['gear']);
    expect(await names({ material: 'ASA' })).toEqual(['plate']);
  });

  it('search filters · licence adaptable or not · filtered', async () => {
    expect(await names({ adaptable: 'false' })).toEqual(['riser']);
    expect((await names({ adaptable: 'true' })).length).toBe(9);
  });

  it('search filters · minimum rating with nothing rated yet · filtered', async () => {
    expect(await names({ minRating: '1' })).toEqual([]);
    expect((await names({ minRating: '0' })).length).toBe(10);
  });

  it('search filters · an envelope · parts fit in any orientation, the edge included', async () => {
    const fits = (await names({ fit: '120x80x40' })).sort();
    expect(fits).toEqual(['clamp', 'clip', 'dovetail', 'plate', 'riser', 'sled']);
    // the sled is drawn 40 × 120 × 80: it fits only turned
    expect(await names({ fit: '40x120x80', q: 'sled' })).toEqual(['sled']);
    expect(await names({ fit: '119.9x80x40', q: 'sled' })).toEqual([]);
  });

  it('search filters · an inch envelope · read exactly', async () => {
    // 4.5 in × 3.25 in × 1.6 in = 114.3 × 82.55 × 40.64 mm (1 in = 25.4 mm, NIST SP 811 Appendix B)
    expect((await names({ fit: '4.5"x3.25"x1.6"' })).sort()).toEqual(['clamp', 'clip', 'dovetail', 'plate', 'riser']);
    // the dovetail plate is 101.6 × 38 × 12 mm: 4 in × 1.5 in × 0.5 in = 101.6 × 38.1 × 12.7 mm holds it at the edge
    expect(await names({ fit: '4in x 1.5in x 0.5in', q: 'dovetail' })).toEqual(['dovetail']);
    expect(await names({ fit: '3.99in x 1.5in x 0.5in', q: 'dovetail' })).toEqual([]);
  });

  it('search filters · a key dimension · ranges that overlap the asked one match, touching edges included', async () => {
    // the clamp's bore is 15.3 ± 0.1 mm: [15.2, 15.4]
    expect(await names({ dim: 'rod bore:15:0.2' })).toEqual(['clamp']);
    expect(await names({ dim: 'ROD BORE:15.6:0.2' })).toEqual(['clamp']);
    expect(await names({ dim: 'rod bore:15:0.19' })).toEqual([]);
    expect(await names({ dim: 'bore:15.3' })).toEqual(['clamp']);
    // 1/4 in = 6.35 mm; the riser's hole is 6.5 ± 0.1 mm: 0.15 mm away, so 0.05 more reaches it
    expect(await names({ dim: 'screw hole:1/4":0.05mm' })).toEqual(['riser']);
    expect(await names({ dim: 'screw hole:1/4":0.049' })).toEqual([]);
    // 4 in ± 0.05 in = 101.6 ± 1.27 mm
    expect(await names({ dim: 'plate width:4in:0.05in' })).toEqual(['dovetail']);
    expect(await names({ dim: 'plate width:4.1in:0.05in' })).toEqual([]);
    expect(await names({ dim: ['rod bore:15.3:0', 'plate width:4in:1'] })).toEqual([]);
  });

  it('search filters · text and filters together · combined', async () => {
    expect(await names({ q: 'rod', mount: 'rods-15-60', material: 'PETG', fit: '60x40x30' })).toEqual(['clamp']);
    expect((await names({ q: 'holds', category: 'monitors-video' })).sort()).toEqual(['sled', 'yoke']);
    expect(await names({ mount: 'screw-1-4-20', adaptable: 'true', dim: 'bore:15.3:0.1' })).toEqual(['clamp']);
    expect(await names({ body: 'halden-h6', category: 'lens-focus' })).toEqual([]);
  });

  it('search filters · facets · counted over the whole result set; categories add up to the total', async () => {
    const cases: Record<string, string>[] = [{}, { q: 'rods' }, { fit: '120x80x40' }, { mount: 'rods-15-60' }, { q: 'holds', pageSize: '1' }];
    for (const params of cases) {
      const res = await search(params);
      const all = (await search({ ...params, pageSize: '100' })).results;
      expect(all.length).toBe(res.total);
      expect(Object.values(res.facets.category).reduce((a, b) => a + b, 0)).toBe(res.total);
      for (const [slug, n] of Object.entries(res.facets.mount)) expect(n, slug).toBe(all.filter((r) => r.mounts.some((m) => m.slug === slug)).length);
      for (const [slug, n] of Object.entries(res.facets.body)) expect(n, slug).toBe(all.filter((r) => r.bodies.some((b) => b.slug === slug)).length);
      const materials = Object.values(res.facets.material).reduce((a, b) => a + b, 0);
      expect(materials).toBeGreaterThanOrEqual(res.total); // every part has at least one recipe
    }
    const shelf = await search({});
    expect(shelf.facets.material).toEqual({ PETG: 8, ASA: 1, TPU: 1, PLA: 1 });
  });

  it('search filters · page and sort · applied', async () => {
    const all = (await search({})).results.map((r) => r.id);
    const page2 = await search({ pageSize: '3', page: '2' });
    expect(page2).toMatchObject({ total: 10, page: 2, pageSize: 3 });
    expect(page2.results.map((r) => r.id)).toEqual(all.slice(3, 6));
    expect((await search({ page: '5', pageSize: '3' })).results).toEqual([]);
    const newest = await names({ q: 'rods', sort: 'newest' });
    expect(newest).toEqual([...newest].sort((a, b) => ids[b as Name] - ids[a as Name]));
    expect(await names({ q: 'battery', sort: 'proven' })).toEqual(await names({ q: 'battery', sort: 'relevance' }));
  });
});

describe('search · answers bad input', () => {
  // an outside probe's request: before the cap it held every other request for half a minute
  it('search bad input · the probe q=abcdefghijkl~7 · answered at once, as if ~2', async () => {
    const res = await request(t.app).get('/api/search?q=abcdefghijkl~7').expect(200);
    expect(res.body.total).toBe(0);
  });

  it.each(['*', 'a*', 'ba* pl* ri*'])('search bad input · the costly wildcard search q=%j · 400', async (q) => {
    const res = await searchRaw({ q });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/\*/);
  });

  it.each(['title:', '*~^', 'colour:red'])('search bad input · q=%j · 400 with a message', async (q) => {
    const res = await searchRaw({ q });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(res.body.error.message).toMatch(/could not be read/);
    expect(res.body.error.message).toMatch(/field:word/);
  });

  it('search bad input · a bad fit, dim or parameter · 422 with field messages', async () => {
    const fit = await searchRaw({ fit: '120x80' });
    expect(fit.status).toBe(422);
    expect(fit.body.error.fields.fit).toMatch(/three lengths separated by x/);
    const side = await searchRaw({ fit: '120x80xwide' });
    expect(side.body.error.fields.fit).toMatch(/"wide" is not a length/);
    const dim = await searchRaw({ dim: 'rod bore:fifteen:0.3' });
    expect(dim.status).toBe(422);
    expect(dim.body.error.fields.dim).toMatch(/"fifteen" is not a length/);
    const mount = await searchRaw({ mount: 'bayonet' });
    expect(mount.body.error.fields.mount).toMatch(/Unknown mount standard/);
    const extra = await searchRaw({ colour: 'red' });
    expect(extra.status).toBe(422);
    expect(extra.body.error.fields._).toMatch(/Unknown search parameter "colour"/);
  });
});

describe('search · follows the shelf', () => {
  it('search follows the shelf · a part waiting in review, then approved · found only once approved', async () => {
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Lens cap keeper',
        category: 'protection-caps',
        licence: 'CC-BY-4.0',
        summary: 'Keeps the lens cap on a cord by the matte box.',
        recipes: [recipe.PETG],
      },
    });
    await t.services.search.idle();
    expect(await names({ q: 'keeper' })).toEqual([]);
    await approve(id);
    await t.services.search.idle();
    expect((await search({ q: 'keeper' })).results.map((r) => r.id)).toEqual([id]);
  });

  it('search follows the shelf · a rebuild running · answers from the old index, then swaps in the new one', async () => {
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Marker pouch clip',
        category: 'cases-storage',
        licence: 'CC-BY-4.0',
        summary: 'Hangs a pouch of slate markers on the cart.',
        recipes: [recipe.PETG],
      },
    });
    await approve(id);
    // the worker that holds the old index answers until the new one is ready
    const during = await t.services.search.search(searchQuerySchema.parse({ q: 'pouch' }));
    expect(during.results.map((r) => r.id)).toEqual([]);
    expect(t.services.search.stats().documents).toBe(11);
    await t.services.search.idle();
    expect((await t.services.search.search(searchQuerySchema.parse({ q: 'pouch' }))).results.map((r) => r.id)).toEqual([id]);
  });

  it('search follows the shelf · an approved edit · the new title found, the old one no longer', async () => {
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Tally light bracket',
        category: 'shoe-top',
        licence: 'CC-BY-4.0',
        summary: 'Puts a tally lamp on the shoe where talent sees it.',
        recipes: [recipe.PETG],
      },
    });
    await approve(id);
    await t.services.search.idle();
    await author.patch(`/api/parts/${id}`).send({ title: 'Tally lamp cradle' }).expect(200);
    await t.services.search.idle();
    // the change waits in review: search still shows what is on the shelf
    expect((await search({ q: 'tally' })).results.map((r) => r.title)).toEqual(['Tally light bracket']);
    await approve(id);
    await t.services.search.idle();
    expect((await search({ q: 'tally' })).results.map((r) => r.title)).toEqual(['Tally lamp cradle']);
    const old = await search({ q: 'bracket tally' });
    expect(old.results.map((r) => [r.title, r.missing])).toEqual([['Tally lamp cradle', ['bracket']]]);
  });

  it('search follows the shelf · a retired part · dropped', async () => {
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Filter tray wedge',
        category: 'protection-caps',
        licence: 'CC-BY-4.0',
        summary: 'Shims a loose filter tray in the matte box.',
        recipes: [recipe.PETG],
      },
    });
    await approve(id);
    await t.services.search.idle();
    expect((await search({ q: 'wedge' })).results.map((r) => r.id)).toEqual([id]);
    await modA.post(`/api/review/${id}/retire`).send({ note: 'Cracked on the first day of the shoot.' }).expect(200);
    await t.services.search.idle();
    expect((await search({ q: 'wedge' })).results).toEqual([]);
  });

  it('search follows the shelf · a decision that leaves the published set as it was · no rebuild', async () => {
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Unlucky draft',
        category: 'protection-caps',
        licence: 'CC-BY-4.0',
        summary: 'This one goes back to its author for changes.',
        recipes: [recipe.PETG],
      },
    });
    const before = t.services.search.stats().builds;
    await modA.post(`/api/review/${id}/send-back`).send({ note: 'Add a photo of the print, please.' }).expect(200);
    await t.services.search.idle();
    expect(t.services.search.stats().builds).toBe(before);
  });
});

describe('search · index file', () => {
  it('search index file · a restart · loaded without rebuilding', async () => {
    await t.services.search.idle();
    const expected = await names({ q: 'rods' });
    const again = await createTestApp({ SEARCH_INDEX_FILE: t.config.SEARCH_INDEX_FILE });
    try {
      expect(again.services.search.stats()).toMatchObject({ builds: 0, loadsFromFile: 1, source: 'file', documents: t.services.search.stats().documents });
      const res = await request(again.app).get('/api/search?q=rods&pageSize=100').expect(200);
      expect(res.body.results.map((r: { id: number }) => nameOf(r.id))).toEqual(expected);
    } finally {
      await again.close();
    }
  });

  it('search index file · corrupt · rebuilt and written again', async () => {
    const file = `${t.config.SEARCH_INDEX_FILE}.corrupt.json`;
    writeFileSync(file, '{"format":1,"fingerprint":"tr');
    const again = await createTestApp({ SEARCH_INDEX_FILE: file });
    try {
      expect(again.services.search.stats()).toMatchObject({ builds: 1, loadsFromFile: 0, source: 'build' });
      const res = await request(again.app).get('/api/search?q=battery+plate').expect(200);
      expect(nameOf(res.body.results[0].id)).toBe('plate');
      expect(JSON.parse(readFileSync(file, 'utf8'))).toMatchObject({ format: 2, fingerprint: again.services.search.stats().fingerprint });
    } finally {
      await again.close();
    }
  });

  it('search index file · the shelf changed since it was written, or another format · rebuilt', async () => {
    const stale = `${t.config.SEARCH_INDEX_FILE}.stale.json`;
    copyFileSync(t.config.SEARCH_INDEX_FILE, stale);
    const id = await submitPart({
      size: [20, 20, 20],
      data: {
        ...base,
        title: 'Battery belt hook',
        category: 'power-batteries',
        licence: 'CC-BY-4.0',
        summary: 'Hangs a spare battery pouch on a belt.',
        recipes: [recipe.PETG],
      },
    });
    await approve(id);
    await t.services.search.idle();
    const again = await createTestApp({ SEARCH_INDEX_FILE: stale });
    try {
      expect(again.services.search.stats()).toMatchObject({ builds: 1, source: 'build' });
      const res = await request(again.app).get('/api/search?q=hook').expect(200);
      expect(res.body.results.map((r: { id: number }) => r.id)).toEqual([id]);
    } finally {
      await again.close();
    }

    const other = `${t.config.SEARCH_INDEX_FILE}.v0.json`;
    const content = JSON.parse(readFileSync(t.config.SEARCH_INDEX_FILE, 'utf8'));
    writeFileSync(other, JSON.stringify({ ...content, format: 0 }));
    const third = await createTestApp({ SEARCH_INDEX_FILE: other });
    try {
      expect(third.services.search.stats()).toMatchObject({ builds: 1, source: 'build' });
    } finally {
      await third.close();
    }
  });
});
