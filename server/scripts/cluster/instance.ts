// One app instance of the cluster: the compiled server (`node dist-server/server/index.js`, as
// `npm start` runs it; `node --import tsx server/index.ts` with CLUSTER_SERVER=tsx) with its own
// port, uploads scratch folder and search index file, and the shared database, object store and
// session secret. Its environment goes through the app's own config module before it is started.
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { loadConfig } from '../../config';

export interface InstanceLine {
  at: number;
  stream: 'out' | 'err';
  text: string;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export class AppInstance {
  child: ChildProcess | null = null;
  readonly lines: InstanceLine[] = [];
  exit: { at: number; code: number | null; signal: NodeJS.Signals | null } | null = null;
  private exited: Promise<void> = Promise.resolve();

  constructor(
    readonly name: string,
    readonly port: number,
    readonly root: string,
    readonly env: Record<string, string>,
    private readonly onLine: (line: string) => void = () => undefined,
    /** The compiled server (dist-server/, built by the caller); false: the sources through tsx. */
    private readonly compiled = true,
  ) {
    // a bad value stops `npm run cluster` here, with the config module's own message
    loadConfig(env);
  }

  get url(): string {
    return `http://127.0.0.1:${this.port}`;
  }

  get running(): boolean {
    return this.child !== null && this.exit === null;
  }

  /** Starts the instance and resolves once it serves (or rejects with the last lines it printed). */
  async start(extra: Record<string, string> = {}, timeoutMs = 240_000): Promise<void> {
    this.exit = null;
    // a new name for every process: a restarted instance must not take its dead predecessor's job
    // claims for its own (they would be resumed without counting the lease that ran out, and a photo
    // whose try died with the process would look as if it had failed once already)
    const instanceId = `${this.env.INSTANCE_ID ?? this.name}-${Date.now().toString(36)}`;
    const args = this.compiled ? ['--enable-source-maps', 'dist-server/server/index.js'] : ['--import', 'tsx', 'server/index.ts'];
    const child = spawn(process.execPath, args, {
      cwd: this.root,
      env: { PATH: process.env.PATH, HOME: process.env.HOME, ...this.env, INSTANCE_ID: instanceId, ...extra },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    this.child = child;
    const from = this.lines.length;
    this.exited = new Promise<void>((done) =>
      child.once('exit', (code, signal) => {
        this.exit = { at: Date.now(), code, signal };
        done();
      }),
    );
    for (const [stream, source] of [
      ['out', child.stdout!],
      ['err', child.stderr!],
    ] as const) {
      let rest = '';
      source.setEncoding('utf8');
      source.on('data', (chunk: string) => {
        const parts = (rest + chunk).split('\n');
        rest = parts.pop() ?? '';
        for (const text of parts) {
          this.lines.push({ at: Date.now(), stream, text });
          this.onLine(text);
        }
      });
    }
    const until = Date.now() + timeoutMs;
    while (Date.now() < until) {
      if (this.lines.slice(from).some((l) => l.text.startsWith('rigshelf: serving'))) return;
      if (this.exit) break;
      await sleep(100);
    }
    const tail = this.lines
      .slice(from)
      .slice(-15)
      .map((l) => l.text)
      .join('\n');
    if (!this.exit) child.kill('SIGKILL');
    throw new Error(`${this.name} did not start:\n${tail}`);
  }

  /** SIGTERM and the app's own drain; SIGKILL if it outlives its shutdown deadline. */
  async stop(): Promise<void> {
    if (!this.running) return;
    this.child!.kill('SIGTERM');
    const limit = (Number(this.env.SHUTDOWN_TIMEOUT_S ?? 10) + 5) * 1000;
    const late = setTimeout(() => this.child?.kill('SIGKILL'), limit);
    await this.exited;
    clearTimeout(late);
  }

  /** A crash: SIGKILL, no drain. */
  async kill(): Promise<void> {
    if (!this.running) return;
    this.child!.kill('SIGKILL');
    await this.exited;
  }
}

export function scratchPaths(dir: string, name: string) {
  return {
    UPLOADS_DIR: resolve(dir, name, 'uploads'),
    SEARCH_INDEX_FILE: resolve(dir, name, 'search-index.json'),
  };
}
