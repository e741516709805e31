// The real server as a separate process, on its own ports, its own MariaDB (a throw-away data
// directory) and its own uploads folder: for the process, chaos and load runs.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { hashPassword } from '../../server/security/password';
import { PrivateMariaDb } from '../../server/scripts/mariadb';

export const ROOT = resolve(import.meta.dirname, '../..');

/** A port nobody listens on right now (the kernel's pick). */
export function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const probe = createServer();
    probe.once('error', fail);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => done(port));
    });
  });
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function portOpen(port: number): Promise<boolean> {
  return new Promise((done) => {
    const socket = new Socket();
    socket.setTimeout(1000);
    socket.once('connect', () => {
      socket.destroy();
      done(true);
    });
    socket.once('error', () => done(false));
    socket.once('timeout', () => {
      socket.destroy();
      done(false);
    });
    socket.connect(port, '127.0.0.1');
  });
}

export function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export async function waitFor(check: () => boolean | Promise<boolean>, timeoutMs: number, stepMs = 100): Promise<boolean> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    if (await check()) return true;
    if (Date.now() >= until) return false;
    await sleep(stepMs);
  }
}

export interface ScratchDb {
  db: PrivateMariaDb;
  port: number;
  env: Record<string, string>;
  /** Stops MariaDB (waking it first if it was frozen) and removes its data directory. */
  dispose(): Promise<void>;
}

/** A MariaDB of its own in a temporary folder, with the app's database and user. */
export async function scratchDb(label: string): Promise<ScratchDb> {
  const dir = mkdtempSync(join(tmpdir(), `rigshelf-${label}-db-`));
  const port = await freePort();
  const db = new PrivateMariaDb({ dir, port });
  const password = randomBytes(12).toString('base64url');
  await db.start();
  await db.provision({ database: 'rigshelf', user: 'rigshelf', password });
  return {
    db,
    port,
    env: { DB_HOST: '127.0.0.1', DB_PORT: String(port), DB_NAME: 'rigshelf', DB_USER: 'rigshelf', DB_PASSWORD: password },
    async dispose() {
      const pid = db.pid();
      if (pid) process.kill(pid, 'SIGCONT');
      await db.stop().catch(() => undefined);
      const left = db.pid();
      if (left) process.kill(left, 'SIGKILL');
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export interface ServerProcess {
  child: ChildProcess;
  url: string;
  port: number;
  uploadsDir: string;
  /** Every line the server printed, with the time it arrived. */
  lines: { at: number; stream: 'out' | 'err'; text: string }[];
  /** Set once the process has exited. */
  exit: { at: number; code: number | null; signal: NodeJS.Signals | null } | null;
  exited: Promise<void>;
  dispose(): Promise<void>;
}

/**
 * Starts `node --import tsx server/index.ts` (the server started directly) against `dbEnv`,
 * and resolves once it says it is serving.
 */
export async function spawnServer(
  dbEnv: Record<string, string>,
  extra: Record<string, string> = {},
  label = 'server',
  startTimeoutMs = 120_000,
): Promise<ServerProcess> {
  const port = await freePort();
  const scratch = mkdtempSync(join(tmpdir(), `rigshelf-${label}-`));
  const uploadsDir = join(scratch, 'uploads');
  const env: NodeJS.ProcessEnv = {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: 'development',
    HOST: '127.0.0.1',
    PORT: String(port),
    ...dbEnv,
    SESSION_SECRET: randomBytes(24).toString('base64url'),
    UPLOADS_DIR: uploadsDir,
    SEARCH_INDEX_FILE: join(scratch, 'search-index.json'),
    CLIENT_DIST: join(scratch, 'no-client'),
    SMTP_FAKE: '1',
    SMTP_PORT: '0',
    // the demo seed takes ~15 s on a busy machine; runs seed what they need with publishedParts()
    RIGSHELF_DEMO: '0',
    LOGIN_LIMIT_PER_IP: '1000000',
    LOGIN_LIMIT_PER_ACCOUNT: '1000000',
    PASSWORD_SCRYPT_LOG_N: '12',
    ...extra,
  };
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  const proc: ServerProcess = {
    child,
    url: `http://127.0.0.1:${port}`,
    port,
    uploadsDir,
    lines: [],
    exit: null,
    exited: new Promise<void>((done) =>
      child.once('exit', (code, signal) => {
        proc.exit = { at: Date.now(), code, signal };
        done();
      }),
    ),
    async dispose() {
      if (!proc.exit) {
        child.kill('SIGKILL');
        await proc.exited;
      }
      rmSync(scratch, { recursive: true, force: true });
    },
  };
  for (const [stream, source] of [
    ['out', child.stdout!],
    ['err', child.stderr!],
  ] as const) {
    let rest = '';
    source.setEncoding('utf8');
    source.on('data', (chunk: string) => {
      const parts = (rest + chunk).split('\n');
      rest = parts.pop() ?? '';
      for (const text of parts) proc.lines.push({ at: Date.now(), stream, text });
      if (process.env.RIGSHELF_SERVER_LOG) for (const text of parts) console.log(`[${label}] ${text}`);
    });
  }
  const serving = await waitFor(() => proc.exit !== null || proc.lines.some((l) => l.text.startsWith('rigshelf: serving')), startTimeoutMs, 50);
  if (!serving || proc.exit) {
    const tail = proc.lines
      .slice(-20)
      .map((l) => l.text)
      .join('\n');
    await proc.dispose();
    throw new Error(`the server did not start:\n${tail}`);
  }
  return proc;
}

/** Adds members straight into the database (one shared password hash), for load runs. */
export async function addMembers(db: PrivateMariaDb, prefix: string, count: number, password: string): Promise<string[]> {
  const hash = await hashPassword(password, 12);
  const emails = Array.from({ length: count }, (_, i) => `${prefix}-${i + 1}@crew.test`);
  const values = emails.map((e, i) => `('${e}', 'Load member ${i + 1}', '${hash}', 'member', 'active', NULL, NOW(), NOW(), NOW())`).join(',\n');
  await db.sql(
    `INSERT INTO rigshelf.users (email, display_name, password_hash, role, status, crew_role, email_verified_at, created_at, updated_at) VALUES ${values}`,
  );
  return emails;
}

/** A signed-in (or anonymous) client with its own cookie and CSRF token, over fetch. */
export class Member {
  cookie = '';
  token = '';
  constructor(readonly base: string) {}

  private remember(res: Response) {
    const set = res.headers.getSetCookie();
    for (const c of set) {
      const pair = c.split(';')[0];
      if (pair.startsWith('rigshelf.sid=')) this.cookie = pair;
    }
  }

  async request(method: string, path: string, body?: unknown, timeoutMs = 30_000, extraHeaders: Record<string, string> = {}): Promise<Response> {
    const headers: Record<string, string> = { ...extraHeaders };
    if (this.cookie) headers.cookie = this.cookie;
    if (method !== 'GET') headers['x-csrf-token'] = this.token;
    let payload: RequestInit['body'];
    if (body instanceof FormData) payload = body;
    else if (body !== undefined) {
      headers['content-type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const res = await fetch(this.base + path, { method, headers, body: payload, signal: AbortSignal.timeout(timeoutMs) });
    this.remember(res);
    return res;
  }

  async refreshToken() {
    const res = await this.request('GET', '/api/auth/csrf');
    if (res.status !== 200) throw new Error(`csrf: ${res.status}`);
    this.token = ((await res.json()) as { csrfToken: string }).csrfToken;
  }

  async signIn(email: string, password: string) {
    await this.refreshToken();
    const res = await this.request('POST', '/api/auth/login', { email, password });
    if (res.status !== 200) throw new Error(`sign-in of ${email}: ${res.status} ${await res.text()}`);
    await this.refreshToken();
  }
}

/** A part submission body for load runs (invented content). */
export function loadSubmission(title: string) {
  return {
    title,
    summary: 'A plate for load testing that holds a small monitor on a 15 mm rod.',
    description: 'Print it flat. Invented for a load run.',
    category: 'monitors-video',
    bodies: [],
    mounts: [{ slug: 'rods-15-60' }],
    keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }],
    safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false },
    licence: 'CC-BY-4.0',
    recipes: [
      {
        purpose: 'set-ready',
        material: 'PETG',
        nozzleMm: 0.4,
        layerMm: 0.2,
        walls: 4,
        topBottomLayers: 5,
        infillPct: 40,
        infillPattern: 'gyroid',
        hotendC: 240,
        bedC: 80,
        speedMmS: 60,
        supports: 'none',
        orientationNote: 'Plate face down',
      },
    ],
  };
}

/**
 * Puts `count` parts on the shelf: an author of their own submits them through the API and they
 * are published straight in the database (the review desk is not what a load run measures).
 * Returns the part ids and the download URLs of their models.
 */
export async function publishedParts(db: PrivateMariaDb, url: string, count: number, model: Buffer) {
  const [email] = await addMembers(db, `shelf-author-${Date.now().toString(36)}`, 1, 'shelf author password');
  const author = new Member(url);
  await author.signIn(email, 'shelf author password');
  const ids: number[] = [];
  const titles = ['Monitor plate', 'Rod clamp', 'Cheese plate', 'Handle bracket', 'Receiver cradle', 'Follow-focus arm'];
  for (let i = 0; i < count; i++) {
    const form = new FormData();
    form.append('data', JSON.stringify(loadSubmission(`${titles[i % titles.length]} for 15 mm rods ${i + 1}`)));
    form.append('model', new Blob([new Uint8Array(model)]), `part-${i + 1}.stl`);
    const res = await author.request('POST', '/api/parts', form);
    if (res.status !== 201) throw new Error(`seeding a part: ${res.status} ${await res.text()}`);
    ids.push(((await res.json()) as { id: number }).id);
  }
  const list = ids.join(',');
  await db.sql(
    `UPDATE rigshelf.part_revisions SET status = 'published' WHERE part_id IN (${list});
     UPDATE rigshelf.parts SET status = 'published', published_revision_id = latest_revision_id, published_at = NOW() WHERE id IN (${list})`,
  );
  const downloads: string[] = [];
  for (const id of ids) {
    const detail = (await (await author.request('GET', `/api/parts/${id}`)).json()) as { files: { kind: string; downloadUrl: string }[] };
    for (const f of detail.files) if (f.kind === 'model') downloads.push(f.downloadUrl);
  }
  return { ids, downloads };
}
