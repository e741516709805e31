// Photos are cleaned off the request path, in their own worker pool: one thread takes jobs in
// order, so a burst of uploads never blocks the event loop or runs more than one decode at a time.
import type { PhotoJob, PhotoResult } from './photo-worker';
import { WorkerClosedError, WorkerPool, type WorkerPoolOptions } from './worker-pool';

export const PHOTO_POOL: WorkerPoolOptions = {
  name: 'photo cleaning',
  maxThreads: 1,
  // jobs are only paths; the photos wait on disk
  maxQueue: Number.MAX_SAFE_INTEGER,
  // a 50-megapixel photo decodes into 200 MB of pixels (outside the heap) plus jimp's working set
  memoryMb: 512,
  timeoutMs: 60_000,
  nice: 10,
};

export class PhotoQueue {
  private readonly pool: WorkerPool;

  constructor(options: Partial<WorkerPoolOptions> = {}) {
    this.pool = new WorkerPool({ ...PHOTO_POOL, ...options });
  }

  /** Resolves when the photo is processed (or has failed); never rejects. */
  async process(job: PhotoJob): Promise<PhotoResult> {
    try {
      return await this.pool.run('processPhoto', job);
    } catch (err) {
      if (err instanceof WorkerClosedError) return { ok: false, error: err.message, permanent: false, interrupted: true };
      // a timeout, a thread that ran out of memory or died: perhaps the machine, perhaps the photo
      return { ok: false, error: err instanceof Error ? err.message : String(err), permanent: false };
    }
  }

  get pending(): number {
    return this.pool.pending;
  }

  close(): Promise<void> {
    return this.pool.close();
  }
}
