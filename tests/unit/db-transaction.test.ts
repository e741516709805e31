import { DatabaseError, UniqueConstraintError, type Sequelize } from 'sequelize';
import { describe, expect, it, vi } from 'vitest';
import { isDatabaseUnavailable, isRetriableTransactionError } from '../../server/db/errors';
import { retryDelayMs, transact, type RetryPolicy } from '../../server/db/transaction';

/** What the mariadb connector throws (SqlError: errno, sqlState, code), wrapped the way Sequelize wraps it. */
function dbError(errno: number, sqlState: string, message: string, code = '') {
  const original = Object.assign(new Error(message), { errno, sqlState, code, sql: 'INSERT INTO recipes …' });
  return new DatabaseError(original as Error & { sql: string });
}
// errno and SQLSTATE values from the MariaDB error code reference (mariadb.com/kb "MariaDB Error Codes")
const deadlock = () => dbError(1213, '40001', 'Deadlock found when trying to get lock; try restarting transaction', 'ER_LOCK_DEADLOCK');
const lockWait = () => dbError(1205, 'HY000', 'Lock wait timeout exceeded; try restarting transaction', 'ER_LOCK_WAIT_TIMEOUT');

/** A stand-in for Sequelize's transaction(): counts commits and rollbacks. */
function fakeSequelize() {
  const log = { begun: 0, commits: 0, rollbacks: 0 };
  const sequelize = {
    async transaction() {
      log.begun += 1;
      return {
        async commit() {
          log.commits += 1;
        },
        async rollback() {
          log.rollbacks += 1;
        },
      };
    },
  } as unknown as Sequelize;
  return { sequelize, log };
}

const quick: RetryPolicy = { attempts: 4, baseDelayMs: 1, maxDelayMs: 2 };

describe('isRetriableTransactionError · what runs again', () => {
  it('isRetriableTransactionError · deadlock (1213), lock-wait timeout (1205), SQLSTATE 40001 · retried', () => {
    expect(isRetriableTransactionError(deadlock())).toBe(true);
    expect(isRetriableTransactionError(lockWait())).toBe(true);
    expect(isRetriableTransactionError(dbError(1020, '40001', 'Record has changed since last read'))).toBe(true);
    // the connector's own error, not wrapped by Sequelize
    expect(isRetriableTransactionError(deadlock().original)).toBe(true);
  });

  it('isRetriableTransactionError · Galera conflicts naming WSREP, the same numbers without · retried; not retried', () => {
    expect(isRetriableTransactionError(dbError(1047, '08S01', 'WSREP has not yet prepared node for application use'))).toBe(true);
    expect(isRetriableTransactionError(dbError(1180, 'HY000', 'Got error 35 "WSREP replication failed" during COMMIT'))).toBe(true);
    expect(isRetriableTransactionError(dbError(1047, '08S01', 'Unknown command'))).toBe(false);
    expect(isRetriableTransactionError(dbError(1180, 'HY000', 'Got error 28 during COMMIT'))).toBe(false);
  });

  it('isRetriableTransactionError · duplicates, syntax errors, timeouts, lost connections, plain errors · not retried', () => {
    expect(isRetriableTransactionError(dbError(1062, '23000', "Duplicate entry 'x' for key 'slug'"))).toBe(false);
    expect(isRetriableTransactionError(new UniqueConstraintError({}))).toBe(false);
    expect(isRetriableTransactionError(dbError(1064, '42000', 'You have an error in your SQL syntax'))).toBe(false);
    expect(isRetriableTransactionError(dbError(45026, '08S01', 'socket timeout', 'ER_SOCKET_TIMEOUT'))).toBe(false);
    expect(isRetriableTransactionError(new Error('disk full'))).toBe(false);
    expect(isRetriableTransactionError(undefined)).toBe(false);
  });
});

describe('isDatabaseUnavailable · which failures are a 503', () => {
  it('isDatabaseUnavailable · connector timeouts and broken connections; SQL errors · a 503; not', () => {
    // connector codes from mariadb 3.0 lib/misc/errors.js; 1969 is ER_STATEMENT_TIMEOUT (max_statement_time)
    expect(isDatabaseUnavailable(dbError(45026, '08S01', 'socket timeout', 'ER_SOCKET_TIMEOUT'))).toBe(true);
    expect(isDatabaseUnavailable(dbError(45012, '08S01', 'Connection timeout', 'ER_CONNECTION_TIMEOUT'))).toBe(true);
    expect(isDatabaseUnavailable(dbError(1969, '70100', 'Query execution was interrupted (max_statement_time exceeded)'))).toBe(true);
    expect(isDatabaseUnavailable(dbError(0, '08S01', 'read ECONNRESET', 'ECONNRESET'))).toBe(true);
    expect(isDatabaseUnavailable(deadlock())).toBe(false);
    expect(isDatabaseUnavailable(dbError(1406, '22001', "Data too long for column 'description_html'"))).toBe(false);
    expect(isDatabaseUnavailable(new Error('boom'))).toBe(false);
  });
});

describe('retryDelayMs · jittered exponential pause', () => {
  const policy: RetryPolicy = { attempts: 6, baseDelayMs: 20, maxDelayMs: 500 };

  it('retryDelayMs · any random draw · between half and all of the doubled step', () => {
    for (const [attempt, step] of [
      [1, 20],
      [2, 40],
      [3, 80],
      [4, 160],
      [5, 320],
    ]) {
      expect(retryDelayMs(attempt, policy, () => 0)).toBe(step / 2);
      expect(retryDelayMs(attempt, policy, () => 0.999999)).toBe(step);
      for (let i = 0; i < 50; i++) {
        const d = retryDelayMs(attempt, policy);
        expect(d).toBeGreaterThanOrEqual(step / 2);
        expect(d).toBeLessThanOrEqual(step);
      }
    }
  });

  it('retryDelayMs · many attempts · never above the cap', () => {
    expect(retryDelayMs(6, policy, () => 0.999999)).toBe(500);
    expect(retryDelayMs(30, policy, () => 0.999999)).toBe(500);
    expect(retryDelayMs(30, policy, () => 0)).toBe(250);
  });
});

describe('transact · retry policy', () => {
  it('transact · a deadlock · the work runs again and commits once', async () => {
    const { sequelize, log } = fakeSequelize();
    let runs = 0;
    const result = await transact(
      sequelize,
      async () => {
        runs += 1;
        if (runs < 3) throw deadlock();
        return 'saved';
      },
      quick,
    );
    expect(result).toBe('saved');
    expect(runs).toBe(3);
    expect(log).toEqual({ begun: 3, commits: 1, rollbacks: 2 });
  });

  it('transact · deadlocks past the bounded attempts · gives up and throws the last deadlock', async () => {
    const { sequelize, log } = fakeSequelize();
    let runs = 0;
    const last = lockWait();
    const failing = transact(
      sequelize,
      async () => {
        runs += 1;
        throw runs === quick.attempts ? last : deadlock();
      },
      quick,
    );
    await expect(failing).rejects.toBe(last);
    expect(runs).toBe(quick.attempts);
    expect(log.commits).toBe(0);
    expect(log.rollbacks).toBe(quick.attempts);
  });

  it('transact · an error that is not a lock conflict · not retried', async () => {
    const { sequelize, log } = fakeSequelize();
    const work = vi.fn(async () => {
      throw dbError(1062, '23000', "Duplicate entry 'x' for key 'slug'");
    });
    await expect(transact(sequelize, work, quick)).rejects.toBeInstanceOf(DatabaseError);
    expect(work).toHaveBeenCalledTimes(1);
    expect(log).toEqual({ begun: 1, commits: 0, rollbacks: 1 });
  });

  it('transact · a commit failing with a deadlock (a Galera certification conflict) · retried', async () => {
    const { sequelize } = fakeSequelize();
    let commits = 0;
    const original = sequelize.transaction.bind(sequelize);
    (sequelize as unknown as { transaction: () => Promise<unknown> }).transaction = async () => {
      const t = (await original()) as { commit(): Promise<void> };
      return {
        ...t,
        async commit() {
          commits += 1;
          if (commits === 1) throw dbError(1213, '40001', 'WSREP detected deadlock/conflict and aborted the transaction. Try restarting the transaction');
        },
      };
    };
    let runs = 0;
    await transact(sequelize, async () => void (runs += 1), quick);
    expect(runs).toBe(2);
    expect(commits).toBe(2);
  });

  it('transact · failed attempts and a committed one · each failed one undone, last step first; the committed one never', async () => {
    const { sequelize } = fakeSequelize();
    const steps: string[] = [];
    await transact(
      sequelize,
      async (_t, attempt) => {
        attempt.onRollback(() => void steps.push(`undo move ${attempt.number}`));
        attempt.onRollback(async () => void steps.push(`undo row ${attempt.number}`));
        if (attempt.number === 1) throw deadlock();
      },
      quick,
    );
    expect(steps).toEqual(['undo row 1', 'undo move 1']);
  });

  it('transact · a failed attempt that is not retried · undone as well', async () => {
    const { sequelize } = fakeSequelize();
    const undo = vi.fn();
    await expect(
      transact(
        sequelize,
        async (_t, attempt) => {
          attempt.onRollback(undo);
          throw new Error('disk full');
        },
        quick,
      ),
    ).rejects.toThrow('disk full');
    expect(undo).toHaveBeenCalledTimes(1);
  });

  it('transact · the commit goes unanswered (connection lost) · undo steps do not run, so committed rows keep their files', async () => {
    const { sequelize } = fakeSequelize();
    const original = sequelize.transaction.bind(sequelize);
    (sequelize as unknown as { transaction: () => Promise<unknown> }).transaction = async () => {
      const t = (await original()) as { commit(): Promise<void> };
      return {
        ...t,
        async commit() {
          // the connector's ER_SOCKET_UNEXPECTED_CLOSE (45009, mariadb-connector-nodejs lib/misc/errors.js)
          throw dbError(45009, '08S01', 'socket has unexpectedly been closed', 'ER_SOCKET_UNEXPECTED_CLOSE');
        },
      };
    };
    const undo = vi.fn();
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    await expect(transact(sequelize, async (_t, attempt) => attempt.onRollback(undo), quick)).rejects.toThrow('unexpectedly been closed');
    expect(undo).not.toHaveBeenCalled();
  });
});
