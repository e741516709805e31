// Slicing for estimates happens off the request path: one worker thread takes jobs in order (a
// million-facet mesh takes seconds), and recent results are kept so asking again is instant.
import { Worker } from 'node:worker_threads';
import type { SliceProfile } from '@shared/slice';
import type { SliceJob, SliceResult } from './slice-worker';
import { workerBootSource, workerModuleUrl } from '../../worker-module';

const BOOT = workerBootSource(workerModuleUrl('./slice-worker', import.meta.url));
/** Profiles kept, newest last (our choice: a few recipes of a few parts). */
const CACHE_SIZE = 32;

export class SliceQueue {
  private worker: Worker | null = null;
  private waiting = new Map<number, { resolve: (p: SliceProfile) => void; reject: (e: Error) => void }>();
  private cache = new Map<string, Promise<SliceProfile>>();
  private idleTimer: NodeJS.Timeout | null = null;
  private nextId = 0;

  /** Rejects with the worker's message when the file cannot be sliced. */
  slice(job: Omit<SliceJob, 'id'>, cacheKey: string): Promise<SliceProfile> {
    const key = `${cacheKey}|${job.stlUnitScale}|${JSON.stringify(job.settings)}`;
    const cached = this.cache.get(key);
    if (cached) return cached;
    const worker = this.ensureWorker();
    const id = ++this.nextId;
    const result = new Promise<SliceProfile>((resolve, reject) => {
      this.waiting.set(id, { resolve, reject });
      worker.postMessage({ id, ...job } satisfies SliceJob);
    });
    this.cache.set(key, result);
    result.catch(() => this.cache.delete(key));
    while (this.cache.size > CACHE_SIZE) this.cache.delete(this.cache.keys().next().value!);
    return result;
  }

  private ensureWorker(): Worker {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    if (this.worker) return this.worker;
    const worker = new Worker(BOOT, { eval: true });
    worker.on('message', (result: SliceResult) => {
      const waiter = this.waiting.get(result.id);
      this.waiting.delete(result.id);
      if (result.ok) waiter?.resolve(result.profile);
      else waiter?.reject(new Error(result.error));
      if (this.waiting.size === 0) this.stopWhenIdle();
    });
    worker.on('error', (err) => this.failAll(err.message));
    worker.on('exit', () => {
      if (this.worker === worker) this.worker = null;
      this.failAll('the slicing worker stopped');
    });
    worker.unref();
    this.worker = worker;
    return worker;
  }

  private failAll(error: string) {
    for (const { reject } of this.waiting.values()) reject(new Error(error));
    this.waiting.clear();
  }

  private stopWhenIdle() {
    this.idleTimer = setTimeout(() => void this.close(), 30_000);
    this.idleTimer.unref();
  }

  async close(): Promise<void> {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
    this.failAll('the server is shutting down');
  }
}
