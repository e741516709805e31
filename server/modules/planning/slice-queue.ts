// Slicing for estimates happens off the request path, in the worker pool (files/worker-pool.ts): one
// thread takes jobs in order (a million-facet mesh takes seconds), and recent results are kept so
// asking again is instant.
import type { SliceProfile } from '@shared/slice';
import type { LocalCopy } from '../files/storage';
import { WorkerPool, type WorkerPoolOptions } from '../files/worker-pool';
import { workerModuleUrl } from '../../worker-module';
import type { SliceJob } from './slice-worker';

export const SLICE_POOL: WorkerPoolOptions = {
  name: 'slicing',
  maxThreads: 1,
  // jobs are paths and settings; the model files wait on disk
  maxQueue: Number.MAX_SAFE_INTEGER,
  // a million-facet mesh is 36 MB of positions (outside the heap) plus the layer outlines
  memoryMb: 1024,
  // our choice: far beyond the seconds bench:estimate measures for a million facets
  timeoutMs: 300_000,
  nice: 5,
  tasks: workerModuleUrl('./slice-worker', import.meta.url),
};
/** Profiles kept, newest last (our choice: a few recipes of a few parts). */
const CACHE_SIZE = 32;

export class SliceQueue {
  private pool: WorkerPool<typeof import('./slice-worker')> | null = null;
  private cache = new Map<string, Promise<SliceProfile>>();

  /**
   * Rejects with the task's message when the file cannot be sliced. `path` is a local file, or
   * fetches one from storage (only when the answer is not cached) and releases it afterwards.
   */
  slice(job: Omit<SliceJob, 'path'> & { path: string | (() => Promise<LocalCopy>) }, cacheKey: string): Promise<SliceProfile> {
    const key = `${cacheKey}|${job.stlUnitScale}|${JSON.stringify(job.settings)}`;
    const cached = this.cache.get(key);
    if (cached) return cached;
    const { path, ...rest } = job;
    const result = (async () => {
      const local = typeof path === 'string' ? { path, release: async () => undefined } : await path();
      try {
        this.pool ??= new WorkerPool<typeof import('./slice-worker')>(SLICE_POOL);
        return await this.pool.run('sliceFile', { ...rest, path: local.path });
      } finally {
        await local.release();
      }
    })();
    this.cache.set(key, result);
    result.catch(() => this.cache.delete(key));
    while (this.cache.size > CACHE_SIZE) this.cache.delete(this.cache.keys().next().value!);
    return result;
  }

  async close(): Promise<void> {
    const pool = this.pool;
    this.pool = null;
    await pool?.close();
  }
}
