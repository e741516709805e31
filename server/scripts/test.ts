// `npm test`: a private MariaDB for tests (own data directory and port, never the demo data),
// Debian's chromium for the browser tests, a fresh client build, then the whole vitest suite.
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { ensureClientBuilt } from './build-client';
import { localInstance, root } from './local-env';
import { aptInstall } from './mariadb';
import { DEMO_KINDS, templateDatabase, templateFolder } from './test-templates';

const CHROMIUM = '/usr/bin/chromium';

const { db, env } = localInstance('test');
const wasRunning = await db.isAcceptingLogins();
await db.start();
await db.provision({
  database: env.DB_NAME,
  user: env.DB_USER,
  password: env.DB_PASSWORD,
  // each test file makes a database of its own under this prefix
  extraGrants: ['rigshelf\\_t\\_%'],
});
const selection = process.argv.slice(2);
// the browser tests need chromium and a built client; a run limited to other files does not
const browserTests = selection.filter((a) => !a.startsWith('-')).length === 0 || selection.some((a) => a.includes('e2e'));
if (browserTests) {
  if (!existsSync(CHROMIUM)) {
    console.log('rigshelf: installing Debian chromium for the browser tests (apt-get)');
    await aptInstall(['chromium']);
  }
  ensureClientBuilt();
}

const args = ['run', ...selection];
// the demo shelf is seeded once per run into template databases and folders named after this id
// (tests/helpers/demo-template.ts), and dropped after the run
const run = `${Date.now().toString(36)}${randomBytes(2).toString('hex')}`;
// Not spawnSync: this process must stay responsive so Ctrl-C or SIGTERM still stops the MariaDB it started.
const vitest = spawn(resolve(root, 'node_modules/.bin/vitest'), args, {
  cwd: root,
  stdio: 'inherit',
  env: {
    ...process.env,
    ...env,
    NODE_ENV: 'test',
    RIGSHELF_TEST_DB_DIR: db.dir,
    CHROMIUM_PATH: CHROMIUM,
    RIGSHELF_TEST_RUN: run,
  },
});
let signalled: NodeJS.Signals | null = null;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    // Ctrl-C reaches vitest directly too (same process group); a SIGTERM to npm reaches only us
    signalled ??= signal;
    vitest.kill(signal);
  });
}
const status = await new Promise<number>((done) => vitest.on('exit', (code, signal) => done(code ?? (signal ? 1 : 0))));
for (const kind of DEMO_KINDS) {
  await db.sql(`DROP DATABASE IF EXISTS \`${templateDatabase(run, kind)}\``).catch(() => undefined);
  rmSync(templateFolder(run, kind), { recursive: true, force: true });
}
if (!wasRunning) await db.stop();
process.exit(signalled ? 130 : status);
