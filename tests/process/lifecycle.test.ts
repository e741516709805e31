// The server as its own process: what a stop stops, a graceful drain under busy clients, and a
// start with MariaDB down. Bounds here are generous on purpose (a shared 2-core machine); the
// figures themselves come from `npm run test:chaos`.
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { Agent, request as httpRequest } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { boxStl } from '../helpers/meshes';
import { addMembers, freePort, loadSubmission, Member, portOpen, processAlive, ROOT, scratchDb, sleep, spawnServer, waitFor } from '../helpers/system';

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
      const up = await waitFor(async () => {
        try {
          return (await fetch(`http://127.0.0.1:${appPort}/api/health`, { signal: AbortSignal.timeout(2000) })).status === 200;
        } catch {
          return false;
        }
      }, 150_000, 500);
      expect(up, output).toBe(true);
      const server = childrenOf(child.pid!)[0];
      const mariadb = Number(readFileSync(join(dbDir, 'mariadb.pid'), 'utf8').trim());
      expect(server).toBeGreaterThan(0);
      expect(processAlive(mariadb)).toBe(true);

      child.kill('SIGTERM');
      // deadline 10 s for the app, then MariaDB's own clean shutdown
      const gone = await waitFor(async () => !processAlive(server) && !processAlive(mariadb) && !(await portOpen(appPort)) && !(await portOpen(dbPort)), 45_000, 250);
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

describe('server shutdown', () => {
  it('server · SIGTERM while keep-alive clients stay busy and an upload is in flight · the upload finishes, each connection gets Connection: close once, the process exits cleanly', async () => {
    const db = await scratchDb('drain');
    const server = await spawnServer(db.env, { SHUTDOWN_TIMEOUT_S: '8' }, 'drain');
    try {
      const [email] = await addMembers(db.db, `drain-${Date.now().toString(36)}`, 1, 'drain test password');
      const member = new Member(server.url);
      await member.signIn(email, 'drain test password');

      // busy clients: one keep-alive connection each, one request after another
      let stop = false;
      const clients = Array.from({ length: 6 }, () => ({ agent: new Agent({ keepAlive: true, maxSockets: 1 }), log: [] as ('ok' | 'close' | 'error')[] }));
      const busy = clients.map(async (c) => {
        while (!stop) {
          const outcome = await new Promise<'ok' | 'close' | 'error'>((done) => {
            const req = httpRequest(`${server.url}/api/health`, { agent: c.agent }, (res) => {
              res.resume();
              res.on('end', () => done(res.headers.connection === 'close' ? 'close' : 'ok'));
            });
            req.on('error', () => done('error'));
            req.end();
          });
          c.log.push(outcome);
          if (outcome === 'error') await sleep(50);
        }
      });

      // an upload trickling in while the signal arrives
      const boundary = '----drain-test';
      const head = Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="data"\r\n\r\n${JSON.stringify(loadSubmission('Drain test plate'))}\r\n` +
          `--${boundary}\r\nContent-Disposition: form-data; name="model"; filename="plate.stl"\r\nContent-Type: application/octet-stream\r\n\r\n`,
      );
      const stl = boxStl(30, 20, 5);
      const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
      const upload = new Promise<{ status: number; connection?: string }>((done, fail) => {
        const req = httpRequest(`${server.url}/api/parts`, {
          method: 'POST',
          agent: false,
          headers: {
            cookie: member.cookie,
            'x-csrf-token': member.token,
            'content-type': `multipart/form-data; boundary=${boundary}`,
            'content-length': String(head.length + stl.length + tail.length),
          },
        });
        req.on('response', (res) => {
          res.resume();
          done({ status: res.statusCode ?? 0, connection: res.headers.connection });
        });
        req.on('error', fail);
        void (async () => {
          req.write(head);
          const step = Math.ceil(stl.length / 8);
          for (let i = 0; i < stl.length; i += step) {
            req.write(stl.subarray(i, i + step));
            await sleep(200);
            if (i === step * 2) server.child.kill('SIGTERM');
          }
          req.end(tail);
        })();
      });

      const answer = await upload;
      await server.exited;
      stop = true;
      await Promise.all(busy);

      expect(answer).toEqual({ status: 201, connection: 'close' });
      expect(server.exit?.code).toBe(0);
      expect(server.lines.map((l) => l.text)).toContainEqual(expect.stringMatching(/^rigshelf: stopped in/));
      for (const c of clients) {
        // after its `Connection: close` answer a client only meets a closed door
        const closeAt = c.log.indexOf('close');
        expect(c.log.filter((o) => o === 'close').length).toBeLessThanOrEqual(1);
        if (closeAt >= 0) expect(c.log.slice(closeAt + 1).every((o) => o === 'error')).toBe(true);
        expect(c.log.at(-1)).toBe('error');
        c.agent.destroy();
      }
    } finally {
      await server.dispose();
      await db.dispose();
    }
  });
});
