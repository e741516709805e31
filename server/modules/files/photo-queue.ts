// Photos are cleaned off the request path: one worker thread takes jobs in order, so a burst of
// uploads never blocks the event loop or runs more than one decode at a time.
import { Worker } from 'node:worker_threads';
import type { PhotoJob, PhotoResult } from './photo-worker';

const WORKER_URL = new URL('./photo-worker.ts', import.meta.url).href;
// The worker is TypeScript: load it through tsx's loader, which works under tsx and vitest alike.
const BOOT = `import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(WORKER_URL)}); })`;

export class PhotoQueue {
  private worker: Worker | null = null;
  private waiting = new Map<number, (r: PhotoResult) => void>();
  private idleTimer: NodeJS.Timeout | null = null;

  private nextId = 0;

  /** Resolves when the photo is processed (or has failed); never rejects. */
  process(paths: Omit<PhotoJob, 'id'>): Promise<PhotoResult> {
    const worker = this.ensureWorker();
    const job: PhotoJob = { id: ++this.nextId, ...paths };
    return new Promise((resolve) => {
      this.waiting.set(job.id, resolve);
      worker.postMessage(job);
    });
  }

  get pending(): number {
    return this.waiting.size;
  }

  private ensureWorker(): Worker {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    if (this.worker) return this.worker;
    const worker = new Worker(BOOT, { eval: true });
    worker.on('message', (result: PhotoResult) => {
      this.waiting.get(result.id)?.(result);
      this.waiting.delete(result.id);
      if (this.waiting.size === 0) this.stopWhenIdle();
    });
    worker.on('error', (err) => this.failAll(err.message));
    worker.on('exit', () => {
      if (this.worker === worker) this.worker = null;
      this.failAll('the photo worker stopped');
    });
    worker.unref();
    this.worker = worker;
    return worker;
  }

  private failAll(error: string) {
    for (const [id, resolve] of this.waiting) resolve({ id, ok: false, error });
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
  }
}
