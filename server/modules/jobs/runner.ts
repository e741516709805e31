// Each instance's background loop for shared work: it keeps this instance's leases alive, takes over
// photos and model pictures whose instance went away (claims.ts), and does the shared clean-ups one
// instance at a time under a named lease.
import { QueryTypes, type Sequelize } from 'sequelize';
import { JOB_TABLES, type JobClaims, type JobTable } from './claims';

export interface JobRunnerDeps {
  sequelize: Sequelize;
  claims: JobClaims;
  /** Hands claimed photo rows (by table) to the photo jobs. */
  takePhotos(table: JobTable, ids: number[]): Promise<void>;
  /** Hands claimed models to the picture jobs; undefined when pictures are off. */
  takeRenders?: (ids: number[]) => Promise<void>;
  /** Photos and pictures in hand here: new ones are only taken while this is small. */
  busy(): number;
  /** Further shared chores (refunds that are due, say): run with the clean-ups, by one instance at a time. */
  sharedChores?: (() => Promise<void>)[];
}

/** Shared clean-ups (expired rate-limit counters, old change-log rows, due refunds) run at most this often. */
const CHORES_EVERY_MS = 60_000;
/** Change-log rows older than this are dropped (the newest row always stays). */
const CHANGE_LOG_KEEP_S = 3600;
const TAKE_AT_ONCE = 2;

export function createJobRunner({ sequelize, claims, takePhotos, takeRenders, busy, sharedChores = [] }: JobRunnerDeps) {
  const intervalMs = Math.min(5000, (claims.leaseS * 1000) / 3);
  const presence = `instance:${claims.instanceId}`.slice(0, 128);
  let timer: NodeJS.Timeout | null = null;
  let running: Promise<void> | null = null;
  let lastChores = 0;
  let failing = false;
  /** Work that could not be done at start (the store was away, say), tried again each round under its named lease. */
  const deferred = new Map<string, { task: () => Promise<void>; failures: number }>();

  async function runDeferred() {
    for (const [name, entry] of deferred) {
      // one instance at a time; the lease outlasts a slow run, as no heartbeat beats during it
      if (!(await claims.tryLease(name, Math.max(claims.leaseS, 120)))) continue;
      try {
        await entry.task();
        deferred.delete(name);
        console.log(`rigshelf: ${name} done on try ${entry.failures + 2}`);
      } catch (err) {
        entry.failures += 1;
        // the first failure was reported by whoever deferred the work; then about once a minute
        if (entry.failures % 12 === 0)
          console.error(`rigshelf: ${name} still failing (${err instanceof Error ? err.message : String(err)}); tried again later`);
      } finally {
        await claims.releaseLease(name).catch(() => undefined);
      }
    }
  }

  async function chores() {
    if (Date.now() - lastChores < CHORES_EVERY_MS) return;
    lastChores = Date.now();
    if (!(await claims.tryLease('chores', 30))) return;
    await sequelize.query('DELETE FROM rate_limits WHERE reset_at < NOW(3) LIMIT 5000', { type: QueryTypes.DELETE });
    const [newest] = await sequelize.query<{ id: number | null }>('SELECT MAX(id) AS id FROM shelf_changes', { type: QueryTypes.SELECT });
    if (newest?.id) {
      await sequelize.query('DELETE FROM shelf_changes WHERE id < :id AND created_at < NOW(3) - INTERVAL :keep SECOND LIMIT 5000', {
        replacements: { id: newest.id, keep: CHANGE_LOG_KEEP_S },
        type: QueryTypes.DELETE,
      });
    }
    // instances that stopped long ago leave their presence rows behind
    await sequelize.query("DELETE FROM job_leases WHERE name LIKE 'instance:%' AND lease_until < NOW(3) - INTERVAL 1 DAY", { type: QueryTypes.DELETE });
    for (const chore of sharedChores) await chore();
  }

  /** One round: leases, take-overs, chores. */
  async function tick(): Promise<void> {
    await claims.tryLease(presence);
    await claims.heartbeat();
    for (const table of JOB_TABLES) {
      if (busy() >= TAKE_AT_ONCE) break;
      const ids = await claims.claimDue('photo', table, TAKE_AT_ONCE);
      if (ids.length) await takePhotos(table, ids);
    }
    if (takeRenders && busy() < TAKE_AT_ONCE) {
      const ids = await claims.claimDue('render', 'part_files', 1);
      if (ids.length) await takeRenders(ids);
    }
    await runDeferred();
    await chores();
  }

  function round() {
    if (running) return;
    running = tick()
      .then(() => {
        if (failing) console.log('rigshelf: background job loop is working again');
        failing = false;
      })
      .catch((err: unknown) => {
        if (!failing) console.error(`rigshelf: background job loop failed: ${err instanceof Error ? err.message : String(err)}`);
        failing = true;
      })
      .finally(() => {
        running = null;
      });
  }

  return {
    intervalMs,
    tick,
    /** Announces this instance (so start-up sweeps know others are up) before the first round. */
    async announce(): Promise<void> {
      await claims.tryLease(presence);
    },
    /** Runs `task` in a later round, under the named lease `name`, until it succeeds. */
    later(name: string, task: () => Promise<void>): void {
      deferred.set(name, { task, failures: 0 });
    },
    start() {
      if (timer) return;
      timer = setInterval(round, intervalMs);
      timer.unref();
      round();
    },
    async close(): Promise<void> {
      if (timer) clearInterval(timer);
      timer = null;
      await running;
      await claims.releaseLease(presence).catch(() => undefined);
    },
  };
}

export type JobRunner = ReturnType<typeof createJobRunner>;
