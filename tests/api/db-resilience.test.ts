// Concurrency and database failures: submissions at once, deadlocks retried with their files and
// mail intact, 500 answers that keep internals in the log, a database that stops answering.
import { existsSync, readdirSync } from 'node:fs';
import { createServer, type Server, type Socket } from 'node:net';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import express from 'express';
import request from 'supertest';
import { DatabaseError, Op, type Sequelize } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { AuditEvent, initModels, MailMessage, Part, PartFile, PartRevision, Rating, Recipe, RevisionBody, User } from '../../server/db/models';
import { createSequelize } from '../../server/db/sequelize';
import { transact } from '../../server/db/transaction';
import { AppError, errorHandler } from '../../server/errors';
import { renderDescription } from '../../server/modules/parts/revisions';
import { databaseAnswers, healthRoutes } from '../../server/modules/health/routes';
import { createDatabaseWatch } from '../../server/modules/health/watch';
import { agentFor, createTestApp, makeUser, testConfig, uploadsDir, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { publishDirectly, seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;

async function signedIn(role: 'member' | 'moderator' = 'member') {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return { agent: a, user: u.user };
}

function submit(a: Agent, data: unknown, photo?: Buffer) {
  let req = a
    .post('/api/parts')
    .field('data', JSON.stringify(data))
    .attach('model', boxStl(20, 30, 10), 'bracket.stl');
  if (photo) req = req.attach('photo', photo, 'on-the-rig.png');
  return req;
}

function filesOnDisk(): string[] {
  return ['tmp', 'incoming', 'store'].flatMap((d) => {
    const dir = join(uploadsDir, d);
    return existsSync(dir) ? readdirSync(dir).map((f) => `${d}/${f}`) : [];
  });
}

/** Every stored file belongs to a row and every row's file is there (photos: their cleaned sizes). */
async function diskMatchesRows() {
  await t.services.parts.photosSettled();
  const rows = await PartFile.findAll();
  const expected = rows.flatMap((r) =>
    r.kind === 'photo' ? [`store/${r.storedName}-display.jpg`, `store/${r.storedName}-thumb.jpg`] : [`store/${r.storedName}`],
  );
  return { expected: expected.sort(), actual: filesOnDisk().sort() };
}

/** What the connector throws when InnoDB picks this transaction as a deadlock victim (errno 1213, SQLSTATE 40001). */
function deadlock() {
  const original = Object.assign(new Error('Deadlock found when trying to get lock; try restarting transaction'), {
    errno: 1213,
    sqlState: '40001',
    code: 'ER_LOCK_DEADLOCK',
    sql: 'INSERT INTO `audit_events` …',
  });
  return new DatabaseError(original);
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  await signedIn('moderator'); // someone to be told about submissions
});
afterAll(async () => {
  await t.close();
});

describe('parts · concurrent submissions', () => {
  it('parts · 12 submissions at once, most with the same title · all 201, each stored exactly once', async () => {
    const members = await Promise.all([1, 2, 3, 4].map(() => signedIn()));
    const before = { parts: await Part.count(), recipes: await Recipe.count(), bodies: await RevisionBody.count() };
    const titles = Array.from({ length: 12 }, (_, i) => (i < 9 ? 'Cheese plate for a follow focus' : `Rod clamp variant ${i}`));
    const answers = await Promise.all(titles.map((title, i) => submit(members[i % 4].agent, submission({ title }))));

    expect(answers.map((r) => r.status)).toEqual(Array(12).fill(201));
    const ids = answers.map((r) => r.body.id as number);
    const slugs = answers.map((r) => r.body.slug as string);
    expect(new Set(ids).size).toBe(12);
    expect(new Set(slugs).size).toBe(12);
    expect(await Part.count()).toBe(before.parts + 12);
    // one recipe and one camera body each (submission() carries one of each), none twice
    expect(await Recipe.count()).toBe(before.recipes + 12);
    expect(await RevisionBody.count()).toBe(before.bodies + 12);
    const revisions = await PartRevision.findAll({ where: { partId: { [Op.in]: ids } } });
    expect(revisions).toHaveLength(12);
    const { expected, actual } = await diskMatchesRows();
    expect(actual).toEqual(expected);
  });
});

describe('transactions · a deadlock is retried as a whole', () => {
  it('transactions · a real InnoDB deadlock (two transactions locking two rows in opposite order) · the loser runs again, both commit', async () => {
    const [a, b] = [(await makeUser()).user.id, (await makeUser()).user.id];
    let arrived = 0;
    let release!: () => void;
    const bothHoldTheirFirstRow = new Promise<void>((resolve) => (release = resolve));
    const runs: number[] = [];
    const lockBoth = (first: number, second: number, name: string) =>
      transact(t.sequelize, async (tx, attempt) => {
        runs.push(first);
        await User.findByPk(first, { transaction: tx, lock: tx.LOCK.UPDATE });
        if (attempt.number === 1) {
          if ((arrived += 1) === 2) release();
          await bothHoldTheirFirstRow;
        }
        await User.findByPk(second, { transaction: tx, lock: tx.LOCK.UPDATE });
        await User.update({ displayName: name }, { where: { id: second }, transaction: tx });
      });
    await Promise.all([lockBoth(a, b, 'Locked by the first'), lockBoth(b, a, 'Locked by the second')]);
    expect(runs).toHaveLength(3); // one of the two was the deadlock victim and ran twice
    expect((await User.findByPk(b))!.displayName).toBe('Locked by the first');
    expect((await User.findByPk(a))!.displayName).toBe('Locked by the second');
  });

  it('transactions · deadlock after the files were moved · 201, each file stored once, nothing left in tmp or orphaned', async () => {
    const { agent } = await signedIn();
    const partsBefore = await Part.count();
    const spy = vi.spyOn(AuditEvent, 'create').mockRejectedValueOnce(deadlock());
    try {
      const res = await submit(agent, submission({ title: 'Top handle riser after a deadlock' }), await plainPng(32, 24));
      expect(res.status).toBe(201);
      expect(spy).toHaveBeenCalledTimes(2);
    } finally {
      spy.mockRestore();
    }
    expect(await Part.count()).toBe(partsBefore + 1);
    const { expected, actual } = await diskMatchesRows();
    expect(actual).toEqual(expected);
  });

  it("transactions · deadlock after the moderators' mail was queued · the mail is queued once", async () => {
    const { agent } = await signedIn();
    const title = 'Monitor arm knuckle with a retried mail';
    const real = MailMessage.bulkCreate.bind(MailMessage);
    const spy = vi.spyOn(MailMessage, 'bulkCreate').mockImplementationOnce(async (...args) => {
      await real(...args);
      throw deadlock();
    });
    try {
      expect((await submit(agent, submission({ title }))).status).toBe(201);
    } finally {
      spy.mockRestore();
    }
    const moderators = await t.sequelize.query("SELECT COUNT(*) AS n FROM users WHERE role IN ('moderator', 'admin') AND status = 'active'", { plain: true });
    const queued = await MailMessage.count({ where: { subject: { [Op.like]: `%${title}%` } } });
    expect(queued).toBe(Number((moderators as { n: number }).n));
  });

  it('transactions · a deadlock that keeps coming back · 503 after the bounded retries, nothing stored', async () => {
    const { agent } = await signedIn();
    const partsBefore = await Part.count();
    const spy = vi.spyOn(AuditEvent, 'create').mockImplementation(async () => {
      throw deadlock();
    });
    try {
      const res = await submit(agent, submission({ title: 'Bracket that never gets its lock' }));
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe('database_busy');
      expect(res.body.error.message).not.toMatch(/Deadlock|INSERT/);
    } finally {
      spy.mockRestore();
    }
    expect(await Part.count()).toBe(partsBefore);
    const { expected, actual } = await diskMatchesRows();
    expect(actual).toEqual(expected);
  });
});

describe('errors · 500 answers', () => {
  it('errors · an unexpected database error · 500 without SQL, quoting a reference the log also has', async () => {
    const logged: string[] = [];
    const log = vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => void logged.push(args.map(String).join(' ')));
    const sqlError = new DatabaseError(Object.assign(new Error("Unknown column 'secret_col' in 'field list'"), { sql: 'SELECT secret_col FROM parts' }));
    const spy = vi.spyOn(Part, 'findAll').mockRejectedValueOnce(sqlError);
    let res;
    try {
      res = await request(t.app).get('/api/parts');
    } finally {
      spy.mockRestore();
      log.mockRestore();
    }
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('internal');
    expect(JSON.stringify(res.body)).not.toMatch(/secret_col|SELECT|Unknown column/);
    const ref = /ref ([0-9a-f]{8})/.exec(res.body.error.message)?.[1];
    expect(ref).toBeDefined();
    expect(logged.some((line) => line.includes(ref!) && line.includes('secret_col'))).toBe(true);
  });

  it('errors · a file-system error in any route · 500 with a plain sentence and a ref, no path or error code', async () => {
    const log = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const app = express();
    app.get('/boom', () => {
      throw new Error('ENOENT: /srv/rigshelf/uploads/store/abc');
    });
    app.use(errorHandler());
    const res = await request(app).get('/boom');
    log.mockRestore();
    expect(res.status).toBe(500);
    expect(res.body.error.message).toMatch(/^Something went wrong on our side\. .*ref [0-9a-f]{8}\.$/);
    expect(res.body.error.message).not.toMatch(/ENOENT|srv/);
  });
});

describe('evidence · one member rating twice at once', () => {
  it('evidence · the second request finds the row created meanwhile · both succeed, one row with the later stars', async () => {
    const author = await signedIn();
    const rater = await signedIn();
    const created = await submit(author.agent, submission({ title: 'Matte box clamp rated twice' })).expect(201);
    await publishDirectly(created.body.id);
    await rater.agent.post(`/api/parts/${created.body.id}/ratings`).send({ stars: 3 }).expect(201);
    // the look-up misses the row, as it does when the other request has not committed yet
    const spy = vi.spyOn(Rating, 'findOne').mockResolvedValueOnce(null);
    let res;
    try {
      res = await rater.agent.post(`/api/parts/${created.body.id}/ratings`).send({ stars: 5 });
    } finally {
      spy.mockRestore();
    }
    expect(res.status).toBe(200);
    const rows = await Rating.findAll({ where: { partId: created.body.id, userId: rater.user.id } });
    expect(rows.map((r) => r.stars)).toEqual([5]);
  });

  it('evidence · six ratings fired together · all succeed and one row remains', async () => {
    const author = await signedIn();
    const rater = await signedIn();
    const created = await submit(author.agent, submission({ title: 'Follow focus bracket rated at once' })).expect(201);
    await publishDirectly(created.body.id);
    const answers = await Promise.all([1, 2, 3, 4, 5, 4].map((stars) => rater.agent.post(`/api/parts/${created.body.id}/ratings`).send({ stars })));
    for (const r of answers) expect([200, 201]).toContain(r.status);
    expect(await Rating.count({ where: { partId: created.body.id, userId: rater.user.id } })).toBe(1);
  });
});

describe('parts · long descriptions', () => {
  it('parts · 20,000 "<" (80,000 bytes once escaped) · 201 and the description comes back whole', async () => {
    const { agent } = await signedIn();
    const description = '<'.repeat(20_000);
    const res = await submit(agent, submission({ title: 'Bracket with a very long description', description }));
    expect(res.status).toBe(201);
    const part = await agent.get(`/api/parts/${res.body.id}`).expect(200);
    expect(part.body.description).toBe(description);
    expect(part.body.descriptionHtml.split('&lt;').length - 1).toBe(20_000);
  });

  it('parts · HTML that would outgrow its column · 422 naming the description', () => {
    const tooLong = () => renderDescription('<'.repeat(100), 407); // 100 × '&lt;' inside <p></p> and a newline: 408 bytes
    expect(tooLong).toThrow(AppError);
    try {
      tooLong();
    } catch (err) {
      expect((err as AppError).status).toBe(422);
      expect((err as AppError).fields?.description).toMatch(/too long once formatted/);
    }
    expect(renderDescription('<'.repeat(100), 408)).toContain('&lt;');
  });

  it('parts · over the source limit · 422 naming the description', async () => {
    const { agent } = await signedIn();
    const res = await submit(agent, submission({ description: 'x'.repeat(20_001) }));
    expect(res.status).toBe(422);
    expect(res.body.error.fields.description).toMatch(/20,000/);
  });
});

describe('parts · files of a retired part', () => {
  it('files of a retired part · download by the author, a moderator, anyone else · the first two get them, others the 404 of an unknown file', async () => {
    const author = await signedIn();
    const member = await signedIn();
    const moderator = await signedIn('moderator');
    const created = await submit(author.agent, submission({ title: 'Retired clamp with files' }), await plainPng(32, 24)).expect(201);
    await publishDirectly(created.body.id);
    await t.services.parts.photosSettled();
    const page = await member.agent.get(`/api/parts/${created.body.id}`).expect(200);
    const model = page.body.files.find((f: { kind: string }) => f.kind === 'model');
    const photo = page.body.files.find((f: { kind: string }) => f.kind === 'photo');
    await member.agent.get(model.downloadUrl).expect(200);

    await Part.update({ status: 'retired' }, { where: { id: created.body.id } });
    const refused = await member.agent.get(model.downloadUrl);
    expect(refused.status).toBe(404);
    expect(refused.body).toEqual((await member.agent.get(`/api/parts/${created.body.id}/files/999999/download`)).body);
    expect((await request(t.app).get(model.downloadUrl)).status).toBe(401); // downloads need an account anyway
    await author.agent.get(model.downloadUrl).expect(200);
    await moderator.agent.get(model.downloadUrl).expect(200);
    // the page stays up for reference, photos included
    await member.agent.get(`/api/parts/${created.body.id}`).expect(200);
    await member.agent.get(photo.thumbnailUrl).expect(200);
  });
});

describe('database that accepts connections but never answers', () => {
  let frozen: Server;
  const sockets = new Set<Socket>();
  let port = 0;

  beforeAll(async () => {
    frozen = createServer((socket) => {
      sockets.add(socket);
      socket.on('close', () => sockets.delete(socket));
    });
    await new Promise<void>((resolve) => frozen.listen(0, '127.0.0.1', resolve));
    port = (frozen.address() as AddressInfo).port;
  });
  afterAll(async () => {
    for (const s of sockets) s.destroy();
    await new Promise<void>((resolve) => frozen.close(() => resolve()));
  });

  /** A Sequelize built the way the app builds it, against the silent server; the models go back to the test app. */
  function silentSequelize(overrides: Record<string, string>) {
    const sequelize = createSequelize(testConfig({ DB_PORT: String(port), ...overrides }));
    initModels(t.sequelize);
    return sequelize;
  }

  it('database that accepts connections but never answers · health · answers "down" from its own timeout while the query still hangs', async () => {
    const sequelize = silentSequelize({ DB_QUERY_TIMEOUT_MS: '0' }); // no pool timeouts: only the health check's own
    let settled = false;
    const query = sequelize.query('SELECT 1').finally(() => void (settled = true));
    query.catch(() => undefined);
    expect(await databaseAnswers(sequelize, 200)).toBe(false);
    expect(settled).toBe(false);

    const app = express().use('/api/health', healthRoutes(sequelize, { timeoutMs: 200 }));
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ status: 'degraded', db: 'down' });
    await sequelize.close().catch(() => undefined);
  });

  it('database that accepts connections but never answers · a request · 503 database_unavailable once the socket timeout gives up; the next ones wait for a probe only', async () => {
    const sequelize = silentSequelize({ DB_QUERY_TIMEOUT_MS: '300' });
    const watch = createDatabaseWatch(sequelize, 200);
    const log = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    let handled = 0;
    const app = express();
    app.use('/api', watch.gate());
    app.get('/api/thing', async (_req, res) => {
      handled += 1;
      res.json(await sequelize.query('SELECT 1'));
    });
    app.use(errorHandler({ onDatabaseUnavailable: watch.reportUnavailable }));
    const first = await request(app).get('/api/thing');
    const second = await request(app).get('/api/thing');
    log.mockRestore();
    expect(first.status).toBe(503);
    expect(first.body.error.code).toBe('database_unavailable');
    expect(second.status).toBe(503);
    expect(second.body.error.code).toBe('database_unavailable');
    expect(handled).toBe(1); // the second never reached the database's pool timeouts
    await sequelize.close().catch(() => undefined);
  });
});

describe('database watch · the gate in front of /api', () => {
  it('database watch · requests after a failure · one shared probe: 503 while the database is silent, through once it answers', async () => {
    let answering = false;
    const query = vi.fn(() => (answering ? Promise.resolve([]) : new Promise<never>(() => undefined)));
    const watch = createDatabaseWatch({ query } as unknown as Sequelize, 100);
    let handled = 0;
    const app = express();
    app.use('/api', watch.gate());
    app.get('/api/x', (_req, res) => {
      handled += 1;
      res.json({ ok: true });
    });
    app.use(errorHandler());

    await request(app).get('/api/x').expect(200);
    expect(query).not.toHaveBeenCalled(); // no probing while all is well

    watch.reportUnavailable();
    const refused = await Promise.all([1, 2, 3].map(() => request(app).get('/api/x')));
    expect(refused.map((r) => [r.status, r.body.error.code])).toEqual(Array(3).fill([503, 'database_unavailable']));
    expect(handled).toBe(1);
    // callers asking at once share one probe
    query.mockClear();
    expect(await Promise.all([watch.check(), watch.check(), watch.check()])).toEqual([false, false, false]);
    expect(query).toHaveBeenCalledTimes(1);

    answering = true;
    await request(app).get('/api/x').expect(200);
    expect(handled).toBe(2);
    expect(watch.down).toBe(false);
  });
});
