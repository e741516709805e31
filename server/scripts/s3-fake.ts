// A local S3-compatible object store (s3rver) for tests, `npm run cluster` and trying STORAGE=s3 by
// hand: one bucket, objects kept as files under `dir`, loopback only, the fake's fixed key pair.
//   node --import tsx server/scripts/s3-fake.ts --port 3425 --dir var/s3 --bucket rigshelf
// prints the STORAGE/S3_* settings that point the app at it, and stops on Ctrl-C.
import { mkdirSync } from 'node:fs';
import type { Server } from 'node:http';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import S3rver from 's3rver';

export interface S3Fake {
  endpoint: string;
  bucket: string;
  port: number;
  /** The settings that point the app at this fake (STORAGE=s3 and the S3_* variables). */
  env: Record<string, string>;
  close(): Promise<void>;
}

/** s3rver signs with one fixed account; any other key is refused. */
export const S3_FAKE_KEY = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

/** Starts the fake on 127.0.0.1:`port` (0 picks a free one) with `bucket` made if missing; objects live under `dir`. */
export async function startS3Fake(options: { port: number; dir: string; bucket?: string; host?: string }): Promise<S3Fake> {
  const bucket = options.bucket ?? 'rigshelf';
  const host = options.host ?? '127.0.0.1';
  mkdirSync(options.dir, { recursive: true });
  const server = new S3rver({
    address: host,
    port: options.port,
    silent: true,
    directory: resolve(options.dir),
    // buckets by path only (http://host/bucket/key), as S3_FORCE_PATH_STYLE=1 sends them
    vhostBuckets: false,
    configureBuckets: [{ name: bucket }],
  });
  const address = await server.run();
  const endpoint = `http://${host}:${address.port}`;
  let closed = false;
  return {
    endpoint,
    bucket,
    port: address.port,
    env: {
      STORAGE: 's3',
      S3_ENDPOINT: endpoint,
      S3_BUCKET: bucket,
      S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: S3_FAKE_KEY.accessKeyId,
      S3_SECRET_ACCESS_KEY: S3_FAKE_KEY.secretAccessKey,
      S3_FORCE_PATH_STYLE: '1',
    },
    async close() {
      if (closed) return;
      closed = true;
      const closing = server.close();
      // the clients' kept-alive sockets would go on being served, and close() would wait for them
      (server as unknown as { httpServer?: Server }).httpServer?.closeAllConnections();
      await closing;
    },
  };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const { values } = parseArgs({
    options: { port: { type: 'string', default: '3425' }, dir: { type: 'string', default: 'var/s3' }, bucket: { type: 'string', default: 'rigshelf' } },
  });
  const fake = await startS3Fake({ port: Number(values.port), dir: values.dir!, bucket: values.bucket });
  console.log(`S3 fake on ${fake.endpoint}, bucket ${fake.bucket}, objects under ${resolve(values.dir!)}`);
  console.log(
    Object.entries(fake.env)
      .map(([k, v]) => `${k}=${v}`)
      .join(' '),
  );
  const stop = () => void fake.close().then(() => process.exit(0));
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}
