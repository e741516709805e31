// A MariaDB Galera cluster on loopback for `npm run cluster`: one private mariadbd per node (the
// project's PrivateMariaDb with the wsrep options added), each with its own data directory and its
// own client, replication, IST and SST ports. The first start bootstraps node 1 (--wsrep-new-cluster)
// and the others join by state transfer; a later start bootstraps from the node Galera marked
// safe_to_bootstrap (the last one to stop) or, after a crash, from the most advanced one.
import { execFile } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { promisify } from 'node:util';
import { PrivateMariaDb } from '../mariadb';
import type { ClusterPorts } from './ports';

const run = promisify(execFile);

export const GALERA_PROVIDER = '/usr/lib/galera/libgalera_smm.so';

export interface GraState {
  uuid: string;
  seqno: number;
  safeToBootstrap: boolean;
}

export interface NodeStatus {
  size: number;
  state: string;
  ready: boolean;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export class GaleraNode {
  readonly db: PrivateMariaDb;
  readonly name: string;
  /** After a crash: the position read back from InnoDB, handed to the next start (as galera_recovery does). */
  private startPosition: string | null = null;

  constructor(
    readonly index: number,
    readonly dir: string,
    private readonly ports: ClusterPorts,
    private readonly sst: 'rsync' | 'mariabackup' = 'rsync',
    private readonly log: (line: string) => void = console.log,
  ) {
    this.name = `node${index + 1}`;
    this.db = new PrivateMariaDb({ dir, port: ports.db[index], startTimeoutMs: 180_000, defaultsFile: resolve(dir, 'my.cnf') });
  }

  get port(): number {
    return this.ports.db[this.index];
  }

  /**
   * The node's option file: the wsrep settings, read by mariadbd and by the state-transfer scripts
   * (which would otherwise read the system's /etc/mysql).
   */
  optionFile(): string {
    const lines = this.options().map((o) => {
      const [key, ...value] = o.replace(/^--/, '').split('=');
      return value.length ? `${key} = ${value.join('=').includes(';') ? `"${value.join('=')}"` : value.join('=')}` : key;
    });
    return `# written by npm run cluster; changes are overwritten\n[mysqld]\n${lines.join('\n')}\n\n[sst]\nsst-syslog = -1\n`;
  }

  /** The wsrep options of this node. */
  options(): string[] {
    const i = this.index;
    const members = this.ports.galera.map((p) => `127.0.0.1:${p}`).join(',');
    const provider = [
      `gmcast.listen_addr=tcp://127.0.0.1:${this.ports.galera[i]}`,
      `ist.recv_addr=127.0.0.1:${this.ports.ist[i]}`,
      'gcache.size=128M',
      // a node killed on loopback is noticed quickly; these keep a busy 2-core machine from
      // declaring live nodes dead
      'evs.suspect_timeout=PT5S',
      'evs.inactive_timeout=PT15S',
    ].join(';');
    return [
      '--wsrep-on=ON',
      `--wsrep-provider=${GALERA_PROVIDER}`,
      '--wsrep-cluster-name=rigshelf',
      `--wsrep-cluster-address=gcomm://${members}`,
      `--wsrep-node-name=${this.name}`,
      `--wsrep-node-address=127.0.0.1:${this.ports.galera[i]}`,
      `--wsrep-provider-options=${provider}`,
      `--wsrep-sst-method=${this.sst}`,
      `--wsrep-sst-receive-address=127.0.0.1:${this.ports.sst[i]}`,
      ...(this.sst === 'mariabackup' ? ['--wsrep-sst-auth=root:'] : []),
      // what Galera requires of the tables it replicates
      '--binlog-format=ROW',
      '--default-storage-engine=InnoDB',
      '--innodb-autoinc-lock-mode=2',
      // durability comes from the other nodes holding the write set; one flush a second per node
      '--innodb-flush-log-at-trx-commit=2',
      '--innodb-buffer-pool-size=96M',
      // reads wait until this node has applied every write set committed before them anywhere: a
      // session written through one instance is there when the member's next request reads it on another
      '--wsrep-sync-wait=1',
    ];
  }

  /** Starts mariadbd and waits until the node is Synced with the cluster. */
  async start(bootstrap: boolean): Promise<void> {
    mkdirSync(this.dir, { recursive: true });
    writeFileSync(resolve(this.dir, 'my.cnf'), this.optionFile());
    // bootstrapping a new cluster is a start-up choice, never written into the option file
    const state = this.grastate();
    if (state && state.seqno < 0 && !this.startPosition) await this.recoveredSeqno();
    this.db.extraArgs = [...(bootstrap ? ['--wsrep-new-cluster'] : []), ...(this.startPosition ? [`--wsrep-start-position=${this.startPosition}`] : [])];
    this.startPosition = null;
    this.log(`starting Galera ${this.name} on 127.0.0.1:${this.port}${bootstrap ? ' (bootstrapping the cluster)' : ''}`);
    await this.db.start();
    if (!(await this.waitSynced(180_000))) throw new Error(`Galera ${this.name} did not reach Synced; see ${this.db.logFile}`);
  }

  async status(): Promise<NodeStatus | null> {
    try {
      const out = await this.db.sql("SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_cluster_size', 'wsrep_local_state_comment', 'wsrep_ready')");
      const values = new Map(
        out
          .split('\n')
          .filter(Boolean)
          .map((l) => l.split('\t') as [string, string]),
      );
      return {
        size: Number(values.get('wsrep_cluster_size') ?? 0),
        state: values.get('wsrep_local_state_comment') ?? '',
        ready: values.get('wsrep_ready') === 'ON',
      };
    } catch {
      return null;
    }
  }

  async waitSynced(timeoutMs: number): Promise<boolean> {
    const until = Date.now() + timeoutMs;
    while (Date.now() < until) {
      const s = await this.status();
      if (s?.state === 'Synced' && s.ready) return true;
      await sleep(250);
    }
    return false;
  }

  pid(): number | null {
    return this.db.pid();
  }

  async stop(): Promise<void> {
    this.log(`stopping Galera ${this.name}`);
    const pid = this.pid();
    if (pid) process.kill(pid, 'SIGCONT');
    await this.db.stop();
    // a node that would not shut down over its socket (still joining, say) gets SIGTERM, then SIGKILL
    const left = this.pid();
    if (left) {
      process.kill(left, 'SIGTERM');
      const until = Date.now() + 30_000;
      while (this.pid() && Date.now() < until) await sleep(200);
      const still = this.pid();
      if (still) process.kill(still, 'SIGKILL');
    }
  }

  get grastateFile(): string {
    return resolve(this.db.datadir, 'grastate.dat');
  }

  grastate(): GraState | null {
    if (!existsSync(this.grastateFile)) return null;
    const text = readFileSync(this.grastateFile, 'utf8');
    const field = (name: string) => new RegExp(`^${name}:\\s*(\\S+)`, 'm').exec(text)?.[1] ?? '';
    return { uuid: field('uuid'), seqno: Number(field('seqno') || -1), safeToBootstrap: field('safe_to_bootstrap') === '1' };
  }

  markSafeToBootstrap(): void {
    const text = readFileSync(this.grastateFile, 'utf8');
    writeFileSync(this.grastateFile, text.replace(/^safe_to_bootstrap:\s*\d/m, 'safe_to_bootstrap: 1'));
  }

  /** After a crash grastate.dat says seqno -1; mariadbd --wsrep-recover reads the position from InnoDB. */
  async recoveredSeqno(): Promise<number> {
    const state = this.grastate();
    if (state && state.seqno >= 0) return state.seqno;
    const logFile = resolve(this.dir, 'recover.log');
    rmSync(logFile, { force: true });
    await run('/usr/sbin/mariadbd', [
      `--defaults-file=${resolve(this.dir, 'my.cnf')}`,
      '--user=root',
      `--datadir=${this.db.datadir}`,
      `--socket=${resolve(this.dir, 'recover.sock')}`,
      '--skip-networking',
      `--log-error=${logFile}`,
      '--wsrep-recover',
    ]).catch(() => undefined);
    // the line may run straight into the next one's date: "…:15" then "2026-12-03  7:22:28"
    const found = /Recovered position:\s*([0-9a-f-]+):(-?\d+?)(?=\d{4}-\d\d-\d\d\s|\s|$)/.exec(existsSync(logFile) ? readFileSync(logFile, 'utf8') : '');
    if (!found) return -1;
    this.startPosition = `${found[1]}:${found[2]}`;
    return Number(found[2]);
  }
}

export class GaleraCluster {
  readonly nodes: GaleraNode[];

  constructor(
    dir: string,
    ports: ClusterPorts,
    sst: 'rsync' | 'mariabackup' = 'rsync',
    private readonly log: (line: string) => void = console.log,
  ) {
    this.nodes = ports.db.map((_, i) => new GaleraNode(i, resolve(dir, `node${i + 1}`), ports, sst, log));
  }

  /** The node to bootstrap from: none has data yet → node 1; else the safe one; else the most advanced. */
  async bootstrapNode(): Promise<{ node: GaleraNode; fresh: boolean; why: string }> {
    const states = this.nodes.map((n) => n.grastate());
    if (states.every((s) => s === null)) return { node: this.nodes[0], fresh: true, why: 'first start' };
    const safe = this.nodes.find((n, i) => states[i]?.safeToBootstrap);
    if (safe) return { node: safe, fresh: false, why: `${safe.name} stopped last (safe_to_bootstrap: 1)` };
    let best = this.nodes[0];
    let bestSeqno = -2;
    for (const n of this.nodes) {
      if (!n.grastate()) continue;
      const seqno = await n.recoveredSeqno();
      if (seqno > bestSeqno) {
        best = n;
        bestSeqno = seqno;
      }
    }
    best.markSafeToBootstrap();
    return { node: best, fresh: false, why: `no node stopped cleanly; ${best.name} holds the highest position (seqno ${bestSeqno})` };
  }

  async start(): Promise<{ fresh: boolean }> {
    const running = await Promise.all(this.nodes.map((n) => n.status()));
    if (running.every((s) => s?.state === 'Synced')) {
      this.log('Galera cluster already running');
      return { fresh: false };
    }
    const { node, fresh, why } = await this.bootstrapNode();
    this.log(`bootstrapping from ${node.name}: ${why}`);
    await node.start(true);
    // the others join one at a time: each takes a state transfer from a donor
    for (const other of this.nodes) if (other !== node) await other.start(false);
    return { fresh };
  }

  /** Stops the nodes in reverse order, so node 1 (stopped last) may bootstrap the next start. */
  async stop(): Promise<void> {
    for (const node of [...this.nodes].reverse()) await node.stop().catch((err) => this.log(`${node.name}: ${String(err)}`));
  }

  async statuses(): Promise<(NodeStatus | null)[]> {
    return Promise.all(this.nodes.map((n) => n.status()));
  }
}
