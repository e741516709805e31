// A private MariaDB instance on loopback, owned by the project's own scripts
// (no systemd, no /etc/mysql): install, initialise, start, provision, stop.
import { execFile, spawn } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);

export interface InstanceOptions {
  /** Folder that holds data, socket, pid file and log. */
  dir: string;
  port: number;
  /** More mariadbd options (the Galera settings of `npm run cluster`). */
  extraArgs?: string[];
  /** An option file of its own, read instead of none (Galera's state-transfer scripts read it too). */
  defaultsFile?: string;
  /** How long start() waits for logins (a Galera joiner copies its data first). */
  startTimeoutMs?: number;
}

export interface Provisioning {
  database: string;
  user: string;
  password: string;
  /** Extra database-name patterns the user may create and use (tests make one database per file). */
  extraGrants?: string[];
}

function log(message: string) {
  console.log(`rigshelf: ${message}`);
}

async function hasCommand(name: string): Promise<boolean> {
  try {
    await run('sh', ['-c', `command -v ${name}`]);
    return true;
  } catch {
    return false;
  }
}

/** Installs Debian's mariadb-server with apt when mariadbd is missing. */
export async function ensureMariaDbInstalled(): Promise<void> {
  if ((await hasCommand('mariadbd')) || existsSync('/usr/sbin/mariadbd')) return;
  log('installing Debian mariadb-server (apt-get)');
  await aptInstall(['mariadb-server']);
}

export async function aptInstall(packages: string[]): Promise<void> {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  await spawnChecked('apt-get', ['update', '-qq'], env);
  await spawnChecked('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...packages], env);
}

function spawnChecked(cmd: string, args: string[], env: NodeJS.ProcessEnv): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(cmd, args, { stdio: 'inherit', env });
    child.on('error', reject);
    child.on('exit', (code) => (code === 0 ? resolvePromise() : reject(new Error(`${cmd} ${args.join(' ')} exited with ${code}`))));
  });
}

function sbin(name: string): string {
  return existsSync(`/usr/sbin/${name}`) ? `/usr/sbin/${name}` : name;
}

export class PrivateMariaDb {
  readonly dir: string;
  readonly port: number;
  readonly datadir: string;
  readonly socket: string;
  readonly pidFile: string;
  readonly logFile: string;
  extraArgs: string[];
  readonly startTimeoutMs: number;
  readonly defaultsFile: string | undefined;

  constructor(options: InstanceOptions) {
    this.dir = resolve(options.dir);
    this.port = options.port;
    this.extraArgs = options.extraArgs ?? [];
    this.startTimeoutMs = options.startTimeoutMs ?? 30_000;
    this.defaultsFile = options.defaultsFile;
    this.datadir = resolve(this.dir, 'data');
    this.socket = resolve(this.dir, 'mariadb.sock');
    this.pidFile = resolve(this.dir, 'mariadb.pid');
    this.logFile = resolve(this.dir, 'mariadb.log');
  }

  private rootArgs(): string[] {
    return ['--no-defaults', `--socket=${this.socket}`, '-uroot'];
  }

  /** Runs SQL as root over the private socket. */
  async sql(statement: string): Promise<string> {
    const { stdout } = await run('mariadb', [...this.rootArgs(), '-N', '-B', '-e', statement]);
    return stdout;
  }

  async isAcceptingLogins(): Promise<boolean> {
    try {
      await this.sql('SELECT 1');
      return true;
    } catch {
      return false;
    }
  }

  private async initialise(): Promise<void> {
    if (existsSync(resolve(this.datadir, 'mysql'))) return;
    log(`initialising a private MariaDB data directory in ${this.datadir}`);
    mkdirSync(this.datadir, { recursive: true });
    await run('mariadb-install-db', [
      '--no-defaults',
      '--user=root',
      `--datadir=${this.datadir}`,
      '--auth-root-authentication-method=normal',
      '--skip-test-db',
      '--skip-name-resolve',
    ]);
  }

  /** Starts mariadbd (or reuses one already running on this data directory) and waits for logins. */
  async start(): Promise<void> {
    await ensureMariaDbInstalled();
    mkdirSync(this.dir, { recursive: true });
    await this.initialise();
    if (await this.isAcceptingLogins()) {
      log(`MariaDB already running on 127.0.0.1:${this.port}`);
      return;
    }
    const child = spawn(
      sbin('mariadbd'),
      [
        this.defaultsFile ? `--defaults-file=${this.defaultsFile}` : '--no-defaults',
        '--user=root',
        `--datadir=${this.datadir}`,
        '--bind-address=127.0.0.1',
        `--port=${this.port}`,
        `--socket=${this.socket}`,
        `--pid-file=${this.pidFile}`,
        `--log-error=${this.logFile}`,
        '--skip-name-resolve',
        '--character-set-server=utf8mb4',
        '--collation-server=utf8mb4_unicode_ci',
        // an option file sets its own (mariadb-backup refuses this one on the command line it is handed)
        ...(this.defaultsFile ? [] : ['--innodb-buffer-pool-size=128M']),
        '--max-connections=300',
        ...this.extraArgs,
      ],
      // Own process group: Ctrl-C reaches our process, which then shuts MariaDB down in order.
      { detached: true, stdio: 'ignore' },
    );
    child.unref();
    let exited: number | null = null;
    child.on('exit', (code) => {
      exited = code ?? -1;
    });
    const deadline = Date.now() + this.startTimeoutMs;
    while (Date.now() < deadline) {
      if (await this.isAcceptingLogins()) {
        log(`MariaDB ready on 127.0.0.1:${this.port}`);
        return;
      }
      if (exited !== null) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    const tail = existsSync(this.logFile) ? readFileSync(this.logFile, 'utf8').split('\n').slice(-15).join('\n') : '';
    throw new Error(`MariaDB did not start on port ${this.port}. Last lines of ${this.logFile}:\n${tail}`);
  }

  /** Creates the database (utf8mb4) and the application user; the app never connects as root. */
  async provision(p: Provisioning): Promise<void> {
    const quote = (s: string) => `'${s.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
    const statements = [
      `CREATE DATABASE IF NOT EXISTS \`${p.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS ${quote(p.user)}@'127.0.0.1' IDENTIFIED BY ${quote(p.password)}`,
      `CREATE USER IF NOT EXISTS ${quote(p.user)}@'localhost' IDENTIFIED BY ${quote(p.password)}`,
      `ALTER USER ${quote(p.user)}@'127.0.0.1' IDENTIFIED BY ${quote(p.password)}`,
      `ALTER USER ${quote(p.user)}@'localhost' IDENTIFIED BY ${quote(p.password)}`,
    ];
    for (const db of [p.database, ...(p.extraGrants ?? [])]) {
      for (const host of ['127.0.0.1', 'localhost']) {
        statements.push(`GRANT ALL PRIVILEGES ON \`${db}\`.* TO ${quote(p.user)}@'${host}'`);
      }
    }
    statements.push('FLUSH PRIVILEGES');
    await this.sql(statements.join(';\n'));
  }

  /** The server's process id from its pid file, or null when it is not running. */
  pid(): number | null {
    try {
      const pid = Number(readFileSync(this.pidFile, 'utf8').trim());
      if (!Number.isInteger(pid) || pid <= 0) return null;
      // a stale pid file may name a process that is no longer ours
      const cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8');
      return cmdline.includes('mariadbd') && cmdline.includes(this.datadir) ? pid : null;
    } catch {
      return null;
    }
  }

  /**
   * Last resort for a process that is exiting (no awaiting possible): SIGTERM makes mariadbd shut
   * down cleanly on its own; SIGCONT wakes it first in case it was stopped.
   */
  signalStop(): void {
    const pid = this.pid();
    if (!pid) return;
    for (const signal of ['SIGCONT', 'SIGTERM'] as const) {
      try {
        process.kill(pid, signal);
      } catch {
        // already gone
      }
    }
  }

  /** Clean shutdown; waits until the pid file is gone. */
  async stop(): Promise<void> {
    if (!(await this.isAcceptingLogins())) return;
    try {
      await run('mariadb-admin', [...this.rootArgs(), 'shutdown']);
    } catch {
      // already going down
    }
    const deadline = Date.now() + 30_000;
    while (existsSync(this.pidFile) && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 100));
    }
    log(`MariaDB on port ${this.port} shut down`);
  }
}
