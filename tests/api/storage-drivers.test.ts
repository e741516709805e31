// The storage interface's contract, run against both drivers: local disk and S3 (the s3rver fake).
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import express from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorHandler } from '../../server/errors';
import { createLocalStorage } from '../../server/modules/files/storage-local';
import { createS3Storage } from '../../server/modules/files/storage-s3';
import { MissingObjectError, randomStoredName, type FileStorage } from '../../server/modules/files/storage';
import type { S3Fake } from '../../server/scripts/s3-fake';
import { startTestS3 } from '../helpers/s3';

const root = mkdtempSync(join(tmpdir(), 'rigshelf-storage-'));
let fake: S3Fake;
const drivers: Record<'local' | 's3', FileStorage> = {} as never;

beforeAll(async () => {
  fake = await startTestS3();
  drivers.local = createLocalStorage(join(root, 'local'));
  drivers.s3 = createS3Storage({
    endpoint: fake.endpoint,
    bucket: fake.bucket,
    region: 'us-east-1',
    accessKeyId: fake.env.S3_ACCESS_KEY_ID,
    secretAccessKey: fake.env.S3_SECRET_ACCESS_KEY,
    forcePathStyle: true,
    tmp: createLocalStorage(join(root, 's3-local')).tmp,
  });
});
afterAll(async () => {
  drivers.local?.close();
  drivers.s3?.close();
  await fake?.close();
  rmSync(root, { recursive: true, force: true });
});

const text = async (s: Readable) => {
  const chunks: Buffer[] = [];
  for await (const c of s) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString();
};
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

/** A file in the driver's temp folder, as multer leaves an upload. */
function upload(storage: FileStorage, bytes: Buffer | string): string {
  const path = join(storage.tmp, randomStoredName('.upload'));
  writeFileSync(path, bytes);
  return path;
}

/** An app that serves one key after no check at all, through the real error handler. */
function serving(storage: FileStorage) {
  const app = express();
  app.get('/file/:name', async (req, res) => {
    res.type('image/jpeg');
    await storage.send(req, res, `store/${req.params.name}`);
  });
  app.use(errorHandler());
  return app;
}

describe.each(['local', 's3'] as const)('storage · %s driver', (driver) => {
  const s = () => drivers[driver];

  it('storage driver · put, get and exists · a stored object reads back byte for byte; a missing one is null / false', async () => {
    await s().put('store/a1', 'hello shelf');
    expect((await s().get('store/a1'))?.toString()).toBe('hello shelf');
    expect(await s().exists('store/a1')).toBe(true);
    expect(await s().get('store/nothing-here')).toBeNull();
    expect(await s().exists('store/nothing-here')).toBe(false);
  });

  it('storage driver · putFile · a 12 MB file (multipart on S3: 8 MB parts) arrives whole and the local file stays', async () => {
    const bytes = Buffer.alloc(12 * 1024 * 1024);
    for (let i = 0; i < bytes.length; i += 4096) bytes[i] = i % 251;
    const path = upload(s(), bytes);
    await s().putFile('store/big', path);
    expect(sha((await s().get('store/big'))!)).toBe(sha(bytes));
    expect(existsSync(path)).toBe(true);
    await s().remove(['store/big']);
  });

  it('storage driver · stream · whole, and a byte range (end inclusive, as HTTP ranges count); a missing object throws MissingObjectError', async () => {
    await s().put('store/s1', '0123456789');
    expect(await text(await s().stream('store/s1'))).toBe('0123456789');
    expect(await text(await s().stream('store/s1', { start: 2, end: 4 }))).toBe('234');
    expect(await text(await s().stream('store/s1', { start: 7 }))).toBe('789');
    await expect(s().stream('store/gone')).rejects.toBeInstanceOf(MissingObjectError);
  });

  it('storage driver · list · objects under a prefix with their sizes, nothing from the other area', async () => {
    await s().put('incoming/l1', 'raw');
    await s().put('store/l1-display.jpg', 'xy');
    await s().put('store/l1-thumb.jpg', 'x');
    const store = await s().list('store/l1');
    expect(store.map((o) => [o.key, o.size]).sort()).toEqual([
      ['store/l1-display.jpg', 2],
      ['store/l1-thumb.jpg', 1],
    ]);
    expect(store.every((o) => o.modified instanceof Date && Math.abs(Date.now() - o.modified.getTime()) < 10 * 60_000)).toBe(true);
    expect((await s().list('incoming/')).map((o) => o.key)).toContain('incoming/l1');
    expect((await s().list('incoming/')).map((o) => o.key)).not.toContain('store/l1-thumb.jpg');
  });

  it('storage driver · move · the object is under its new key only; moving a missing one throws MissingObjectError', async () => {
    await s().put('incoming/m1', 'moving');
    await s().move('incoming/m1', 'store/m1');
    expect(await s().exists('incoming/m1')).toBe(false);
    expect((await s().get('store/m1'))?.toString()).toBe('moving');
    await expect(s().move('incoming/m-missing', 'store/m2')).rejects.toBeInstanceOf(MissingObjectError);
  });

  it('storage driver · remove · several at once, a missing key included, without error', async () => {
    await s().put('store/r1', '1');
    await s().put('store/r2', '2');
    await s().remove(['store/r1', 'store/r2', 'store/r-never']);
    expect(await s().exists('store/r1')).toBe(false);
    expect(await s().exists('store/r2')).toBe(false);
    await s().remove([]);
  });

  it('storage driver · localCopy · a local file with the bytes for a worker, dropped on release unless it is the stored file itself', async () => {
    await s().put('store/c1', 'model bytes');
    const copy = await s().localCopy('store/c1');
    expect(readFileSync(copy.path, 'utf8')).toBe('model bytes');
    await copy.release();
    expect(existsSync(copy.path)).toBe(driver === 'local');
    await expect(s().localCopy('store/c-missing')).rejects.toBeInstanceOf(MissingObjectError);
  });

  it('storage driver · localOutput · saved output becomes the object; discarded output leaves nothing', async () => {
    const kept = s().localOutput('store/o1-display.jpg');
    writeFileSync(kept.path, 'picture');
    await kept.save();
    await kept.discard();
    expect((await s().get('store/o1-display.jpg'))?.toString()).toBe('picture');
    const dropped = s().localOutput('store/o2-display.jpg');
    writeFileSync(dropped.path, 'half');
    await dropped.discard();
    expect(await s().exists('store/o2-display.jpg')).toBe(false);
    expect(existsSync(dropped.path)).toBe(false);
  });

  it('storage driver · placeUploads · places every upload; undo takes them out and the temp files are there to place again', async () => {
    const a = upload(s(), 'model a');
    const b = upload(s(), 'photo b');
    const placed = await s().placeUploads([
      { from: a, key: 'store/p1' },
      { from: b, key: 'incoming/p2' },
    ]);
    expect((await s().get('store/p1'))?.toString()).toBe('model a');
    expect((await s().get('incoming/p2'))?.toString()).toBe('photo b');
    await placed.undo();
    expect(await s().exists('store/p1')).toBe(false);
    expect(await s().exists('incoming/p2')).toBe(false);
    expect(readFileSync(a, 'utf8')).toBe('model a');
    expect(readFileSync(b, 'utf8')).toBe('photo b');
  });

  it('storage driver · placeUploads · one that fails (its temp file is gone) takes the others out again and throws', async () => {
    const a = upload(s(), 'first');
    await expect(
      s().placeUploads([
        { from: a, key: 'store/f1' },
        { from: join(s().tmp, 'never-written.upload'), key: 'store/f2' },
      ]),
    ).rejects.toThrow();
    expect(await s().exists('store/f1')).toBe(false);
    expect(await s().exists('store/f2')).toBe(false);
  });

  it('storage driver · keys · anything but incoming/<name> or store/<name> is refused before touching storage', async () => {
    await expect(s().get('../etc/passwd')).rejects.toThrow(/not a storage key/);
    await expect(s().put('store/../x', 'x')).rejects.toThrow(/not a storage key/);
    await expect(s().remove(['tmp/x'])).rejects.toThrow(/not a storage key/);
  });

  it('storage driver · send · 200 with length and ETag, 206 for a range, 304 for a matching ETag or an unchanged date, 404 JSON for a missing object', async () => {
    await s().put('store/w1.jpg', 'abcdefghij');
    const app = serving(s());
    const whole = await request(app).get('/file/w1.jpg').expect(200);
    expect(whole.headers['content-length']).toBe('10');
    expect(whole.headers['content-type']).toBe('image/jpeg');
    expect(whole.headers.etag).toBeTruthy();
    expect(whole.headers['accept-ranges']).toBe('bytes');
    const part = await request(app).get('/file/w1.jpg').set('Range', 'bytes=2-5').expect(206);
    expect(part.headers['content-range']).toBe('bytes 2-5/10');
    expect(Buffer.from(part.body).toString()).toBe('cdef');
    await request(app).get('/file/w1.jpg').set('If-None-Match', whole.headers.etag).expect(304);
    await request(app).get('/file/w1.jpg').set('If-Modified-Since', whole.headers['last-modified']).expect(304);
    await request(app).get('/file/w1.jpg').set('If-Modified-Since', 'not a date').expect(200);
    const missing = await request(app).get('/file/w-missing.jpg').expect(404);
    expect(missing.body.error.code).toBe('not_found');
  });
});

describe('storage · s3 driver when the store is away', () => {
  it('storage driver · a stopped object store · answers a clean 503 with a message, not a 500 or a hang', async () => {
    const away = createS3Storage({
      endpoint: 'http://127.0.0.1:9', // discard port: nothing listens there
      bucket: 'nowhere',
      region: 'us-east-1',
      accessKeyId: 'x',
      secretAccessKey: 'y',
      forcePathStyle: true,
      tmp: root,
    });
    try {
      const res = await request(serving(away)).get('/file/x.jpg');
      expect(res.status).toBe(503);
      expect(res.body.error).toEqual({ code: 'storage_unavailable', message: expect.stringMatching(/Try again/) });
    } finally {
      away.close();
    }
  });
});
