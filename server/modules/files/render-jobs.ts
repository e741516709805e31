// Draws the shaded preview of each model (render-model.ts) in its own one-thread worker pool, after
// the model's row has committed. The state and every try are on the row (render_status,
// render_attempts): a model that fails twice, or took the process down twice, keeps no picture and the
// shelf shows its photos or a placeholder instead. Pictures live beside the model under store/ as
// `<storedName>-display.jpg` and `-thumb.jpg`, so the start-up sweep keeps them with their row.
import type { PartFile } from '../../db/models';
import type { RenderJob, RenderResult } from './render-model';
import { MAX_LEASE_EXPIRIES, type JobClaims } from '../jobs/claims';
import { removeQuietly, type FileStorage, type LocalCopy } from './storage';
import type { StoredKeys } from './stored-files';
import { WorkerClosedError, WorkerPool, type WorkerPoolOptions } from './worker-pool';

export const MAX_RENDER_ATTEMPTS = 2;

export const RENDER_POOL: WorkerPoolOptions = {
  name: 'model pictures',
  maxThreads: 1,
  // jobs are only paths; the models wait on disk
  maxQueue: Number.MAX_SAFE_INTEGER,
  // a 2.5-million-facet model is 90 MB of positions (outside the heap) plus the picture's buffers
  memoryMb: 512,
  timeoutMs: 120_000,
  nice: 10,
};

type Reload = () => Promise<PartFile | null>;

export class RenderJobs {
  private readonly pool: WorkerPool;
  private inFlight = new Set<Promise<void>>();
  // one picture at a time, so a try is counted only when its drawing starts (a crash during a long
  // backfill costs the one model being drawn a try, not every model still waiting)
  private chain: Promise<void> = Promise.resolve();
  private closed = false;

  /** `onReady`: a picture was drawn (search's stored thumbnails are refreshed from it). */
  /** `claims`: with several instances on one database, a picture is drawn by the one that claims it. */
  constructor(options: Partial<WorkerPoolOptions> & { storage: FileStorage; onReady?: (row: PartFile) => void; claims?: JobClaims }) {
    const { onReady, storage, claims, ...pool } = options;
    this.claims = claims;
    this.onReady = onReady;
    this.storage = storage;
    this.pool = new WorkerPool({ ...RENDER_POOL, ...pool });
  }

  private readonly onReady?: (row: PartFile) => void;
  private readonly storage: FileStorage;
  private readonly claims?: JobClaims;

  /** Pictures being drawn or waiting for their turn here. */
  get busy(): number {
    return this.inFlight.size;
  }

  /** Queues the picture of a model whose row is waiting for one (`keys`: the model's, keysOf). */
  render(row: PartFile, keys: StoredKeys, reload: Reload): void {
    const job: Promise<void> = this.chain
      .then(() => (this.closed ? undefined : this.renderModel(row, keys, reload)))
      .catch((err) => console.error(`model ${row.storedName}: the picture could not be drawn:`, err))
      .finally(() => {
        this.inFlight.delete(job);
        if (this.claims) void this.claims.release('part_files', row.id).catch(() => undefined);
      });
    this.chain = job;
    this.inFlight.add(job);
  }

  async settled(): Promise<void> {
    while (this.inFlight.size) await Promise.all([...this.inFlight]);
  }

  /** Stops the pool at once: pictures under way stay waiting for the next start without losing a try. */
  async close(): Promise<void> {
    this.closed = true;
    await this.pool.close();
    await this.settled();
  }

  private async runTask(job: RenderJob): Promise<RenderResult> {
    try {
      return await this.pool.run('renderModel', job);
    } catch (err) {
      if (err instanceof WorkerClosedError) return { ok: false, error: err.message, permanent: false, interrupted: true };
      return { ok: false, error: err instanceof Error ? err.message : String(err), permanent: false };
    }
  }

  /** The worker reads and writes local files: the model is fetched to a local copy and the pictures stored once both are drawn. */
  private async run(keys: StoredKeys, sizeMm: RenderJob['sizeMm']): Promise<RenderResult> {
    let source: LocalCopy;
    try {
      source = await this.storage.localCopy(keys.original);
    } catch (err) {
      return { ok: false, error: `the model could not be read from storage (${(err as Error).message})`, permanent: false };
    }
    const display = this.storage.localOutput(keys.display!);
    const thumbnail = this.storage.localOutput(keys.thumbnail!);
    try {
      const result = await this.runTask({ source: source.path, display: display.path, thumbnail: thumbnail.path, sizeMm });
      if (result.ok) {
        await display.save();
        await thumbnail.save();
      }
      return result;
    } catch (err) {
      return { ok: false, error: `the pictures could not be stored (${(err as Error).message})`, permanent: false };
    } finally {
      await source.release();
      await Promise.all([display.discard(), thumbnail.discard()]);
    }
  }

  private async renderModel(row: PartFile, keys: StoredKeys, reload: Reload): Promise<void> {
    const outputs = [keys.display, keys.thumbnail];
    for (;;) {
      const current = await reload();
      if (!current) {
        await removeQuietly(this.storage, ...outputs);
        return;
      }
      if (current.renderStatus !== 'pending') return;
      let leaseExpiries = 0;
      if (this.claims) {
        const claim = await this.claims.claim('render', 'part_files', row.id);
        if (!claim.claimed) return; // another instance is drawing it
        leaseExpiries = claim.leaseExpiries;
      }
      if (current.renderAttempts - leaseExpiries >= MAX_RENDER_ATTEMPTS || leaseExpiries >= MAX_LEASE_EXPIRIES) {
        await removeQuietly(this.storage, ...outputs);
        await current.update({ renderStatus: 'failed' });
        console.error(`model ${row.storedName}: no picture after ${current.renderAttempts} attempts`);
        return;
      }
      await current.update({ renderAttempts: current.renderAttempts + 1 });
      const result = await this.run(keys, current.analysis?.sizeMm ?? null);
      if (!result.ok && result.interrupted) {
        await current.update({ renderAttempts: current.renderAttempts - 1 });
        return;
      }
      const after = await reload();
      if (!after) {
        await removeQuietly(this.storage, ...outputs);
        return;
      }
      if (result.ok) {
        await after.update({ renderStatus: 'ready' });
        this.onReady?.(after);
        return;
      }
      await removeQuietly(this.storage, ...outputs);
      console.error(`model ${row.storedName}: ${result.error}`);
      if (result.permanent) {
        await after.update({ renderStatus: 'failed' });
        return;
      }
    }
  }
}
