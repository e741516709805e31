// Keeps track of photo cleaning that is under way, whoever asked for it (parts or set reports), so
// tests and shutdown can wait until every photo is done. Each try is counted on the row before it
// starts, so a photo that fails twice (or took the process down twice) is marked failed for good.
// A try's outcome is written again while the database is briefly away (a Galera node being evicted,
// a lost connection), for up to a lease: a try that ran is not run again just because its result
// could not be written at the first go. A try the object store did not answer does not count: it
// is tried again after a pause for up to a lease, then left waiting for the job loop to take up.
import { setTimeout as sleep } from 'node:timers/promises';
import { col, ConnectionError, Model, Op, where, type ModelStatic } from 'sequelize';
import { isDatabaseUnavailable, isRetriableTransactionError } from '../../db/errors';
import { retryDelayMs, type RetryPolicy } from '../../db/transaction';
import { jobTableOf, MAX_LEASE_EXPIRIES, type JobClaims, type JobTable } from '../jobs/claims';
import type { PhotoQueue } from './photo-queue';
import type { PhotoResult } from './photo-worker';
import { removeQuietly, StorageUnavailableError, type FileStorage, type LocalCopy } from './storage';
import { keysOf, type StoredKeys } from './stored-files';

export const MAX_PHOTO_ATTEMPTS = 2;

/** Without job claims (one process, tests) an outcome is written again for this long at most. */
const OUTCOME_RETRY_MS = 30_000;
const OUTCOME_BACKOFF: RetryPolicy = { attempts: Infinity, baseDelayMs: 100, maxDelayMs: 2000 };
const STORE_BACKOFF: RetryPolicy = { attempts: Infinity, baseDelayMs: 500, maxDelayMs: 5000 };

/** The database did not answer or refused for a moment; the same write may simply be sent again. */
export function isPassingDatabaseFailure(err: unknown): boolean {
  return err instanceof ConnectionError || isDatabaseUnavailable(err) || isRetriableTransactionError(err);
}

/** A try's result, or word that the object store did not answer (the photo was not looked at). */
type TryResult = PhotoResult | { ok: false; storeAway: true; error: string };

type Outcome = { processing: 'ready'; width: number; height: number } | { processing: 'failed' };
/** What writing an outcome came to: written here, already settled (by an earlier write that landed, or another instance), taken by another instance, or the row is gone. */
type Settled = 'written' | 'settled' | 'taken' | 'gone';

/** A row holding a photo (a part's or a set report's). */
interface PhotoRow {
  storedName: string;
}
interface LivePhotoRow {
  processing: 'ready' | 'pending' | 'failed';
  processingAttempts: number;
  update(values: { processing?: 'ready' | 'failed'; processingAttempts?: number; width?: number; height?: number }): Promise<unknown>;
}
/** Reads the row again: it may have been deleted, or finished, meanwhile. */
type Reload = () => Promise<LivePhotoRow | null>;

export class PhotoJobs {
  private inFlight = new Set<Promise<void>>();

  constructor(
    private readonly storage: FileStorage,
    private readonly queue: PhotoQueue,
    private readonly claims?: JobClaims,
    /** For tests: the bound on writing an outcome again (default: the job lease, or 30 s). */
    private readonly outcomeRetryMs = claims ? claims.leaseS * 1000 : OUTCOME_RETRY_MS,
  ) {}

  clean(row: PhotoRow, reload: Reload): void {
    const table = this.claims ? jobTableOf(row) : null;
    const id = (row as { id?: number }).id;
    const job: Promise<void> = this.cleanPhoto(row, reload, table && id ? { table, id } : null)
      .catch((err) => console.error(`photo ${row.storedName} could not be cleaned:`, err))
      // released before the job counts as done, so settled() means the row is free for others too
      .finally(async () => {
        if (table && id) await this.claims!.release(table, id).catch(() => undefined);
        this.inFlight.delete(job);
      });
    this.inFlight.add(job);
  }

  /** Photos being cleaned or waiting for their turn here. */
  get busy(): number {
    return this.inFlight.size;
  }

  async settled(): Promise<void> {
    while (this.inFlight.size) await Promise.all([...this.inFlight]);
  }

  async close(): Promise<void> {
    await this.settled();
    await this.queue.close();
  }

  /** Cleans a stored photo in the worker and records the outcome; the raw upload is removed once it is settled. */
  private async cleanPhoto(row: PhotoRow, reload: Reload, job: { table: JobTable; id: number } | null): Promise<void> {
    const keys = keysOf({ kind: 'photo', storedName: row.storedName });
    const outputs = [keys.display, keys.thumbnail];
    const remove = (...k: (string | undefined)[]) => removeQuietly(this.storage, ...k);
    let leaseExpiries = 0;
    let storeAwaySince: number | null = null;
    for (let storeTries = 1; ;) {
      const current = await this.retryWhileAway(reload);
      if (!current) {
        await remove(keys.original, ...outputs);
        return;
      }
      if (current.processing !== 'pending') return;
      if (job) {
        const claim = await this.retryWhileAway(() => this.claims!.claim('photo', job.table, job.id));
        // another instance holds it; it is taken over here only once that instance's lease runs out
        if (!claim.claimed) return;
        leaseExpiries = claim.leaseExpiries;
      }
      // a try whose instance died is counted in both; the ones that ran and failed are the difference
      const ranAndFailed = current.processingAttempts - leaseExpiries;
      if (ranAndFailed >= MAX_PHOTO_ATTEMPTS || leaseExpiries >= MAX_LEASE_EXPIRIES) {
        if ((await this.settle(row, reload, job, { processing: 'failed' })) !== 'taken') await remove(keys.original, ...outputs);
        console.error(
          `photo ${row.storedName}: marked failed after ${current.processingAttempts} attempts` +
            (leaseExpiries ? ` (${leaseExpiries} ended with their instance)` : ''),
        );
        return;
      }
      // an absolute count: sending it again after an answer that was lost counts the try once
      const attempts = current.processingAttempts + 1;
      await this.retryWhileAway(() => current.update({ processingAttempts: attempts }));
      const result = await this.process(keys);
      // shutting down: the try does not count, and the start-up sweep resumes the photo
      if (!result.ok && 'interrupted' in result && result.interrupted) {
        await current.update({ processingAttempts: current.processingAttempts - 1 });
        return;
      }
      if (!result.ok && 'storeAway' in result) {
        await this.retryWhileAway(() => current.update({ processingAttempts: attempts - 1 }));
        storeAwaySince ??= Date.now();
        const pause = retryDelayMs(storeTries++, STORE_BACKOFF);
        if (Date.now() + pause - storeAwaySince > this.outcomeRetryMs) {
          // released in clean(); the job loop takes a waiting photo nobody holds up again
          console.error(`photo ${row.storedName}: left waiting, the object store is away (${result.error})`);
          return;
        }
        await sleep(pause);
        continue;
      }
      if (result.ok) {
        // the row first: if the database fails here the raw upload is still there for the next start
        const settled = await this.settle(row, reload, job, { processing: 'ready', width: result.width, height: result.height });
        if (settled === 'gone') await remove(keys.original, ...outputs);
        // another instance took the photo over meanwhile: its try needs the raw upload, and its result stands
        else if (settled === 'taken') console.error(`photo ${row.storedName}: cleaned here, but another instance holds it now; its result stands`);
        else await remove(keys.original);
        return;
      }
      await remove(...outputs);
      console.error(`photo ${row.storedName}: ${result.error}`);
      if (result.permanent) {
        const settled = await this.settle(row, reload, job, { processing: 'failed' });
        if (settled !== 'taken') await remove(keys.original);
        return;
      }
      // a timeout or a worker that died: the loop tries once more, then gives up
    }
  }

  /** Runs `write` again while the database is briefly away, with a jittered pause, for up to the bound. */
  private async retryWhileAway<T>(write: () => Promise<T>): Promise<T> {
    const until = Date.now() + this.outcomeRetryMs;
    for (let attempt = 1; ; attempt++) {
      try {
        return await write();
      } catch (err) {
        const pause = retryDelayMs(attempt, OUTCOME_BACKOFF);
        if (!isPassingDatabaseFailure(err) || Date.now() + pause > until) throw err;
        await sleep(pause);
      }
    }
  }

  /**
   * Writes a try's outcome, again while the database is briefly away. With job claims the write only
   * lands while the photo is still waiting and this instance holds it: if the lease ran out and
   * another instance took the photo meanwhile, its result is not overwritten. Writing again after
   * an earlier write that landed unanswered finds the photo settled and changes nothing.
   */
  private async settle(row: PhotoRow, reload: Reload, job: { table: JobTable; id: number } | null, outcome: Outcome): Promise<Settled> {
    return this.retryWhileAway(async () => {
      const now = await reload();
      if (!now) return 'gone';
      if (now.processing !== 'pending') return 'settled';
      if (!job || !(row instanceof Model)) {
        await now.update(outcome);
        return 'written';
      }
      // a bulk update keeps the shelf's change-log hook (part photos feed search) and can say "only if mine"
      const model = row.constructor as ModelStatic<Model>;
      const [changed] = await model.update(outcome, {
        where: { id: job.id, processing: 'pending', [Op.and]: [where(col('claimed_by'), this.claims!.instanceId)] },
      });
      if (changed) return 'written';
      const again = await reload();
      return !again ? 'gone' : again.processing !== 'pending' ? 'settled' : 'taken';
    });
  }

  /**
   * The worker reads and writes local files: the raw upload is fetched to a local copy (the local
   * driver hands out the file itself) and the sizes are stored once both are written.
   */
  private async process(keys: StoredKeys): Promise<TryResult> {
    let source: LocalCopy;
    try {
      source = await this.storage.localCopy(keys.original);
    } catch (err) {
      if (err instanceof StorageUnavailableError) return { ok: false, storeAway: true, error: String(err.cause ?? err.message) };
      return { ok: false, error: `the raw upload could not be read (${(err as Error).message})`, permanent: false };
    }
    const display = this.storage.localOutput(keys.display!);
    const thumbnail = this.storage.localOutput(keys.thumbnail!);
    try {
      const result = await this.queue.process({ source: source.path, display: display.path, thumbnail: thumbnail.path });
      if (result.ok) {
        await display.save();
        await thumbnail.save();
      }
      return result;
    } catch (err) {
      if (err instanceof StorageUnavailableError) return { ok: false, storeAway: true, error: String(err.cause ?? err.message) };
      return { ok: false, error: `the cleaned sizes could not be stored (${(err as Error).message})`, permanent: false };
    } finally {
      await source.release();
      await Promise.all([display.discard(), thumbnail.discard()]);
    }
  }
}
