// Several app instances on one database: two apps built over this file's database stand in for two
// instances behind a balancer (each with its own INSTANCE_ID, search worker, job loop and outbox).
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { PartFile } from '../../server/db/models';
import { loadConfig } from '../../server/config';
import { migrate, withSchemaLock } from '../../server/db/migrator';
import { createSequelize } from '../../server/db/sequelize';
import { createJobRunner } from '../../server/modules/jobs/runner';
import { agentFor, createTestApp, makeUser, testConfig, uploadsDir, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { jpegWithGps } from '../helpers/photos';
import { seedBodies, submission } from '../helpers/parts';

let a: TestApp;
let b: TestApp;

beforeAll(async () => {
  a = await createTestApp({ INSTANCE_ID: 'instance-a', LOGIN_LIMIT_PER_IP: '10000', LOGIN_LIMIT_PER_ACCOUNT: '4', JOB_LEASE_S: '2' });
  b = await createTestApp({ INSTANCE_ID: 'instance-b', LOGIN_LIMIT_PER_IP: '10000', LOGIN_LIMIT_PER_ACCOUNT: '4', JOB_LEASE_S: '2' });
  await seedBodies();
}, 120_000);
afterAll(async () => {
  await b?.close();
  await a?.close();
});

async function signedIn(app: TestApp, role: 'member' | 'moderator') {
  const u = await makeUser(role);
  const agent = await agentFor(app.app);
  await agent.login(u.email, u.password);
  return agent;
}

async function waitFor(what: string, check: () => Promise<boolean>, limitMs = 60_000) {
  const until = Date.now() + limitMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`still waiting for ${what} after ${limitMs / 1000} s`);
    await sleep(100);
  }
}

const query = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
  a.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

describe('instances · search', { timeout: 120_000 }, () => {
  it('search across instances · a part approved through one instance · is found through the other, which swaps its index from the change log', async () => {
    const author = await signedIn(a, 'member');
    const moderator = await signedIn(a, 'moderator');
    const title = 'Quillon strap anchor';
    const res = await author
      .post('/api/parts')
      .field('data', JSON.stringify(submission({ title, summary: 'Anchors a shoulder strap to a cage side.' })))
      .attach('model', boxStl(30, 20, 10), 'anchor.stl')
      .expect(201);
    const before = await request(b.app).get('/api/search?q=quillon').expect(200);
    expect(before.body.results).toEqual([]);
    const buildsBefore = b.services.search.stats().builds;

    await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
    const approvedAt = Date.now();
    // instance b was told nothing: it finds the part only through the shelf's change log
    await waitFor('instance b to find the part', async () => {
      const found = await request(b.app).get('/api/search?q=quillon').expect(200);
      return found.body.results.some((r: { id: number }) => r.id === res.body.id);
    });
    // a figure for the report, not a check (the bound is measured by npm run bench:search-swap)
    console.log(`instances · search: found through the other instance ${Date.now() - approvedAt} ms after the approval`);
    expect(b.services.search.stats().builds).toBeGreaterThan(buildsBefore);
    const rows = await query<{ n: number }>("SELECT COUNT(*) AS n FROM shelf_changes WHERE kind = 'index'");
    expect(Number(rows[0].n)).toBeGreaterThan(0);
  });
});

describe('instances · rate limits', { timeout: 120_000 }, () => {
  async function attemptsUntilRefused(apps: TestApp[]) {
    const { email } = await makeUser('member');
    const agents = await Promise.all(apps.map((app) => agentFor(app.app)));
    for (let i = 0; i < 20; i++) {
      const res = await agents[i % agents.length].login(email, 'not the password');
      if (res.status === 429) return i;
      expect(res.status).toBe(401);
    }
    return Infinity;
  }

  it('rate limits across instances · failed sign-ins on two instances · together allowed as often as on one', async () => {
    const one = await attemptsUntilRefused([a]);
    const two = await attemptsUntilRefused([a, b]);
    expect(one).toBe(4);
    expect(two).toBe(one);
    const rows = await query<{ n: number }>("SELECT COUNT(*) AS n FROM rate_limits WHERE rate_key LIKE 'login-account:%'");
    expect(Number(rows[0].n)).toBeGreaterThanOrEqual(2);
  });
});

describe('instances · background jobs', { timeout: 180_000 }, () => {
  let photoIds: number[] = [];

  beforeAll(async () => {
    const author = await signedIn(a, 'member');
    let req = author
      .post('/api/parts')
      .field('data', JSON.stringify(submission({ title: 'Tally light shoe' })))
      .attach('model', boxStl(20, 20, 10), 'shoe.stl');
    for (let i = 0; i < 4; i++) req = req.attach('photo', await jpegWithGps(32 + i, 24), `p${i}.jpg`);
    const res = await req.expect(201);
    await a.services.parts.photosSettled();
    photoIds = (await PartFile.findAll({ where: { partId: res.body.id, kind: 'photo' }, order: [['id', 'ASC']] })).map((f) => f.id);
    expect(photoIds).toHaveLength(4);
  });

  /** As a photo stands when its instance was stopped in the middle of cleaning it. */
  async function orphan(ids: number[], holder: string | null) {
    await a.sequelize.query(
      `UPDATE part_files SET processing = 'pending', claimed_by = :holder, lease_until = IF(:holder IS NULL, NULL, NOW(3) - INTERVAL 1 SECOND),
              created_at = NOW(3) - INTERVAL 1 HOUR, processing_attempts = IF(:holder IS NULL, 0, 1), lease_expiries = 0 WHERE id IN (:ids)`,
      { replacements: { ids, holder } },
    );
  }

  it('job claims · orphaned jobs polled by two instances at once · split between them, none claimed twice', async () => {
    await orphan(photoIds, 'gone-instance');
    const [mineA, mineB] = await Promise.all([a.services.claims.claimDue('photo', 'part_files', 4), b.services.claims.claimDue('photo', 'part_files', 4)]);
    expect([...mineA, ...mineB].sort((x, y) => x - y)).toEqual(photoIds);
    expect(mineA.filter((id) => mineB.includes(id))).toEqual([]);
    const rows = await query<{ leaseExpiries: number }>('SELECT lease_expiries AS leaseExpiries FROM part_files WHERE id IN (:ids)', { ids: photoIds });
    expect(rows.map((r) => Number(r.leaseExpiries))).toEqual([1, 1, 1, 1]);
    // held: the other instance can neither claim nor take them over while the lease runs
    expect((await b.services.claims.claim('photo', 'part_files', mineA[0] ?? mineB[0])).claimed).toBe(mineB.includes(mineA[0] ?? mineB[0]));
    await a.sequelize.query("UPDATE part_files SET processing = 'ready', claimed_by = NULL, lease_until = NULL WHERE id IN (:ids)", {
      replacements: { ids: photoIds },
    });
  });

  it('job claims · a photo whose instance died mid-clean · taken over by another instance, cleaned once, the death counted apart from failures', async () => {
    const [id] = photoIds;
    const row = (await PartFile.findByPk(id))!;
    const raw = join(uploadsDir, 'incoming', row.storedName);
    writeFileSync(raw, await jpegWithGps(40, 30));
    await orphan([id], 'gone-instance');
    await b.services.jobs.tick();
    await b.services.parts.photosSettled();
    const [after] = await query<{ processing: string; claimedBy: string | null; attempts: number; expiries: number }>(
      'SELECT processing, claimed_by AS claimedBy, processing_attempts AS attempts, lease_expiries AS expiries FROM part_files WHERE id = :id',
      { id },
    );
    // one try ran here; one try ended with its instance: not a failure of the photo
    expect(after).toEqual({ processing: 'ready', claimedBy: null, attempts: 2, expiries: 1 });
    expect(existsSync(raw)).toBe(false);
  });

  it('job claims · a photo that took two instances down · failed for good instead of being handed on again', async () => {
    const [, id] = photoIds;
    const row = (await PartFile.findByPk(id))!;
    writeFileSync(join(uploadsDir, 'incoming', row.storedName), await jpegWithGps(40, 30));
    await orphan([id], 'gone-instance');
    await a.sequelize.query('UPDATE part_files SET lease_expiries = 1, processing_attempts = 2 WHERE id = :id', { replacements: { id } });
    await b.services.jobs.tick();
    await b.services.parts.photosSettled();
    await row.reload();
    expect(row.processing).toBe('failed');
  });

  it('job claims · a job never claimed (its instance died between commit and start) · taken once it has waited a lease', async () => {
    const [, , id] = photoIds;
    const row = (await PartFile.findByPk(id))!;
    writeFileSync(join(uploadsDir, 'incoming', row.storedName), await jpegWithGps(40, 30));
    await orphan([id], null);
    await a.services.jobs.tick();
    await a.services.parts.photosSettled();
    await row.reload();
    expect(row.processing).toBe('ready');
  });

  /** What the mariadb connector reports when a query's socket times out (errno 45026), wrapped as Sequelize wraps it. */
  const socketTimeout = () =>
    Object.assign(new Error('(conn:7, no: 45026, SQLState: 08S01) socket timeout'), { original: { errno: 45026, code: 'ER_SOCKET_TIMEOUT' } });

  it('job claims · the outcome write times out once (a node being evicted) · written again by the holder, the photo cleaned once', async () => {
    const [, , , id] = photoIds;
    const row = (await PartFile.findByPk(id))!;
    const raw = join(uploadsDir, 'incoming', row.storedName);
    writeFileSync(raw, await jpegWithGps(40, 30));
    const update = vi.spyOn(PartFile, 'update').mockRejectedValueOnce(socketTimeout());
    await orphan([id], null);
    await a.sequelize.query('UPDATE part_files SET processing_attempts = 0 WHERE id = :id', { replacements: { id } });
    let writes = 0;
    try {
      await a.services.jobs.tick();
      await Promise.all([a.services.parts.photosSettled(), b.services.parts.photosSettled()]);
      writes = update.mock.calls.length;
    } finally {
      update.mockRestore();
    }
    const [after] = await query<{ processing: string; attempts: number }>('SELECT processing, processing_attempts AS attempts FROM part_files WHERE id = :id', {
      id,
    });
    expect(writes).toBe(2);
    expect(after).toEqual({ processing: 'ready', attempts: 1 });
    expect(existsSync(raw)).toBe(false);
  });

  it('job claims · the lease lost while the outcome write was refused · the new holder is not overwritten and keeps the raw upload', async () => {
    const [, , , id] = photoIds;
    const row = (await PartFile.findByPk(id))!;
    const raw = join(uploadsDir, 'incoming', row.storedName);
    writeFileSync(raw, await jpegWithGps(40, 30));
    // while instance a cannot write its result, its lease runs out and another instance takes the photo
    const update = vi.spyOn(PartFile, 'update').mockImplementationOnce(async () => {
      await a.sequelize.query("UPDATE part_files SET claimed_by = 'instance-c', lease_until = NOW(3) + INTERVAL 30 SECOND WHERE id = :id", {
        replacements: { id },
      });
      throw socketTimeout();
    });
    await orphan([id], null);
    await a.sequelize.query('UPDATE part_files SET processing_attempts = 0 WHERE id = :id', { replacements: { id } });
    try {
      await a.services.jobs.tick();
      await Promise.all([a.services.parts.photosSettled(), b.services.parts.photosSettled()]);
    } finally {
      update.mockRestore();
    }
    const [after] = await query<{ processing: string; claimedBy: string | null }>('SELECT processing, claimed_by AS claimedBy FROM part_files WHERE id = :id', {
      id,
    });
    expect(after).toEqual({ processing: 'pending', claimedBy: 'instance-c' });
    expect(existsSync(raw)).toBe(true);
    await a.sequelize.query("UPDATE part_files SET processing = 'ready', claimed_by = NULL, lease_until = NULL WHERE id = :id", { replacements: { id } });
  });

  it('job claims · a try that ended while its release could not be written · its lease is not kept alive, and another instance takes the photo over', async () => {
    const [, , , id] = photoIds;
    await orphan([id], null);
    expect((await a.services.claims.claim('photo', 'part_files', id)).claimed).toBe(true);
    const query = vi.spyOn(a.sequelize, 'query').mockRejectedValueOnce(socketTimeout());
    try {
      await expect(a.services.claims.release('part_files', id)).rejects.toThrow(/socket timeout/);
    } finally {
      query.mockRestore();
    }
    // the heartbeat moves on only the leases of jobs under way here
    await a.services.claims.heartbeat();
    await sleep(2200);
    await a.services.claims.heartbeat();
    expect(await b.services.claims.claimDue('photo', 'part_files', 4)).toContain(id);
    await a.sequelize.query("UPDATE part_files SET processing = 'ready', claimed_by = NULL, lease_until = NULL WHERE id = :id", { replacements: { id } });
  });

  it('start-up sweep · files another instance may be writing · left alone during the grace period', async () => {
    const fresh = join(uploadsDir, 'tmp', 'upload-in-progress');
    writeFileSync(fresh, 'half an upload');
    await b.services.parts.recover({ minAgeMs: 60 * 60_000 });
    expect(existsSync(fresh)).toBe(true);
    await b.services.parts.recover();
    expect(existsSync(fresh)).toBe(false);
  });

  it('named leases · two instances asking · held by one at a time and taken over once it runs out', async () => {
    expect(await a.services.claims.tryLease('test-chore', 1)).toBe(true);
    expect(await b.services.claims.tryLease('test-chore', 1)).toBe(false);
    await sleep(1100);
    expect(await b.services.claims.tryLease('test-chore', 1)).toBe(true);
    expect(await b.services.claims.othersAlive()).toBeGreaterThanOrEqual(0);
  });
});

describe('instances · shared chores', { timeout: 120_000 }, () => {
  it('shared chores · two job loops running a round at once · a chore such as the due refunds runs on one instance only', async () => {
    await a.sequelize.query("DELETE FROM job_leases WHERE name = 'chores'");
    let runs = 0;
    const loopOf = (app: TestApp) =>
      createJobRunner({
        sequelize: app.sequelize,
        claims: app.services.claims,
        busy: () => 0,
        takePhotos: async () => undefined,
        sharedChores: [
          async () => {
            runs += 1;
          },
        ],
      });
    await Promise.all([loopOf(a).tick(), loopOf(b).tick()]);
    expect(runs).toBe(1);
  });
});

describe('instances · mail', { timeout: 120_000 }, () => {
  it('mail outbox · two outboxes delivering at once · each mail sent exactly once', async () => {
    const to = Array.from({ length: 12 }, (_, i) => `crew-${i}-${Date.now()}@crew.test`);
    await a.mailer.enqueue(to, { subject: 'Call sheet', text: 'Tomorrow 07:00.', html: '<p>Tomorrow 07:00.</p>' });
    await Promise.all([a.mailer.flush(), b.mailer.flush()]);
    const sent = [...a.mailer.fake!.messages(), ...b.mailer.fake!.messages()].filter((m) => m.subject === 'Call sheet');
    expect(sent).toHaveLength(12);
    expect(new Set(sent.map((m) => JSON.stringify(m.to))).size).toBe(12);
  });
});

describe('instances · migrations', { timeout: 120_000 }, () => {
  it('migrations · instances starting at once · migrate one at a time; the later ones find nothing left to do', async () => {
    const config = testConfig();
    const others = [createSequelize(config), createSequelize(config)];
    try {
      const [first, second] = await Promise.all(others.map((s) => migrate(s)));
      expect([...first, ...second]).toEqual([]);
      let inside = 0;
      let most = 0;
      const hold = (s: (typeof others)[number]) =>
        withSchemaLock(
          s,
          async () => {
            inside += 1;
            most = Math.max(most, inside);
            await sleep(200);
            inside -= 1;
          },
          () => undefined,
        );
      await Promise.all(others.map(hold));
      expect(most).toBe(1);
    } finally {
      for (const s of others) await s.close();
      // createSequelize bound the models to the last one; give them back to the open apps
      const { initModels } = await import('../../server/db/models');
      initModels(b.sequelize);
    }
  });
});

describe('galera rules', () => {
  it('galera rules · every table · has a primary key and is InnoDB (sessions, migration records and the shared-instance tables included)', async () => {
    const tables = await query<{ name: string; engine: string; pk: number }>(
      `SELECT t.table_name AS name, t.engine,
              (SELECT COUNT(*) FROM information_schema.table_constraints c
                WHERE c.table_schema = t.table_schema AND c.table_name = t.table_name AND c.constraint_type = 'PRIMARY KEY') AS pk
         FROM information_schema.tables t
        WHERE t.table_schema = DATABASE() AND t.table_type = 'BASE TABLE'`,
    );
    const names = tables.map((t) => t.name);
    for (const needed of ['sessions', 'schema_migrations', 'schema_migration_lock', 'job_leases', 'shelf_changes', 'rate_limits'])
      expect(names).toContain(needed);
    expect(tables.filter((t) => Number(t.pk) !== 1).map((t) => t.name)).toEqual([]);
    expect(tables.filter((t) => t.engine !== 'InnoDB').map((t) => t.name)).toEqual([]);
  });

  it('galera rules · the server code · takes no table locks or named locks (Galera shares neither between nodes)', () => {
    const root = resolve(import.meta.dirname, '../../server');
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (/\.(ts|mjs|js)$/.test(name) && /\bLOCK\s+TABLES?\b|\bGET_LOCK\s*\(/i.test(readFileSync(path, 'utf8'))) offenders.push(path);
      }
    };
    walk(root);
    expect(offenders).toEqual([]);
  });
});

describe('DB_HOSTS', { timeout: 60_000 }, () => {
  it('DB_HOSTS · host:port lists · read, a bad entry named', () => {
    const base = { ...process.env, DB_PASSWORD: 'x', SESSION_SECRET: 'a'.repeat(32) };
    expect(loadConfig({ ...base, DB_HOSTS: '10.0.0.5:3306, [::1]:3307' }).DB_HOSTS).toEqual([
      { host: '10.0.0.5', port: 3306 },
      { host: '::1', port: 3307 },
    ]);
    expect(loadConfig({ ...base, DB_HOSTS: '' }).DB_HOSTS).toBeUndefined();
    expect(() => loadConfig({ ...base, DB_HOSTS: 'db1' })).toThrow(/DB_HOSTS: "db1" is not host:port/);
  });

  it('DB_HOSTS · the first host in the list down · connects through the next that answers', async () => {
    const real = testConfig();
    // port 9 (discard) is closed on loopback here: nothing listens on it
    const config = testConfig({ DB_HOSTS: `127.0.0.1:9,${real.DB_HOST}:${real.DB_PORT}` });
    const sequelize = createSequelize(config);
    try {
      const [row] = await sequelize.query<{ one: number }>('SELECT 1 AS one', { type: QueryTypes.SELECT });
      expect(Number(row.one)).toBe(1);
    } finally {
      await sequelize.close();
      const { initModels } = await import('../../server/db/models');
      initModels(b.sequelize);
    }
  });
});
