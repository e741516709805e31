import { existsSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { Jimp } from 'jimp';
import { strToU8, zipSync } from 'fflate';
import { Part, PartFile, PartRevision, RevisionFile } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, uploadsDir, type TestApp } from '../helpers/app';
import { boxStl, cubeStl } from '../helpers/meshes';
import { jpegWithGps, plainPng } from '../helpers/photos';
import { publishDirectly, seedBodies, setReadyRecipe, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;
let author: Agent;
let other: Agent;
let moderator: Agent;

async function signedIn(role: 'member' | 'moderator' = 'member') {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return a;
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  author = await signedIn();
  other = await signedIn();
  moderator = await signedIn('moderator');
});
afterAll(async () => {
  await t.close();
});

interface Upload {
  data?: unknown;
  models?: { name: string; bytes: Buffer }[];
  photos?: { name: string; bytes: Buffer }[];
  sources?: { name: string; bytes: Buffer }[];
}

function submit(a: Agent, u: Upload = {}) {
  let req = a.post('/api/parts').field('data', JSON.stringify(u.data ?? submission()));
  for (const m of u.models ?? [{ name: 'bracket.stl', bytes: boxStl(20, 30, 10) }]) req = req.attach('model', m.bytes, m.name);
  for (const p of u.photos ?? []) req = req.attach('photo', p.bytes, p.name);
  for (const s of u.sources ?? []) req = req.attach('source', s.bytes, s.name);
  return req;
}

function filesOnDisk(): string[] {
  return ['tmp', 'incoming', 'store'].flatMap((d) => {
    const dir = join(uploadsDir, d);
    return existsSync(dir) ? readdirSync(dir).map((f) => `${d}/${f}`) : [];
  });
}

async function snapshot() {
  await t.services.parts.photosSettled();
  return { parts: await Part.count(), files: await PartFile.count(), revisions: await PartRevision.count(), disk: filesOnDisk().sort() };
}

/** Binary STL bytes: 80-byte header, count, 50 bytes per facet (trade reference, "Mesh files"). */
function binaryStl(facets: number[][], declared = facets.length): Buffer {
  const buf = Buffer.alloc(84 + 50 * facets.length);
  buf.write('solid header that looks like ascii', 0, 'latin1');
  buf.writeUInt32LE(declared, 80);
  facets.forEach((v, i) => v.forEach((x, j) => buf.writeFloatLE(x, 84 + 50 * i + 12 + 4 * j)));
  return buf;
}

describe('parts · submit', () => {
  it('submit · a model, a photo and a source file · accepted; the part waits in review', async () => {
    const res = await submit(author, {
      photos: [{ name: 'on-the-rig.jpg', bytes: await jpegWithGps() }],
      sources: [{ name: 'bracket.step', bytes: Buffer.from('ISO-10303-21;\nHEADER;\nENDSEC;\nEND-ISO-10303-21;\n') }],
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ id: expect.any(Number), slug: 'receiver-bracket-for-15-mm-rods', status: 'in_review' });

    const part = await author.get(`/api/parts/${res.body.id}`).expect(200);
    const model = part.body.files.find((f: { kind: string }) => f.kind === 'model');
    // jscad's cuboid 20 × 30 × 10 mm: bounding box, volume 6000 mm³, area 2(600+200+300) = 2200 mm² (analytic)
    expect(model.analysis.sizeMm.map((v: number) => +v.toFixed(4))).toEqual([20, 30, 10]);
    expect(model.analysis.volumeMm3).toBeCloseTo(6000, 3);
    expect(model.analysis.areaMm2).toBeCloseTo(2200, 3);
    expect(model.analysis).toMatchObject({ facets: 12, watertight: true, shells: 1, insideOut: false });
    expect(model.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(part.body.files.map((f: { kind: string }) => f.kind).sort()).toEqual(['model', 'photo', 'source']);
    expect(part.body.status).toBe('in_review');
    expect(part.body.safety.cautions.map((c: { flag: string }) => c.flag)).toContain('overhead');
    expect(part.body.licence).toMatchObject({ id: 'CC-BY-4.0', name: 'Creative Commons Attribution 4.0 International' });
    expect(part.body.compatibility.bodies[0]).toMatchObject({ slug: 'korvel-kx8', maker: 'Korvel' });
    expect(part.body.recipes[0]).toMatchObject({ purpose: 'set-ready', material: 'PETG', layerMm: 0.2, warnings: [] });
  });

  it('submit · an unpublished part · 404 to other members and visitors, seen by moderators', async () => {
    const { body } = await submit(author).expect(201);
    expect((await other.get(`/api/parts/${body.id}`)).status).toBe(404);
    expect((await request(t.app).get(`/api/parts/${body.id}`)).status).toBe(404);
    expect((await moderator.get(`/api/parts/${body.id}`)).status).toBe(200);
    expect((await author.get(`/api/parts/${body.slug}`)).status).toBe(200);
  });

  it('submit · a visitor who is not signed in · refused', async () => {
    const res = await request(t.app).post('/api/parts');
    expect(res.status).toBe(403); // the CSRF check comes first for a request with no session
  });

  it('submit · a Markdown description · rendered, scripts and javascript: links removed', async () => {
    const data = submission({ description: '# Fit\n<script>alert(1)</script> [x](javascript:alert(1)) **bold** <img src=x onerror=alert(1)>' });
    const { body } = await submit(author, { data }).expect(201);
    const part = await author.get(`/api/parts/${body.id}`);
    expect(part.body.descriptionHtml).toContain('<strong>bold</strong>');
    expect(part.body.descriptionHtml).toContain('<h3>Fit</h3>');
    expect(part.body.descriptionHtml).not.toMatch(/<script|href="javascript:|<img/i);
    expect(part.body.descriptionHtml).toContain('&lt;script&gt;');
  });

  it('submit · a recipe outside the material window · accepted with a warning', async () => {
    const data = submission({ recipes: [{ ...setReadyRecipe, material: 'PETG', hotendC: 190 }] });
    const { body } = await submit(author, { data }).expect(201);
    const part = await author.get(`/api/parts/${body.id}`);
    expect(part.body.recipes[0].warnings[0]).toMatch(/below PETG/);
  });

  it('submit · an STL drawn in inches · scaled by exactly 25.4 (NIST SP 811 Appendix B)', async () => {
    const data = { ...submission(), drawnInInches: true };
    const { body } = await submit(author, { data, models: [{ name: 'inch-cube.stl', bytes: cubeStl(1) }] }).expect(201);
    const part = await author.get(`/api/parts/${body.id}`);
    expect(part.body.files[0].analysis.sizeMm.map((v: number) => +v.toFixed(6))).toEqual([25.4, 25.4, 25.4]);
  });

  it('submit · a 3MF in inches · its unit honoured (3MF Core Specification §3.4)', async () => {
    const v = [
      [0, 0, 0],
      [1, 0, 0],
      [1, 1, 0],
      [0, 1, 0],
      [0, 0, 1],
      [1, 0, 1],
      [1, 1, 1],
      [0, 1, 1],
    ];
    const t3 = [
      [0, 2, 1],
      [0, 3, 2],
      [4, 5, 6],
      [4, 6, 7],
      [0, 1, 5],
      [0, 5, 4],
      [1, 2, 6],
      [1, 6, 5],
      [2, 3, 7],
      [2, 7, 6],
      [3, 0, 4],
      [3, 4, 7],
    ];
    const model = `<?xml version="1.0" encoding="UTF-8"?>
<model unit="inch" xmlns="http://schemas.microsoft.com/3dmanufacturing/core/2015/02"><resources><object id="1" type="model"><mesh>
<vertices>${v.map(([x, y, z]) => `<vertex x="${x}" y="${y}" z="${z}"/>`).join('')}</vertices>
<triangles>${t3.map(([a, b, c]) => `<triangle v1="${a}" v2="${b}" v3="${c}"/>`).join('')}</triangles>
</mesh></object></resources><build><item objectid="1"/></build></model>`;
    const rels = `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Target="/3D/3dmodel.model" Id="rel0" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/></Relationships>`;
    const types = `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/></Types>`;
    const zip = zipSync({ '[Content_Types].xml': strToU8(types), '_rels/.rels': strToU8(rels), '3D/3dmodel.model': strToU8(model) });
    const { body } = await submit(author, { models: [{ name: 'cube.3mf', bytes: Buffer.from(zip) }] }).expect(201);
    const part = await author.get(`/api/parts/${body.id}`);
    expect(part.body.files[0].format).toBe('3mf');
    expect(part.body.files[0].analysis.sizeMm.map((x: number) => +x.toFixed(6))).toEqual([25.4, 25.4, 25.4]);
    expect(part.body.files[0].analysis.watertight).toBe(true);
  });

  it('submit · a path-traversal file name · only a clean display name kept, stored under a random name', async () => {
    const { body } = await submit(author, { models: [{ name: '../../../etc/passwd.stl', bytes: boxStl(5, 5, 5) }] }).expect(201);
    const file = (await PartFile.findOne({ where: { partId: body.id } }))!;
    expect(file.originalName).toBe('passwd.stl');
    expect(file.storedName).toMatch(/^[0-9a-f]{32}\.stl$/);
    expect(existsSync(join(uploadsDir, 'store', file.storedName))).toBe(true);
  });

  it('submit · two parts with the same title · different slugs', async () => {
    const data = submission({ title: 'Cable clip twin' });
    const a = await submit(author, { data }).expect(201);
    const b = await submit(author, { data }).expect(201);
    expect(a.body.slug).toBe('cable-clip-twin');
    expect(b.body.slug).toBe('cable-clip-twin-2');
  });
});

describe('parts · refused uploads leave nothing behind', () => {
  const nan = [[0, 0, 0, NaN, 0, 0, 0, 1, 0]];
  const cases: [string, () => Promise<Upload>, number, RegExp][] = [
    ['an empty model file', async () => ({ models: [{ name: 'empty.stl', bytes: Buffer.alloc(0) }] }), 422, /empty/i],
    ['a truncated binary STL', async () => ({ models: [{ name: 'cut.stl', bytes: boxStl(10, 10, 10).subarray(0, 400) }] }), 422, /facets|cut off|truncated/i],
    [
      'a binary STL whose count lies',
      async () => ({ models: [{ name: 'lies.stl', bytes: binaryStl([[0, 0, 0, 1, 0, 0, 0, 1, 0]], 7) }] }),
      422,
      /facets|count|cut off/i,
    ],
    ['NaN coordinates', async () => ({ models: [{ name: 'nan.stl', bytes: binaryStl(nan) }] }), 422, /not a number|NaN|infinite|finite/i],
    ['zero facets', async () => ({ models: [{ name: 'zero.stl', bytes: binaryStl([]) }] }), 422, /no facets|zero facets|0 facets/i],
    [
      'ASCII that does not parse',
      async () => ({
        models: [{ name: 'broken.stl', bytes: Buffer.from('solid x\nfacet normal 0 0 1\nouter loop\nvertex 0 0\nendloop\nendfacet\nendsolid x\n') }],
      }),
      422,
      /line/i,
    ],
    ['a PNG renamed .stl', async () => ({ models: [{ name: 'photo.stl', bytes: await plainPng() }] }), 422, /PNG/],
    ['an STL sent as a photo', async () => ({ photos: [{ name: 'shot.jpg', bytes: boxStl(5, 5, 5) }] }), 422, /JPEG, PNG or WebP/],
    [
      'a photo over 15 MB',
      async () => ({ photos: [{ name: 'huge.jpg', bytes: Buffer.concat([await jpegWithGps(), Buffer.alloc(15 * 1024 * 1024 + 1)]) }] }),
      413,
      /15 MB/,
    ],
    ['no model at all', async () => ({ models: [] }), 422, /at least one model/i],
    ['a layer height over 80 % of the nozzle', async () => ({ data: submission({ recipes: [{ ...setReadyRecipe, layerMm: 0.36 }] }) }), 422, /.+/],
    ['an unknown camera body', async () => ({ data: submission({ bodies: ['no-such-camera'] }) }), 422, /Unknown camera body/],
    ['a licence that is not on the list', async () => ({ data: submission({ licence: 'Proprietary' }) }), 422, /open licences/],
  ];

  for (const [what, build, status, message] of cases) {
    it(`refused uploads · ${what} · ${status} with a message; disk and database as they were`, async () => {
      const before = await snapshot();
      const res = await submit(author, await build());
      expect(res.status).toBe(status);
      expect(JSON.stringify(res.body.error)).toMatch(message);
      expect(await snapshot()).toEqual(before);
    });
  }

  it('refused uploads · a schema failure · the field named, e.g. recipes.0.layerMm', async () => {
    const res = await submit(author, { data: submission({ recipes: [{ ...setReadyRecipe, layerMm: 0.36 }] }) });
    expect(Object.keys(res.body.error.fields)).toContain('recipes.0.layerMm');
  });

  it('refused uploads · more than 12 files · 413', async () => {
    const before = await snapshot();
    const models = Array.from({ length: 13 }, (_, i) => ({ name: `m${i}.stl`, bytes: boxStl(5, 5, 5) }));
    const res = await submit(author, { models });
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/at most 12/);
    expect(await snapshot()).toEqual(before);
  });

  it('refused uploads · a file in an unknown field · 422', async () => {
    const before = await snapshot();
    const res = await author
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('attachment', boxStl(5, 5, 5), 'x.stl');
    expect(res.status).toBe(422);
    expect(await snapshot()).toEqual(before);
  });

  it('refused uploads · a data field that is not JSON · 400', async () => {
    const res = await author
      .post('/api/parts')
      .field('data', '{nope')
      .attach('model', boxStl(5, 5, 5), 'x.stl');
    expect(res.status).toBe(400);
  });

  it('refused uploads · the database write fails half-way · rows and moved files rolled back', async () => {
    const before = await snapshot();
    const spy = vi.spyOn(RevisionFile, 'create').mockRejectedValueOnce(new Error('disk full'));
    try {
      const res = await submit(author, { photos: [{ name: 'p.jpg', bytes: await jpegWithGps() }] });
      expect(res.status).toBe(500);
    } finally {
      spy.mockRestore();
    }
    expect(await snapshot()).toEqual(before);
  });
});

describe('parts · photos', () => {
  it('photos · a photo with EXIF and GPS · stored upright with all metadata removed', async () => {
    const original = await jpegWithGps(64, 48, 6);
    expect(original.includes(Buffer.from('Exif\0\0', 'latin1'))).toBe(true);
    const { body } = await submit(author, { photos: [{ name: 'gps.jpg', bytes: original }] }).expect(201);
    await t.services.parts.photosSettled();
    const part = await author.get(`/api/parts/${body.id}`);
    const photo = part.body.files.find((f: { kind: string }) => f.kind === 'photo');
    expect(photo.processing).toBe('ready');

    for (const url of [photo.displayUrl, photo.thumbnailUrl]) {
      const res = await author
        .get(url)
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
      expect(res.status).toBe(200);
      const bytes = res.body as Buffer;
      expect(bytes.includes(Buffer.from('Exif', 'latin1'))).toBe(false);
      expect(bytes.includes(Buffer.from('GPS', 'latin1'))).toBe(false);
      // EXIF orientation 6 (TIFF 6.0): stored pixels turned upright, so 64 × 48 becomes 48 × 64
      const image = await Jimp.read(bytes);
      expect([image.bitmap.width, image.bitmap.height]).toEqual([48, 64]);
    }
    // nothing raw is kept
    expect(filesOnDisk().filter((f) => f.startsWith('incoming/'))).toEqual([]);
  });

  it('photos · an undecodable photo · 422 at upload instead of a failed row', async () => {
    const before = await snapshot();
    const broken = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(200, 7)]);
    const res = await submit(author, { photos: [{ name: 'broken.jpg', bytes: broken }] });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/broken\.jpg: .*cannot/);
    expect(await snapshot()).toEqual(before);
  });
});

describe('parts · editing and revisions', () => {
  it('editing · a published part changed by someone other than its author or a moderator · 403', async () => {
    const { body } = await submit(author).expect(201);
    await publishDirectly(body.id);
    expect((await other.patch(`/api/parts/${body.id}`).send({ title: 'Hijacked' })).status).toBe(403);
    expect((await moderator.patch(`/api/parts/${body.id}`).send({ summary: 'A moderator tidied the summary text.' })).status).toBe(200);
  });

  it('editing · a published part edited · the published revision stays on the shelf until the edit is approved', async () => {
    const { body } = await submit(author, { data: submission({ title: 'Monitor yoke v1' }) }).expect(201);
    await publishDirectly(body.id);
    const edited = await author.patch(`/api/parts/${body.id}`).send({ title: 'Monitor yoke v2' });
    expect(edited.status).toBe(200);
    expect(edited.body.title).toBe('Monitor yoke v2');
    expect(edited.body.revision).toMatchObject({ number: 2, status: 'in_review' });
    expect(edited.body.status).toBe('published');

    const seenByOthers = await other.get(`/api/parts/${body.id}`);
    expect(seenByOthers.body.title).toBe('Monitor yoke v1');
    expect(seenByOthers.body.revision.number).toBe(1);

    // a second edit goes into the same pending revision
    await author.patch(`/api/parts/${body.id}`).send({ summary: 'Second change to the pending revision.' }).expect(200);
    expect(await PartRevision.count({ where: { partId: body.id } })).toBe(2);
  });

  it('editing · an unpublished revision · edited in place', async () => {
    const { body } = await submit(author).expect(201);
    await author.patch(`/api/parts/${body.id}`).send({ title: 'Renamed before review' }).expect(200);
    expect(await PartRevision.count({ where: { partId: body.id } })).toBe(1);
  });

  it('editing · an empty or invalid change · 422', async () => {
    const { body } = await submit(author).expect(201);
    expect((await author.patch(`/api/parts/${body.id}`).send({})).status).toBe(422);
    expect((await author.patch(`/api/parts/${body.id}`).send({ category: 'snacks' })).status).toBe(422);
  });

  it('editing · files added and removed · the last model stays; orphaned files leave the disk', async () => {
    const { body } = await submit(author).expect(201);
    const added = await author.post(`/api/parts/${body.id}/files`).attach('photo', await plainPng(), 'detail.png');
    expect(added.status).toBe(201);
    await t.services.parts.photosSettled();
    const photo = added.body.files.find((f: { kind: string }) => f.kind === 'photo');
    const model = added.body.files.find((f: { kind: string }) => f.kind === 'model');

    const lastModel = await author.delete(`/api/parts/${body.id}/files/${model.id}`);
    expect(lastModel.status).toBe(409);

    const stored = (await PartFile.findByPk(photo.id))!;
    expect(existsSync(join(uploadsDir, 'store', `${stored.storedName}-display.jpg`))).toBe(true);
    const removed = await author.delete(`/api/parts/${body.id}/files/${photo.id}`);
    expect(removed.status).toBe(200);
    expect(removed.body.files.some((f: { id: number }) => f.id === photo.id)).toBe(false);
    expect(await PartFile.findByPk(photo.id)).toBeNull();
    expect(existsSync(join(uploadsDir, 'store', `${stored.storedName}-display.jpg`))).toBe(false);
  });

  it('editing · a bad model added later · 422, the part as it was', async () => {
    const { body } = await submit(author).expect(201);
    const before = await snapshot();
    const res = await author.post(`/api/parts/${body.id}/files`).attach('model', Buffer.from('not a mesh at all'), 'x.stl');
    expect(res.status).toBe(422);
    expect(await snapshot()).toEqual(before);
  });
});

describe('parts · downloads', () => {
  it('downloads · published files · signed-in members only, as attachments', async () => {
    const { body } = await submit(author).expect(201);
    await publishDirectly(body.id);
    const part = await other.get(`/api/parts/${body.id}`).expect(200);
    const url = part.body.files[0].downloadUrl;
    expect((await request(t.app).get(url)).status).toBe(401);
    const res = await other.get(url);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="?bracket\.stl"?/);
    expect(res.headers['content-type']).toMatch(/model\/stl/);
  });

  it('downloads · a file of another part · 404', async () => {
    const a = await submit(author).expect(201);
    const b = await submit(author).expect(201);
    const fileOfB = (await PartFile.findOne({ where: { partId: b.body.id } }))!;
    expect((await author.get(`/api/parts/${a.body.id}/files/${fileOfB.id}/download`)).status).toBe(404);
  });
});

describe('parts · adaptations', () => {
  async function publishedWith(licence: string) {
    const { body } = await submit(author, { data: submission({ licence, title: `Parent under ${licence}` }) }).expect(201);
    await publishDirectly(body.id);
    return body.id as number;
  }

  it('adaptations · of a No-Derivatives part · refused (CC BY-ND 4.0 §2(a)(1)(B))', async () => {
    const parent = await publishedWith('CC-BY-ND-4.0');
    const res = await submit(other, { data: submission({ parentId: parent, licence: 'CC-BY-ND-4.0' }) });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.licence).toBeDefined();
  });

  it('adaptations · of a ShareAlike part · must keep BY-SA (CC BY-SA 4.0 §3(b)); the lineage is recorded', async () => {
    const parent = await publishedWith('CC-BY-SA-4.0');
    const wrong = await submit(other, { data: submission({ parentId: parent, licence: 'CC-BY-4.0' }) });
    expect(wrong.status).toBe(422);
    const right = await submit(other, { data: submission({ parentId: parent, licence: 'CC-BY-SA-4.0', title: 'Adapted bracket' }) });
    expect(right.status).toBe(201);
    const child = await other.get(`/api/parts/${right.body.id}`);
    expect(child.body.lineage.parent).toMatchObject({ id: parent, licence: { id: 'CC-BY-SA-4.0' } });
    await publishDirectly(right.body.id);
    const parentPage = await other.get(`/api/parts/${parent}`);
    expect(parentPage.body.lineage.adaptations.map((a: { id: number }) => a.id)).toContain(right.body.id);
  });

  it('adaptations · a parent not on the shelf · refused', async () => {
    const { body } = await submit(author).expect(201);
    const res = await submit(other, { data: submission({ parentId: body.id }) });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.parentId).toMatch(/not on the shelf/);
  });
});

describe('parts · lists, vocabulary and recovery', () => {
  it('lists · mine and the catalogue · my submissions in any state, only published parts in the catalogue', async () => {
    const mine = await submit(other, { data: submission({ title: 'Only mine for now' }) }).expect(201);
    const list = await other.get('/api/parts?mine=1');
    expect(list.body.items.some((p: { id: number; status: string }) => p.id === mine.body.id && p.status === 'in_review')).toBe(true);
    const shelf = await request(t.app).get('/api/parts');
    expect(shelf.body.items.every((p: { status: string }) => p.status === 'published')).toBe(true);
    expect(shelf.body.items.some((p: { id: number }) => p.id === mine.body.id)).toBe(false);
  });

  it('vocabularies · requested · served', async () => {
    const res = await request(t.app).get('/api/vocab').expect(200);
    expect(res.body.categories.length).toBeGreaterThanOrEqual(8);
    expect(res.body.mounts.map((m: { slug: string }) => m.slug)).toContain('screw-1-4-20');
    expect(res.body.bodies.map((b: { slug: string }) => b.slug)).toContain('korvel-kx8');
    expect(res.body.materials.map((m: { id: string }) => m.id)).toContain('PETG');
    expect(res.body.licences).toHaveLength(12);
  });

  it('start-up sweep · files a crash left behind · removed; those in use kept', async () => {
    const { body } = await submit(author).expect(201);
    const kept = (await PartFile.findOne({ where: { partId: body.id } }))!;
    writeFileSync(join(uploadsDir, 'tmp', 'half-written.upload'), 'x');
    writeFileSync(join(uploadsDir, 'store', 'deadbeefdeadbeefdeadbeefdeadbeef.stl'), 'x');
    writeFileSync(join(uploadsDir, 'incoming', 'nobody-waits-for-me'), 'x');
    const result = await t.services.parts.recover();
    expect(result.removed).toBe(3);
    expect(existsSync(join(uploadsDir, 'store', kept.storedName))).toBe(true);
    expect(filesOnDisk()).not.toContain('tmp/half-written.upload');
  });
});
