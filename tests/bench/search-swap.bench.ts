/**
 * How long a part approved through one app instance takes to be found through another instance on
 * the same database (which learns of it only from the shelf's change log): two apps built in this
 * process over one database, like two instances behind a balancer.
 *
 *   npm run bench:search-swap                       (DB_PORT=3348 npm run bench:search-swap for another port)
 *   npm run bench:search-swap -- --rounds 10 --shelf 300
 *
 * --shelf puts that many extra published parts on the shelf first, so each rebuild has work to do.
 * Prints per round the time from the approval's answer to the first search through the other
 * instance that finds the part (searched every 50 ms), then p50 / max. Read the load average it
 * prints: other work on the machine lengthens every build.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { searchQuerySchema } from '../../shared/schemas/search';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { migrate } from '../../server/db/migrator';
import { Part, PartRevision, User } from '../../server/db/models';
import { createSequelize } from '../../server/db/sequelize';
import { createMailer } from '../../server/modules/mail/outbox';
import { localInstance } from '../../server/scripts/local-env';
import { hashPassword } from '../../server/security/password';
import { boxStl } from '../helpers/meshes';
import { setReadyRecipe } from '../helpers/parts';

const BENCH_DB = 'rigshelf_swap_bench';
const args = process.argv.slice(2);
const arg = (name: string, fallback: number) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? Number(args[i + 1]) : fallback;
};
const rounds = arg('rounds', 8);
const shelf = arg('shelf', 0);

const submission = (title: string) => ({
  title,
  summary: 'An invented part for the search-swap bench.',
  description: '',
  category: 'rods-mounting',
  bodies: [],
  mounts: [],
  keyDimensions: [],
  safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false },
  testedLoadKg: null,
  licence: 'CC-BY-4.0',
  recipes: [setReadyRecipe],
});

async function main() {
  const { db, env } = localInstance('test');
  const wasRunning = await db.isAcceptingLogins();
  await db.start();
  await db.provision({ database: BENCH_DB, user: env.DB_USER, password: env.DB_PASSWORD });
  const scratch = mkdtempSync(join(tmpdir(), 'rigshelf-swap-bench-'));
  const base = {
    ...process.env,
    ...env,
    DB_NAME: BENCH_DB,
    NODE_ENV: 'test',
    PASSWORD_SCRYPT_LOG_N: '12',
    UPLOADS_DIR: join(scratch, 'uploads'),
    SMTP_FAKE: '1',
    SMTP_PORT: '0',
    MODEL_PICTURES: '0',
  } as NodeJS.ProcessEnv;
  interface Instance {
    sequelize: ReturnType<typeof createSequelize>;
    mailer: Awaited<ReturnType<typeof createMailer>>;
    built: ReturnType<typeof createApp>;
  }
  const instances: Instance[] = [];
  try {
    for (const name of ['a', 'b']) {
      const config = loadConfig({ ...base, INSTANCE_ID: `bench-${name}`, SEARCH_INDEX_FILE: join(scratch, `index-${name}.json`) });
      const sequelize = createSequelize(config);
      await migrate(sequelize);
      const mailer = await createMailer({ config, sequelize });
      const built = createApp({ config, sequelize, mailer });
      instances.push({ sequelize, mailer, built });
    }
    const [a, b] = instances;
    const user = async (role: 'member' | 'moderator') => {
      const email = `${role}-${Date.now()}-${Math.random().toString(36).slice(2)}@bench.test`;
      await User.create({
        email,
        displayName: `Bench ${role}`,
        passwordHash: await hashPassword('correct horse battery', 12),
        role,
        status: 'active',
        crewRole: null,
        emailVerifiedAt: new Date(),
      });
      const agent = request.agent(a.built.app);
      const token = (await agent.get('/api/auth/csrf')).body.csrfToken as string;
      await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email, password: 'correct horse battery' }).expect(200);
      const fresh = (await agent.get('/api/auth/csrf')).body.csrfToken as string;
      return { post: (url: string) => agent.post(url).set('X-CSRF-Token', fresh) };
    };
    const author = await user('member');
    const moderator = await user('moderator');
    const submit = async (title: string) =>
      (
        await author
          .post('/api/parts')
          .field('data', JSON.stringify(submission(title)))
          .attach('model', boxStl(30, 20, 10), 'part.stl')
          .expect(201)
      ).body.id as number;

    for (let i = 0; i < shelf; i++) {
      const id = await submit(`Filler bracket ${i}`);
      const part = (await Part.findByPk(id))!;
      await PartRevision.update({ status: 'published' }, { where: { id: part.latestRevisionId! } });
      await part.update({ status: 'published', publishedRevisionId: part.latestRevisionId, publishedAt: new Date() });
    }
    for (const x of instances) await x.built.services.search.start();
    console.log(
      `Node ${process.version}; ${shelf} part(s) on the shelf besides the measured ones; change log polled every 1 s; load average ${loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')}`,
    );

    // the instance that approved rebuilds at once: its time is the anchor (one build), the other's
    // adds the change-log poll
    const times = { same: [] as number[], other: [] as number[] };
    const until = async (instance: Instance, word: string, id: number, since: number) => {
      for (;;) {
        const found = await instance.built.services.search.search(searchQuerySchema.parse({ q: word })).catch(() => null);
        if (found?.results.some((p) => p.id === id)) return performance.now() - since;
        if (performance.now() - since > 90_000) throw new Error(`not found within 90 s`);
        await sleep(50);
      }
    };
    for (let r = 0; r < rounds; r++) {
      const word = `zorvex${r}q`;
      const id = await submit(`Swap probe ${word}`);
      await moderator.post(`/api/review/${id}/approve`).send({}).expect(200);
      const approved = performance.now();
      const [same, other] = await Promise.all([until(a, word, id, approved), until(b, word, id, approved)]);
      times.same.push(same);
      times.other.push(other);
      console.log(`round ${r + 1}: found through the approving instance after ${same.toFixed(0)} ms, through the other after ${other.toFixed(0)} ms`);
      await sleep(500);
    }
    const line = (xs: number[]) => {
      const sorted = [...xs].sort((x, y) => x - y);
      return `p50 ${sorted[Math.floor(sorted.length / 2)].toFixed(0)} ms, max ${sorted[sorted.length - 1].toFixed(0)} ms`;
    };
    console.log(
      `\napproval → found through the approving instance: ${line(times.same)}; through the other instance: ${line(times.other)} (target ≤ 5000 ms) over ${rounds} rounds`,
    );
    console.log(
      `load average ${loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')} on ${availableParallelism()} cores`,
    );
  } finally {
    for (const x of instances.reverse()) {
      await x.built.close();
      await x.mailer.close();
      await x.sequelize.close();
    }
    await db.sql(`DROP DATABASE IF EXISTS \`${BENCH_DB}\``);
    if (!wasRunning) await db.stop();
    rmSync(scratch, { recursive: true, force: true });
  }
}

await main();
process.exit(0);
