// A start while the object store is away: the shelf serves anyway, and the start-up sweep it could
// not do runs once the store answers again.
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { startServer, type RunningServer } from '../../server/index';
import { startS3Fake, type S3Fake } from '../../server/scripts/s3-fake';
import { testConfig } from '../helpers/app';
import { sleep } from '../helpers/system';

async function freePort(): Promise<number> {
  const probe = createServer();
  await new Promise<void>((done) => probe.listen(0, '127.0.0.1', done));
  const { port } = probe.address() as { port: number };
  await new Promise((done) => probe.close(done));
  return port;
}

const dir = mkdtempSync(join(tmpdir(), 'rigshelf-s3-away-'));
let server: RunningServer | undefined;
let fake: S3Fake | undefined;
afterAll(async () => {
  await server?.close();
  await fake?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('start-up · file store away', { timeout: 180_000 }, () => {
  it('start-up · the object store does not answer · the shelf starts and serves; the sweep runs once the store is back', async () => {
    const port = await freePort();
    const lines: string[] = [];
    const keep = (...args: unknown[]) => void lines.push(args.map(String).join(' '));
    const log = vi.spyOn(console, 'log').mockImplementation(keep);
    const error = vi.spyOn(console, 'error').mockImplementation(keep);
    try {
      server = await startServer(
        testConfig({
          PORT: '0',
          RIGSHELF_DEMO: '0',
          INSTANCE_ID: 'store-away',
          JOB_LEASE_S: '3',
          STORAGE: 's3',
          S3_ENDPOINT: `http://127.0.0.1:${port}`,
          S3_BUCKET: 'rigshelf-away',
          S3_ACCESS_KEY_ID: 'S3RVER',
          S3_SECRET_ACCESS_KEY: 'S3RVER',
        }),
      );
      expect(lines.some((l) => l.startsWith('rigshelf: start-up sweep could not finish'))).toBe(true);
      const health = await fetch(`${server.url}/api/health`);
      expect(health.status).toBe(200);

      fake = await startS3Fake({ port, dir, bucket: 'rigshelf-away' });
      const until = Date.now() + 120_000;
      while (!lines.some((l) => l.startsWith('rigshelf: startup-sweep done')) && Date.now() < until) await sleep(200);
      expect(lines.filter((l) => l.startsWith('rigshelf: startup-sweep done'))).toHaveLength(1);
    } finally {
      log.mockRestore();
      error.mockRestore();
    }
  });
});
