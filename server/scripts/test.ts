// `npm test`: a private MariaDB for tests (own data directory and port, never the demo data),
// Debian's chromium for the browser tests, a fresh client build, then the whole vitest suite.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { ensureClientBuilt } from './build-client';
import { localInstance, root } from './local-env';
import { aptInstall } from './mariadb';

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
if (!wasRunning) await db.stop();
process.exit(signalled ? 130 : status);
