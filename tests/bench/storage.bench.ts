/**
 * The two storage drivers side by side: placing an accepted upload, fetching it back as a local
 * copy for a worker, and serving it through the app (Express, as the download route does).
 *
 *   npm run bench:storage [-- --mb 40 --runs 5]
 *
 * S3 here is the s3rver fake on loopback, so its figures are the cost of the SDK, HTTP and the
 * fake's own disk writes, not of a real object store across a network. The machine's load average
 * is printed first: other work on a shared machine skews every figure.
 */
import { mkdtempSync, rmSync, writeFileSync, copyFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import express from 'express';
import request from 'supertest';
import { createLocalStorage } from '../../server/modules/files/storage-local';
import { createS3Storage } from '../../server/modules/files/storage-s3';
import { randomStoredName, type FileStorage } from '../../server/modules/files/storage';
import { startS3Fake } from '../../server/scripts/s3-fake';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const megabytes = arg('mb', 40);
const runs = arg('runs', 5);

const root = mkdtempSync(join(tmpdir(), 'rigshelf-bench-storage-'));
const fake = await startS3Fake({ port: 0, dir: join(root, 's3'), bucket: 'bench' });
const drivers: [string, FileStorage][] = [
  ['local', createLocalStorage(join(root, 'local'))],
  [
    's3 (s3rver)',
    createS3Storage({
      endpoint: fake.endpoint,
      bucket: fake.bucket,
      region: 'us-east-1',
      accessKeyId: fake.env.S3_ACCESS_KEY_ID,
      secretAccessKey: fake.env.S3_SECRET_ACCESS_KEY,
      forcePathStyle: true,
      tmp: createLocalStorage(join(root, 's3-local')).tmp,
    }),
  ],
];

const source = join(root, 'model.bin');
const bytes = Buffer.alloc(megabytes * 1024 * 1024);
for (let i = 0; i < bytes.length; i += 997) bytes[i] = i % 253;
writeFileSync(source, bytes);

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const time = async (fn: () => Promise<unknown>) => {
  const t0 = performance.now();
  await fn();
  return performance.now() - t0;
};

console.log(
  `load average ${loadavg()
    .map((l) => l.toFixed(1))
    .join(' ')}; ${megabytes} MB file, median of ${runs} runs`,
);
console.log('driver         place upload   local copy   serve (GET)   MB/s served');
for (const [name, storage] of drivers) {
  const app = express();
  app.get('/f/:name', async (req, res) => {
    res.type('application/octet-stream');
    await storage.send(req, res, `store/${req.params.name}`);
  });
  const place: number[] = [];
  const copy: number[] = [];
  const serve: number[] = [];
  for (let r = 0; r < runs; r++) {
    const name = randomStoredName('.stl');
    const upload = join(storage.tmp, randomStoredName('.upload'));
    copyFileSync(source, upload);
    place.push(await time(() => storage.placeUploads([{ from: upload, key: `store/${name}` }])));
    rmSync(upload, { force: true });
    copy.push(
      await time(async () => {
        const c = await storage.localCopy(`store/${name}`);
        await c.release();
      }),
    );
    serve.push(
      await time(async () => {
        const res = await request(app)
          .get(`/f/${name}`)
          .buffer(true)
          .parse((r, cb) => {
            let n = 0;
            r.on('data', (c: Buffer) => (n += c.length));
            r.on('end', () => cb(null, n));
          });
        if (res.body !== bytes.length) throw new Error(`served ${res.body} bytes of ${bytes.length}`);
      }),
    );
    await storage.remove([`store/${name}`]);
  }
  const ms = (x: number) => `${x.toFixed(0).padStart(8)} ms`;
  console.log(
    `${name.padEnd(14)}${ms(median(place))}  ${ms(median(copy))}  ${ms(median(serve))}   ${(megabytes / (median(serve) / 1000)).toFixed(0).padStart(8)}`,
  );
  storage.close();
}
await fake.close();
rmSync(root, { recursive: true, force: true });
