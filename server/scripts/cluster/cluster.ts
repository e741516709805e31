// The whole loopback cluster, started and stopped in order: Galera nodes, the database and its user,
// the S3 fake with its bucket, app instance 1 (it applies the migrations and seeds the demo, once),
// instances 2 and 3, then haproxy in front. Stopping goes the other way round: instances, haproxy,
// the S3 fake, the Galera nodes last to first. Used by `npm run cluster` and `npm run test:cluster`.
import { execFile } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { promisify } from 'node:util';
import { aptInstall } from '../mariadb';
import { GaleraCluster, GALERA_PROVIDER } from './galera';
import { startHaproxy, type Balancer } from './haproxy';
import { AppInstance, scratchPaths } from './instance';
import type { ClusterPorts } from './ports';

const run = promisify(execFile);

export const ROOT = resolve(import.meta.dirname, '../../..');
export const S3_BUCKET = 'rigshelf';

export interface ClusterOptions {
  /** Data of the nodes, the object store, the instances' scratch folders and the secrets. */
  dir: string;
  ports: ClusterPorts;
  /** `s3` (the S3 fake) unless told otherwise; `local` shares one folder between the instances. */
  storage: 's3' | 'local';
  sst: 'rsync' | 'mariabackup';
  /** Seed the demo shelf (instance 1, once). */
  demo: boolean;
  /** More environment for every instance (the fault run turns model pictures off, say). */
  instanceEnv?: Record<string, string>;
  log?: (line: string) => void;
  /** Each instance's output, line by line (npm run cluster prints it with the instance's name). */
  onInstanceLine?: (instance: string, line: string) => void;
  /**
   * `compiled` (default): the instances run dist-server/, compiled first when stale, so a restart
   * does not compile the server again on a busy CPU; `tsx`: the sources, as `npm run dev` does.
   */
  server?: 'compiled' | 'tsx';
}

interface Secrets {
  dbPassword: string;
  sessionSecret: string;
}

interface S3Fake {
  /** The STORAGE and S3_* settings that point the app at the fake. */
  env?: Record<string, string>;
  close?: () => Promise<void> | void;
  stop?: () => Promise<void> | void;
}

async function hasCommand(name: string): Promise<boolean> {
  return run('sh', ['-c', `command -v ${name}`]).then(
    () => true,
    () => false,
  );
}

/** Installs from Debian only what is missing: the load balancer, rsync for SST, Galera, MariaDB. */
export async function ensureClusterPackages(sst: 'rsync' | 'mariabackup', log: (line: string) => void): Promise<void> {
  const missing: string[] = [];
  if (!existsSync('/usr/sbin/mariadbd') && !(await hasCommand('mariadbd'))) missing.push('mariadb-server');
  if (!existsSync(GALERA_PROVIDER)) missing.push('galera-4');
  if (!(await hasCommand('haproxy'))) missing.push('haproxy');
  if (!(await hasCommand('rsync'))) missing.push('rsync');
  // the SST scripts look for a listening port with one of these
  if (!(await hasCommand('lsof')) && !(await hasCommand('ss'))) missing.push('lsof');
  if (sst === 'mariabackup' && !(await hasCommand('mariadb-backup'))) missing.push('mariadb-backup');
  if (!missing.length) return;
  log(`installing from Debian: ${missing.join(' ')}`);
  await aptInstall(missing);
}

function secrets(dir: string): Secrets {
  const file = resolve(dir, 'secrets.json');
  if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8')) as Secrets;
  const made: Secrets = {
    dbPassword: randomBytes(18).toString('base64url'),
    sessionSecret: randomBytes(32).toString('base64url'),
  };
  writeFileSync(file, JSON.stringify(made, null, 2), { mode: 0o600 });
  return made;
}

async function startObjectStore(dir: string, port: number): Promise<S3Fake> {
  const modulePath = resolve(ROOT, 'server/scripts/s3-fake.ts');
  if (!existsSync(modulePath)) {
    throw new Error('STORAGE=s3 needs the S3 fake (server/scripts/s3-fake.ts); start with CLUSTER_STORAGE=local to share one folder instead');
  }
  const { startS3Fake } = (await import(modulePath)) as {
    startS3Fake: (o: { port: number; dir: string; bucket: string }) => Promise<S3Fake>;
  };
  return startS3Fake({ port, dir, bucket: S3_BUCKET });
}

export class Cluster {
  readonly galera: GaleraCluster;
  readonly instances: AppInstance[] = [];
  balancer: Balancer | null = null;
  private s3: S3Fake | null = null;
  /** What the instances get for object storage (the fake's own settings once it runs). */
  s3Env: Record<string, string> = {};
  private readonly log: (line: string) => void;
  readonly secrets: Secrets;

  constructor(readonly options: ClusterOptions) {
    this.log = options.log ?? ((line) => console.log(`cluster: ${line}`));
    mkdirSync(options.dir, { recursive: true });
    this.secrets = secrets(options.dir);
    this.galera = new GaleraCluster(resolve(options.dir, 'galera'), options.ports, options.sst, this.log);
  }

  get url(): string {
    return `http://127.0.0.1:${this.options.ports.balancer}`;
  }

  get s3Endpoint(): string {
    return `http://127.0.0.1:${this.options.ports.s3}`;
  }

  get objectDir(): string {
    return resolve(this.options.dir, 's3');
  }

  /** The environment of instance i (0-based): its own node first in DB_HOSTS, the others after. */
  instanceEnv(i: number): Record<string, string> {
    const { ports, dir, storage } = this.options;
    const name = `app${i + 1}`;
    const order = [i, ...ports.db.map((_, j) => j).filter((j) => j !== i)];
    const storageEnv: Record<string, string> = storage === 's3' ? this.s3Env : { STORAGE: 'local' };
    return {
      NODE_ENV: 'development',
      HOST: '127.0.0.1',
      PORT: String(ports.apps[i]),
      INSTANCE_ID: name,
      DB_HOST: '127.0.0.1',
      DB_PORT: String(ports.db[i]),
      DB_HOSTS: order.map((j) => `127.0.0.1:${ports.db[j]}`).join(','),
      DB_NAME: 'rigshelf',
      DB_USER: 'rigshelf',
      DB_PASSWORD: this.secrets.dbPassword,
      SESSION_SECRET: this.secrets.sessionSecret,
      // haproxy adds X-Forwarded-For: rate limits see the member's address, not the balancer's
      TRUST_PROXY: '1',
      PUBLIC_URL: this.url,
      CLIENT_DIST: resolve(ROOT, 'dist'),
      ...scratchPaths(dir, name),
      // one shared folder stands in for object storage when STORAGE=local
      ...(storage === 'local' ? { UPLOADS_DIR: resolve(dir, 'files') } : {}),
      SMTP_FAKE: '1',
      SMTP_PORT: '0',
      PAYMENTS_API_PORT: '0',
      SHUTDOWN_TIMEOUT_S: '10',
      RIGSHELF_DEMO: '0',
      ...storageEnv,
      ...this.options.instanceEnv,
    };
  }

  async start(): Promise<void> {
    const { ports, dir, storage, sst } = this.options;
    await ensureClusterPackages(sst, this.log);
    const { fresh } = await this.galera.start();
    const statuses = await this.galera.statuses();
    this.log(`Galera: ${statuses.map((s, i) => `node${i + 1} ${s?.state ?? 'down'}`).join(', ')}; cluster size ${statuses[0]?.size ?? 0}`);
    // users and grants replicate like any other statement; one node is enough
    await this.galera.nodes[0].db.provision({ database: 'rigshelf', user: 'rigshelf', password: this.secrets.dbPassword });
    if (fresh) this.log('database rigshelf and its user created');

    if (storage === 's3') {
      this.s3 = await startObjectStore(this.objectDir, ports.s3);
      this.s3Env = this.s3.env ?? {
        STORAGE: 's3',
        S3_ENDPOINT: this.s3Endpoint,
        S3_BUCKET,
        S3_REGION: 'us-east-1',
        // s3rver's own fixed account
        S3_ACCESS_KEY_ID: 'S3RVER',
        S3_SECRET_ACCESS_KEY: 'S3RVER',
        S3_FORCE_PATH_STYLE: '1',
      };
      this.log(`S3 fake on ${this.s3Endpoint}, bucket ${S3_BUCKET}`);
    }

    const compiled = (this.options.server ?? 'compiled') === 'compiled';
    if (compiled) {
      const { stdout } = await run(process.execPath, [resolve(ROOT, 'server/scripts/build-server.mjs')], { cwd: ROOT });
      if (stdout.trim()) this.log(stdout.trim().replace(/^rigshelf: /, ''));
    }
    for (let i = 0; i < ports.apps.length; i++) {
      const name = `app${i + 1}`;
      this.instances.push(new AppInstance(name, ports.apps[i], ROOT, this.instanceEnv(i), (line) => this.options.onInstanceLine?.(name, line), compiled));
    }
    // instance 1 alone first: it applies the migrations and seeds the demo, so nothing races for them
    const [first, ...rest] = this.instances;
    this.log(`starting ${first.name} (migrations${this.options.demo ? ', demo seed' : ''})`);
    await first.start(this.options.demo ? { RIGSHELF_DEMO: '1' } : {});
    this.log(`starting ${rest.map((r) => r.name).join(' and ')}`);
    await Promise.all(rest.map((r) => r.start()));

    this.balancer = startHaproxy(resolve(dir, 'haproxy'), ports, (line) => this.log(`haproxy: ${line}`));
    const until = Date.now() + 30_000;
    while (Date.now() < until) {
      const ok = await fetch(`${this.url}/api/health`, { signal: AbortSignal.timeout(2000) }).then(
        (r) => r.status === 200,
        () => false,
      );
      if (ok) return;
      await new Promise((r) => setTimeout(r, 250));
    }
    throw new Error(`haproxy on ${this.url} did not answer /api/health`);
  }

  /** Stops the S3 fake (a fault of the fault run); its objects stay on disk for the restart. */
  async stopObjectStore(): Promise<void> {
    await (this.s3?.close ?? this.s3?.stop)?.call(this.s3);
  }

  /** Starts the S3 fake again on its port, over the same objects. */
  async startObjectStore(): Promise<void> {
    this.s3 = await startObjectStore(this.objectDir, this.options.ports.s3);
  }

  /** Instances first (they drain), then haproxy, the S3 fake, the Galera nodes last to first. */
  async stop(): Promise<void> {
    this.log('stopping the app instances');
    await Promise.all(this.instances.map((i) => i.stop().catch(() => undefined)));
    if (this.balancer) {
      this.log('stopping haproxy');
      await this.balancer.stop();
    }
    if (this.s3) {
      this.log('stopping the S3 fake');
      await (this.s3.close ?? this.s3.stop)?.call(this.s3);
    }
    await this.galera.stop();
    this.log('stopped');
  }

  describe(): string {
    const { ports } = this.options;
    return [
      `Rigshelf cluster is up:`,
      `  the shelf (haproxy)    ${this.url}`,
      `  haproxy stats          http://127.0.0.1:${ports.stats}/`,
      ...this.instances.map((i, n) => `  ${i.name}                   ${i.url}  (Galera node${n + 1}, 127.0.0.1:${ports.db[n]})`),
      this.options.storage === 's3'
        ? `  S3 fake                ${this.s3Endpoint}  bucket ${S3_BUCKET}`
        : `  files                  ${resolve(this.options.dir, 'files')} (STORAGE=local)`,
      `  data                   ${this.options.dir}`,
      `Ctrl-C stops the instances, haproxy, the S3 fake, then the Galera nodes.`,
    ].join('\n');
  }
}
