// The whole app with STORAGE=s3 against the local S3 fake: uploads, photo cleaning, model pictures,
// serving through the permission checks, refusals, roll-backs and the start-up sweep.
import { readdirSync } from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { Jimp } from 'jimp';
import { Part, PartFile, PartRevision, RevisionFile } from '../../server/db/models';
import { sweepUploads } from '../../server/modules/parts/part-files';
import type { S3Fake } from '../../server/scripts/s3-fake';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { publishDirectly, seedBodies, submission } from '../helpers/parts';
import { jpegWithGps, plainPng, truncatedJpeg } from '../helpers/photos';
import { startTestS3 } from '../helpers/s3';

let fake: S3Fake;
let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;
let author: Agent;
let member: Agent;
let moderator: Agent;

async function signedIn(role: 'member' | 'moderator' = 'member') {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return a;
}

beforeAll(async () => {
  fake = await startTestS3();
  // model pictures on: they are stored objects too (a second of CPU per model; few models here)
  t = await createTestApp({ ...fake.env, STORAGE_SWEEP_MIN_AGE_S: '0', MODEL_PICTURES: '1' });
  await seedBodies();
  author = await signedIn();
  member = await signedIn();
  moderator = await signedIn('moderator');
});
afterAll(async () => {
  await t?.close();
  await fake?.close();
});

const storage = () => t.services.storage;
const objects = async () => [...(await storage().list('incoming/')), ...(await storage().list('store/'))].map((o) => o.key).sort();
const tmpFiles = () => readdirSync(storage().tmp);
async function settled() {
  await t.services.parts.photosSettled();
  await t.services.parts.rendersSettled();
}

function binary(req: request.Test) {
  return req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

function submit(a: Agent, title: string, files: { model?: Buffer; photo?: Buffer; photoName?: string } = {}) {
  let req = a
    .post('/api/parts')
    .field('data', JSON.stringify(submission({ title })))
    .attach('model', files.model ?? boxStl(20, 30, 10), 'bracket.stl');
  if (files.photo) req = req.attach('photo', files.photo, files.photoName ?? 'on-the-rig.jpg');
  return req;
}

async function filesOf(a: Agent, partId: number) {
  const page = await a.get(`/api/parts/${partId}`).expect(200);
  type F = { id: number; kind: string; downloadUrl: string; thumbnailUrl: string | null; displayUrl: string | null };
  const files = page.body.files as F[];
  return { model: files.find((f) => f.kind === 'model')!, photo: files.find((f) => f.kind === 'photo'), all: files };
}

// a model picture takes seconds of CPU on a loaded machine: these wait for them
describe('s3 storage · a part with a model and a photo', { timeout: 180_000 }, () => {
  let partId: number;
  const model = boxStl(24, 30, 12);

  it('s3 storage · upload · 201; the model, the cleaned photo sizes and the model pictures are objects; the raw photo and temp files are gone', async () => {
    const res = await submit(author, 'Bracket kept in a bucket', { model, photo: await jpegWithGps(64, 48) }).expect(201);
    partId = res.body.id;
    await settled();
    const rows = await PartFile.findAll({ where: { partId } });
    const m = rows.find((r) => r.kind === 'model')!;
    const p = rows.find((r) => r.kind === 'photo')!;
    expect(p.processing).toBe('ready');
    expect(m.renderStatus).toBe('ready');
    const keys = await objects();
    for (const k of [
      `store/${m.storedName}`,
      `store/${m.storedName}-display.jpg`,
      `store/${m.storedName}-thumb.jpg`,
      `store/${p.storedName}-display.jpg`,
      `store/${p.storedName}-thumb.jpg`,
    ]) {
      expect(keys).toContain(k);
    }
    expect(keys).not.toContain(`incoming/${p.storedName}`);
    expect(tmpFiles()).toEqual([]);
  });

  it('s3 storage · photo · cleaned upright (EXIF orientation 6 turns 64 × 48 into 48 × 64) with its metadata gone, served as JPEG', async () => {
    const { photo } = await filesOf(author, partId);
    const res = await binary(author.get(photo!.displayUrl!)).expect(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    const image = await Jimp.read(res.body as Buffer);
    expect([image.bitmap.width, image.bitmap.height]).toEqual([48, 64]);
    expect((res.body as Buffer).includes(Buffer.from('Exif'))).toBe(false);
  });

  it('s3 storage · serving · in review only the author and moderators get files; others 404, visitors 401 for downloads', async () => {
    const { model: m, photo } = await filesOf(author, partId);
    const mine = await binary(author.get(m.downloadUrl)).expect(200);
    expect(Buffer.compare(mine.body as Buffer, model)).toBe(0);
    expect(mine.headers['content-disposition']).toBe('attachment; filename=bracket.stl');
    expect(mine.headers['content-length']).toBe(String(model.length));
    await moderator.get(m.downloadUrl).expect(200);
    await member.get(m.downloadUrl).expect(404);
    await member.get(photo!.thumbnailUrl!).expect(404);
    await request(t.app).get(m.downloadUrl).expect(401);
  });

  it('s3 storage · serving · once published, members download it, with byte ranges (RFC 9110 §14) and a 304 for a known ETag', async () => {
    await publishDirectly(partId);
    const { model: m } = await filesOf(member, partId);
    const whole = await binary(member.get(m.downloadUrl)).expect(200);
    expect(whole.headers.etag).toBeTruthy();
    const range = await binary(member.get(m.downloadUrl).set('Range', 'bytes=80-83')).expect(206);
    expect(range.headers['content-range']).toBe(`bytes 80-83/${model.length}`);
    expect(Buffer.compare(range.body as Buffer, model.subarray(80, 84))).toBe(0);
    await member.get(m.downloadUrl).set('If-None-Match', whole.headers.etag).expect(304);
    const picture = await member.get(m.displayUrl!).expect(200);
    expect(picture.headers['content-type']).toBe('image/jpeg');
  });

  it('s3 storage · retired · the page and photos stay; the model goes to its author and moderators only (404 for others)', async () => {
    await Part.update({ status: 'retired' }, { where: { id: partId } });
    const { model: m, photo } = await filesOf(member, partId);
    await member.get(m.downloadUrl).expect(404);
    await member.get(photo!.thumbnailUrl!).expect(200);
    await author.get(m.downloadUrl).expect(200);
    await moderator.get(m.downloadUrl).expect(200);
  });
});

describe('s3 storage · nothing left behind', { timeout: 180_000 }, () => {
  // pictures still being drawn for earlier parts would show up between the snapshots
  beforeEach(settled);

  it('s3 storage · refused upload · a cut-off JPEG is refused with 422 and leaves no object and no temp file', async () => {
    const before = await objects();
    const res = await submit(author, 'Refused bracket', { photo: await truncatedJpeg(), photoName: 'cut.jpg' });
    expect(res.status).toBe(422);
    expect(await objects()).toEqual(before);
    expect(tmpFiles()).toEqual([]);
  });

  it('s3 storage · refused upload · an empty model is refused with 422 and leaves no object', async () => {
    const before = await objects();
    const res = await submit(author, 'Empty bracket', { model: Buffer.alloc(0) });
    expect(res.status).toBe(422);
    expect(await objects()).toEqual(before);
  });

  it('s3 storage · roll-back · a write that fails half-way (500) takes its placed objects out of the bucket', async () => {
    const before = await objects();
    const rows = await PartFile.count();
    const spy = vi.spyOn(RevisionFile, 'create').mockRejectedValueOnce(new Error('disk full'));
    try {
      const res = await submit(author, 'Half-written bracket', { photo: await plainPng() });
      expect(res.status).toBe(500);
    } finally {
      spy.mockRestore();
    }
    await settled();
    expect(await PartFile.count()).toBe(rows);
    expect(await objects()).toEqual(before);
    expect(tmpFiles()).toEqual([]);
  });

  it('s3 storage · a deadlock on the first attempt (MariaDB 1213) · the objects placed before the write serve the retry; each row has exactly its objects', async () => {
    const deadlock = Object.assign(new Error('Deadlock found when trying to get lock; try restarting transaction'), { errno: 1213, sqlState: '40001' });
    const spy = vi.spyOn(RevisionFile, 'create').mockRejectedValueOnce(deadlock);
    let id: number;
    try {
      id = (await submit(author, 'Retried bracket', { photo: await plainPng() }).expect(201)).body.id;
    } finally {
      spy.mockRestore();
    }
    await settled();
    const rows = await PartFile.findAll({ where: { partId: id } });
    expect(rows).toHaveLength(2);
    const known = new Set((await PartFile.findAll({ attributes: ['storedName'] })).map((r) => r.storedName));
    const unclaimed = (await objects()).filter((k) => !known.has(k.replace(/^(incoming|store)\//, '').replace(/-(display|thumb)\.jpg$/, '')));
    expect(unclaimed).toEqual([]);
    expect(tmpFiles()).toEqual([]);
  });

  it('s3 storage · removing a file · a second model removed from a part takes its object and pictures with it', async () => {
    const id = (await submit(author, 'Bracket with a spare model').expect(201)).body.id;
    await author
      .post(`/api/parts/${id}/files`)
      .attach('model', boxStl(10, 10, 10), 'spare.stl')
      .expect(201);
    await settled();
    const spare = (await PartFile.findAll({ where: { partId: id, kind: 'model' } })).find((r) => r.originalName === 'spare.stl')!;
    expect(await objects()).toContain(`store/${spare.storedName}-thumb.jpg`);
    await author.delete(`/api/parts/${id}/files/${spare.id}`).expect(200);
    expect((await objects()).filter((k) => k.includes(spare.storedName))).toEqual([]);
  });
});

describe('s3 storage · start-up sweep', { timeout: 180_000 }, () => {
  it('s3 storage · start-up sweep · objects without rows are removed and those with rows kept; young objects wait out the grace time', async () => {
    await settled();
    const kept = (await PartFile.findOne({ where: { kind: 'model' } }))!;
    await storage().put('store/deadbeefdeadbeefdeadbeefdeadbeef.stl', 'x');
    await storage().put('incoming/nobody-waits-for-me', 'x');
    // with the grace time s3 has by default, another instance's upload about to commit is safe
    const young = await sweepUploads(storage(), { minAgeMs: 600_000 });
    expect(young.removed).toBe(0);
    expect(await objects()).toContain('store/deadbeefdeadbeefdeadbeefdeadbeef.stl');
    const { removed } = await t.services.parts.recover();
    expect(removed).toBe(2);
    const keys = await objects();
    expect(keys).not.toContain('store/deadbeefdeadbeefdeadbeefdeadbeef.stl');
    expect(keys).not.toContain('incoming/nobody-waits-for-me');
    expect(keys).toContain(`store/${kept.storedName}`);
  });
});

describe('s3 storage · a submission sent again', { timeout: 180_000 }, () => {
  it('s3 storage · the same submission twice with one Idempotency-Key (its answer was lost) · one part with its objects once; the repeat leaves no object or temp file', async () => {
    await settled();
    const before = await objects();
    const key = 'submission-retry-0001';
    const title = 'Bracket sent twice';
    const first = await submit(author, title, { photo: await plainPng() })
      .set('Idempotency-Key', key)
      .expect(201);
    await settled();
    const afterFirst = await objects();
    const again = await submit(author, title, { photo: await plainPng() })
      .set('Idempotency-Key', key)
      .expect(201);
    await settled();
    expect(again.body).toEqual(first.body);
    expect(await PartRevision.count({ where: { title } })).toBe(1);
    expect(afterFirst.length).toBeGreaterThan(before.length);
    expect(await objects()).toEqual(afterFirst);
    expect(tmpFiles()).toEqual([]);
  });
});

describe('s3 storage · long listings', { timeout: 180_000 }, () => {
  // Amazon S3 API Reference, ListObjectsV2: "returns some or all (up to 1,000) of the objects in a bucket";
  // the rest come back through NextContinuationToken
  it('s3 storage · listing more than one page (S3 answers at most 1000 keys a page) · every key comes back through the continuation token', async () => {
    const keys = Array.from({ length: 1001 }, (_, i) => `incoming/page-test-${String(i).padStart(4, '0')}`);
    for (let i = 0; i < keys.length; i += 50) await Promise.all(keys.slice(i, i + 50).map((k) => storage().put(k, 'x')));
    try {
      const listed = (await storage().list('incoming/page-test-')).map((o) => o.key).sort();
      expect(listed).toEqual(keys);
    } finally {
      await storage().remove(keys);
    }
  });
});

describe('s3 storage · set report and wanted photos', { timeout: 180_000 }, () => {
  it('s3 storage · a set report photo · is cleaned into the bucket and served to members', async () => {
    const id = (await submit(author, 'Reported bracket').expect(201)).body.id;
    await moderator.post(`/api/review/${id}/approve`).send({}).expect(200);
    const res = await member
      .post(`/api/parts/${id}/reports`)
      .field('data', JSON.stringify({ production: 'The Salt Road', daysInUse: 3, outcome: 'held-up', material: 'PETG', infillPct: 30, walls: 4 }))
      .attach('photo', await plainPng(), 'rig.png')
      .expect(201);
    await settled();
    const list = await member.get(`/api/parts/${id}/reports`).expect(200);
    const mine = list.body.items.find((i: { id: number }) => i.id === res.body.id);
    const photo = await member.get(mine.photos[0].displayUrl).expect(200);
    expect(photo.headers['content-type']).toBe('image/jpeg');
    expect((await objects()).filter((k) => k.startsWith('incoming/'))).toEqual([]);
  });

  it('s3 storage · a wanted request sketch · is cleaned into the bucket and served as a thumbnail', async () => {
    const res = await member
      .post('/api/wanted')
      .field(
        'data',
        JSON.stringify({ title: 'Sketch: cable clamp for a 19 mm rod', details: 'Holds two SDI cables on a 19 mm rod.', mounts: [], keySizes: [] }),
      )
      .attach('photo', await plainPng(), 'sketch.png')
      .expect(201);
    await settled();
    const d = (await author.get(`/api/wanted/${res.body.id}`).expect(200)).body;
    expect(d.photos[0].processing).toBe('ready');
    const img = await author.get(d.photos[0].thumbnailUrl).expect(200);
    expect(img.headers['content-type']).toBe('image/jpeg');
  });
});
