// Background jobs claimed through the database, so that with several app instances on one database
// each job runs on exactly one of them, and a job whose instance went away is taken over.
//
// A job row (a photo to clean, a model to draw) carries `claimed_by` and `lease_until`. Claiming is
// one conditional UPDATE: it only succeeds while the row is still waiting and nobody else holds an
// unexpired lease, so two instances asking at once cannot both win (on one server the row lock
// decides, on a Galera cluster certification fails the second commit). The holder renews its leases
// with a heartbeat; when an instance dies its leases run out and another instance's poll takes the
// job over, counting it in `lease_expiries` ("the instance died"), apart from the tries that ran and
// failed (`processing_attempts` / `render_attempts`). Named leases (`job_leases`) let one instance
// at a time do shared chores.
import { Model, QueryTypes, type ModelStatic, type Sequelize } from 'sequelize';
import { transact } from '../../db/transaction';

export type JobKind = 'photo' | 'render';
export type JobTable = 'part_files' | 'report_photos' | 'wanted_photos';
export const JOB_TABLES: readonly JobTable[] = ['part_files', 'report_photos', 'wanted_photos'];

/** A job whose holders went away this many times (it may be what takes them down) is failed for good. */
export const MAX_LEASE_EXPIRIES = 2;

const WAITING: Record<JobKind, string> = {
  photo: "processing = 'pending'",
  render: "kind = 'model' AND render_status = 'pending'",
};

export interface Claim {
  claimed: boolean;
  /** How often an earlier holder's lease ran out before it finished (this takeover included). */
  leaseExpiries: number;
}

/** The job table of a Sequelize row (part_files, report_photos, wanted_photos), or null for anything else. */
export function jobTableOf(row: unknown): JobTable | null {
  if (!(row instanceof Model)) return null;
  const table = (row.constructor as ModelStatic<Model>).getTableName();
  const name = typeof table === 'string' ? table : table.tableName;
  return (JOB_TABLES as readonly string[]).includes(name) ? (name as JobTable) : null;
}

export interface JobClaims {
  readonly instanceId: string;
  readonly leaseS: number;
  /** Claims one waiting job (or keeps it, when this instance holds it already). */
  claim(kind: JobKind, table: JobTable, id: number): Promise<Claim>;
  /** Gives a job back (it finished, or shutdown cut it off and another instance may take it). */
  release(table: JobTable, id: number): Promise<void>;
  /**
   * Claims up to `limit` waiting jobs nobody holds: ones whose holder's lease ran out, and ones never
   * claimed that have waited longer than a lease (their instance died between commit and start).
   */
  claimDue(kind: JobKind, table: JobTable, limit: number): Promise<number[]>;
  /** Moves this instance's leases on (jobs and named leases). */
  heartbeat(): Promise<void>;
  /** A named lease: true while this instance holds `name` (taken when free or expired). */
  tryLease(name: string, seconds?: number): Promise<boolean>;
  releaseLease(name: string): Promise<void>;
  /** Other instances holding a live `instance:` lease (the ones that are up). */
  othersAlive(): Promise<number>;
  /**
   * At a start with no other instance up: every job lease another instance holds is a dead one's,
   * so it ends now and the start-up recovery takes those jobs over at once instead of a lease later.
   */
  expireOthers(): Promise<void>;
}

const leaseExpr = 'NOW(3) + INTERVAL :lease SECOND';

export function createJobClaims(sequelize: Sequelize, options: { instanceId: string; leaseS: number }): JobClaims {
  const { instanceId: me, leaseS } = options;
  const held = new Set<string>();
  // the jobs this process is working on now: only their leases are moved on. A job whose try ended
  // while its release could not be written (the database away for a moment) is not among them, so
  // its lease runs out and it is taken over, instead of being held here for ever by the heartbeat
  const jobs = new Map<JobTable, Set<number>>(JOB_TABLES.map((t) => [t, new Set<number>()]));

  async function claimIds(kind: JobKind, table: JobTable, ids: number[], transaction?: import('sequelize').Transaction): Promise<number> {
    if (!ids.length) return 0;
    // MariaDB assigns left to right: lease_expiries reads claimed_by before it is overwritten
    const [, affected] = await sequelize.query(
      `UPDATE ${table}
          SET lease_expiries = LEAST(255, lease_expiries + IF(claimed_by IS NOT NULL AND claimed_by <> :me, 1, 0)),
              claimed_by = :me, lease_until = ${leaseExpr}
        WHERE id IN (:ids) AND ${WAITING[kind]}
          AND (claimed_by IS NULL OR claimed_by = :me OR lease_until < NOW(3))`,
      { replacements: { me, ids, lease: leaseS }, type: QueryTypes.UPDATE, transaction },
    );
    return affected;
  }

  return {
    instanceId: me,
    leaseS,

    async claim(kind, table, id) {
      const affected = await claimIds(kind, table, [id]);
      if (!affected) return { claimed: false, leaseExpiries: 0 };
      const [row] = await sequelize.query<{ leaseExpiries: number; claimedBy: string | null }>(
        `SELECT lease_expiries AS leaseExpiries, claimed_by AS claimedBy FROM ${table} WHERE id = :id`,
        { replacements: { id }, type: QueryTypes.SELECT },
      );
      // on a Galera cluster a conflicting claim from another node fails at commit, so a row that
      // reads as ours after an acknowledged update is ours
      const claimed = row?.claimedBy === me;
      if (claimed) jobs.get(table)!.add(id);
      return { claimed, leaseExpiries: Number(row?.leaseExpiries ?? 0) };
    },

    async release(table, id) {
      jobs.get(table)!.delete(id);
      await sequelize.query(`UPDATE ${table} SET claimed_by = NULL, lease_until = NULL WHERE id = :id AND claimed_by = :me`, {
        replacements: { id, me },
        type: QueryTypes.UPDATE,
      });
    },

    async claimDue(kind, table, limit) {
      return transact(sequelize, async (t) => {
        // SKIP LOCKED: instances polling at the same moment on one server split the rows instead of
        // queueing behind each other; the conditional UPDATE below is what makes a claim exclusive
        const rows = await sequelize.query<{ id: number }>(
          `SELECT id FROM ${table}
            WHERE ${WAITING[kind]}
              AND (lease_until < NOW(3) OR (claimed_by IS NULL AND created_at < NOW(3) - INTERVAL :lease SECOND))
            ORDER BY id LIMIT :limit
            FOR UPDATE SKIP LOCKED`,
          { replacements: { lease: leaseS, limit }, type: QueryTypes.SELECT, transaction: t },
        );
        const ids = rows.map((r) => Number(r.id));
        if (!ids.length) return [];
        await claimIds(kind, table, ids, t);
        const mine = await sequelize.query<{ id: number }>(`SELECT id FROM ${table} WHERE id IN (:ids) AND claimed_by = :me`, {
          replacements: { ids, me },
          type: QueryTypes.SELECT,
          transaction: t,
        });
        return mine.map((r) => Number(r.id));
      });
    },

    async heartbeat() {
      for (const table of JOB_TABLES) {
        const ids = [...jobs.get(table)!];
        if (!ids.length) continue;
        await sequelize.query(`UPDATE ${table} SET lease_until = ${leaseExpr} WHERE claimed_by = :me AND lease_until IS NOT NULL AND id IN (:ids)`, {
          replacements: { me, lease: leaseS, ids },
          type: QueryTypes.UPDATE,
        });
      }
      if (held.size) {
        await sequelize.query(`UPDATE job_leases SET lease_until = ${leaseExpr} WHERE holder = :me AND name IN (:names)`, {
          replacements: { me, lease: leaseS, names: [...held] },
          type: QueryTypes.UPDATE,
        });
      }
    },

    async tryLease(name, seconds = leaseS) {
      await sequelize.query('INSERT IGNORE INTO job_leases (name, holder, lease_until, runs) VALUES (:name, NULL, NULL, 0)', {
        replacements: { name },
        type: QueryTypes.INSERT,
      });
      const [, affected] = await sequelize.query(
        `UPDATE job_leases SET runs = runs + IF(holder <=> :me, 0, 1), holder = :me, lease_until = NOW(3) + INTERVAL :seconds SECOND
          WHERE name = :name AND (holder IS NULL OR holder = :me OR lease_until < NOW(3))`,
        { replacements: { name, me, seconds }, type: QueryTypes.UPDATE },
      );
      if (affected) held.add(name);
      else held.delete(name);
      return affected > 0;
    },

    async releaseLease(name) {
      held.delete(name);
      await sequelize.query('UPDATE job_leases SET holder = NULL, lease_until = NULL WHERE name = :name AND holder = :me', {
        replacements: { name, me },
        type: QueryTypes.UPDATE,
      });
    },

    async expireOthers() {
      for (const table of JOB_TABLES) {
        await sequelize.query(`UPDATE ${table} SET lease_until = NOW(3) - INTERVAL 1 SECOND WHERE claimed_by IS NOT NULL AND claimed_by <> :me`, {
          replacements: { me },
          type: QueryTypes.UPDATE,
        });
      }
    },

    async othersAlive() {
      const [row] = await sequelize.query<{ n: number }>(
        "SELECT COUNT(*) AS n FROM job_leases WHERE name LIKE 'instance:%' AND holder <> :me AND lease_until >= NOW(3)",
        { replacements: { me }, type: QueryTypes.SELECT },
      );
      return Number(row?.n ?? 0);
    },
  };
}
