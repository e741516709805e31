// Stops and restarts a MariaDB of this file's own (not the shared test instance) to watch
// /api/health follow the database down and back up.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PrivateMariaDb } from '../../server/scripts/mariadb';
import { createTestApp, type TestApp } from '../helpers/app';

const dir = mkdtempSync(join(tmpdir(), 'rigshelf-health-'));
const port = 3400 + (process.pid % 500);
const db = new PrivateMariaDb({ dir, port });
let t: TestApp;

beforeAll(async () => {
  await db.start();
  await db.provision({ database: 'health_check', user: 'rigshelf', password: process.env.DB_PASSWORD! });
  t = await createTestApp({ DB_PORT: String(port), DB_NAME: 'health_check' });
});

afterAll(async () => {
  await t?.close();
  await db.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe('GET /api/health', () => {
  it('GET /api/health · database stopped, then back · up, down, then up again by itself', async () => {
    const up = await request(t.app).get('/api/health');
    expect(up.status).toBe(200);
    expect(up.body).toEqual({ status: 'ok', db: 'up' });

    await db.stop();
    const down = await request(t.app).get('/api/health');
    expect(down.status).toBe(503);
    expect(down.body).toEqual({ status: 'degraded', db: 'down' });

    await db.start();
    const back = await request(t.app).get('/api/health');
    expect(back.status).toBe(200);
    expect(back.body).toEqual({ status: 'ok', db: 'up' });
  });
});
