// Every write transaction goes through transact(): when MariaDB (or a Galera cluster) picks this
// transaction as the loser of a deadlock or a lock wait, the whole unit of work runs again from the
// start, a few times, with a random pause so the two contenders do not collide again in step.
import { setTimeout as sleep } from 'node:timers/promises';
import type { Sequelize, Transaction } from 'sequelize';
import { isRetriableTransactionError } from './errors';

export interface RetryPolicy {
  /** Attempts in all, the first one included. */
  attempts: number;
  /** Pause before the second attempt; it doubles for each further one, up to maxDelayMs. */
  baseDelayMs: number;
  maxDelayMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { attempts: 5, baseDelayMs: 20, maxDelayMs: 500 };

/**
 * Work to undo when an attempt fails (files moved into place, say), so the next attempt starts clean.
 * Not run when the commit itself went unanswered (its outcome is unknown).
 */
export interface Attempt {
  /** 1 for the first run. */
  readonly number: number;
  /** Runs (last registered first) if this attempt rolls back, whether or not it is retried. */
  onRollback(undo: () => Promise<void> | void): void;
}

const unanswered = new WeakSet<object>();

/** True for an error transact() threw because a commit went unanswered: its rows may have landed. */
export function commitOutcomeUnknown(err: unknown): boolean {
  return err instanceof Object && unanswered.has(err);
}

/**
 * The pause before attempt `attempt + 1` (attempt counts from 1): "equal jitter", a random time
 * between half and all of the capped exponential step, so retries spread out but never vanish.
 */
export function retryDelayMs(attempt: number, policy: RetryPolicy = DEFAULT_RETRY, random: () => number = Math.random): number {
  const step = Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** (attempt - 1));
  return Math.round(step / 2 + random() * (step / 2));
}

/**
 * Runs `work` in a transaction and commits it; on a retriable failure rolls back, runs the attempt's
 * undo steps and tries again (at most policy.attempts runs in all). Any other error, or the last
 * retriable one, is thrown after the rollback and undo. `transaction.afterCommit` hooks (mail
 * kicks, photo jobs) run once, for the attempt that committed.
 */
export async function transact<T>(
  sequelize: Sequelize,
  work: (transaction: Transaction, attempt: Attempt) => Promise<T>,
  policy: RetryPolicy = DEFAULT_RETRY,
): Promise<T> {
  for (let number = 1; ; number++) {
    const undos: (() => Promise<void> | void)[] = [];
    const attempt: Attempt = { number, onRollback: (undo) => void undos.push(undo) };
    const t = await sequelize.transaction();
    let committing = false;
    try {
      const result = await work(t, attempt);
      committing = true;
      await t.commit();
      return result;
    } catch (err) {
      // Sequelize has already rolled back after a deadlock, and a failed commit cannot be rolled back
      await t.rollback().catch(() => undefined);
      // A commit cut off by a lost connection may have landed: rows without their files would be lost
      // work, files without rows are removed by the start-up sweep, so the files stay where they are.
      if (committing && !isRetriableTransactionError(err)) {
        console.error('rigshelf: a commit ended without an answer; its files stay in place for the start-up sweep to settle');
        if (err instanceof Object) unanswered.add(err);
        throw err;
      }
      for (const undo of undos.reverse()) {
        await Promise.resolve()
          .then(undo)
          .catch((e: unknown) => console.error('rigshelf: undoing a failed transaction:', e));
      }
      if (number >= policy.attempts || !isRetriableTransactionError(err)) throw err;
      await sleep(retryDelayMs(number, policy));
    }
  }
}
