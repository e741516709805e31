// The server as its own process: what a stop stops, and a start with MariaDB down (the drain itself
// is tested in tests/api/shutdown.test.ts). Bounds here are generous on purpose (a shared 2-core machine); the
// figures themselves come from `npm run test:chaos`.
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { freePort, portOpen, processAlive, ROOT, sleep, waitFor } from '../helpers/system';

const scratch = mkdtempSync(join(tmpdir(), 'rigshelf-lifecycle-'));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

function childrenOf(pid: number): number[] {
  try {
    return readFileSync(`/proc/${pid}/task/${pid}/children`, 'utf8').trim().split(/\s+/).filter(Boolean).map(Number);
  } catch {
    return [];
  }
}

describe('npm start', () => {
  it('npm start · SIGTERM to the npm process · the server and its MariaDB stop and both ports close', async () => {
    const [dbPort, appPort] = [await freePort(), await freePort()];
    const dbDir = join(scratch, 'npm-start-db');
    const child = spawn('npm', ['start'], {
      cwd: ROOT,
      stdio: ['ignore', 'pipe', 'pipe'],
      env: {
        ...process.env,
        NODE_ENV: 'development',
        DB_PORT: String(dbPort),
        PORT: String(appPort),
        RIGSHELF_DB_DIR: dbDir,
        UPLOADS_DIR: join(scratch, 'npm-start-uploads'),
        SEARCH_INDEX_FILE: join(scratch, 'npm-start-index.json'),
        SMTP_PORT: '0',
        RIGSHELF_DEMO: '0',
      },
    });
    let output = '';
    child.stdout.on('data', (d) => (output += d));
    child.stderr.on('data', (d) => (output += d));
    const exited = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));
    try {
      const up = await waitFor(
        async () => {
          try {
            return (await fetch(`http://127.0.0.1:${appPort}/api/health`, { signal: AbortSignal.timeout(2000) })).status === 200;
          } catch {
            return false;
          }
        },
        150_000,
        500,
      );
      expect(up, output).toBe(true);
      const server = childrenOf(child.pid!)[0];
      const mariadb = Number(readFileSync(join(dbDir, 'mariadb.pid'), 'utf8').trim());
      expect(server).toBeGreaterThan(0);
      expect(processAlive(mariadb)).toBe(true);

      child.kill('SIGTERM');
      // deadline 10 s for the app, then MariaDB's own clean shutdown
      const gone = await waitFor(
        async () => !processAlive(server) && !processAlive(mariadb) && !(await portOpen(appPort)) && !(await portOpen(dbPort)),
        45_000,
        250,
      );
      expect(gone, output).toBe(true);
      expect(await Promise.race([exited, sleep(10_000).then(() => 'still running')])).toBe(0);
      expect(output).toContain('rigshelf: stopped in');
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
      const left = (() => {
        try {
          return Number(readFileSync(join(dbDir, 'mariadb.pid'), 'utf8').trim());
        } catch {
          return 0;
        }
      })();
      if (left && processAlive(left)) process.kill(left, 'SIGKILL');
    }
  });
});

describe('npm test', () => {
  it('npm test · Ctrl-C while vitest runs · its private MariaDB stops and the port closes', async () => {
    const dbPort = await freePort();
    const dbDir = join(scratch, 'npm-test-db');
    const env: NodeJS.ProcessEnv = {};
    // the inner run must not think it is a worker of this one
    for (const [k, v] of Object.entries(process.env)) if (!k.startsWith('VITEST') && k !== 'TEST') env[k] = v;
    Object.assign(env, { DB_PORT: String(dbPort), RIGSHELF_DB_DIR: dbDir });
    // its own process group, like a terminal's foreground job: Ctrl-C sends SIGINT to the whole group
    const child = spawn('npm', ['test', '--', 'tests/api/health.test.ts'], { cwd: ROOT, env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d) => (output += d));
    child.stderr.on('data', (d) => (output += d));
    const exited = new Promise<void>((done) => child.once('exit', () => done()));
    try {
      expect(await waitFor(() => output.includes('RUN'), 120_000, 100), output).toBe(true);
      const mariadb = Number(readFileSync(join(dbDir, 'mariadb.pid'), 'utf8').trim());
      process.kill(-child.pid!, 'SIGINT');
      await Promise.race([exited, sleep(60_000)]);
      expect(await waitFor(async () => !processAlive(mariadb) && !(await portOpen(dbPort)), 30_000, 250), output).toBe(true);
      expect(output).toContain(`MariaDB on port ${dbPort} shut down`);
    } finally {
      if (child.exitCode === null && child.signalCode === null) process.kill(-child.pid!, 'SIGKILL');
    }
  });
});

describe('server start-up', () => {
  it('server started directly · MariaDB not running · waits with a message, then gives up with one line and no stack', async () => {
    const dbPort = await freePort();
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
      cwd: ROOT,
      stdio: ['ignore', 'pipe', 'pipe'],
      env: {
        PATH: process.env.PATH,
        NODE_ENV: 'development',
        PORT: String(await freePort()),
        DB_PORT: String(dbPort),
        DB_PASSWORD: 'nobody-listens',
        SESSION_SECRET: 'a session secret for this test only',
        SMTP_PORT: '0',
        UPLOADS_DIR: join(scratch, 'down-uploads'),
        DB_WAIT_S: '2',
      },
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (err += d));
    const code = await new Promise<number | null>((done) => child.once('exit', (c) => done(c)));
    expect(code).toBe(1);
    expect(out).toContain(`waiting for MariaDB at 127.0.0.1:${dbPort}`);
    const lines = err.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(new RegExp(`MariaDB at 127\\.0\\.0\\.1:${dbPort} did not answer within 2 s`));
    expect(err).not.toMatch(/^\s+at /m);
  });
});
