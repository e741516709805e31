// The one way Rigshelf runs heavy work off the event loop: a piscina pool of worker threads with a
// bound on threads and queue, a memory limit per thread and a time limit per task. Tasks are the
// exports of a module (worker-tasks unless a test passes its own).
import { fileURLToPath } from 'node:url';
import Piscina from 'piscina';
import { workerModuleUrl } from '../../worker-module';

const BOOT = fileURLToPath(new URL('./worker-boot.mjs', import.meta.url));
const DEFAULT_TASKS = workerModuleUrl('./worker-tasks', import.meta.url);

/** The task ran longer than its pool allows; its thread was stopped. */
export class WorkerTimeoutError extends Error {
  name = 'WorkerTimeoutError';
}
/** The pool's queue is full: too much of this work is already waiting. */
export class WorkerBusyError extends Error {
  name = 'WorkerBusyError';
}
/** The pool was closed (shutdown) before the task could finish; nothing is wrong with the task. */
export class WorkerClosedError extends Error {
  name = 'WorkerClosedError';
}
/** The thread died under the task: out of memory, or a crash in native code. */
export class WorkerCrashedError extends Error {
  name = 'WorkerCrashedError';
}

export interface WorkerPoolOptions {
  /** Names the pool in messages. */
  name: string;
  maxThreads: number;
  /** Tasks that may wait for a thread; beyond that run() rejects with WorkerBusyError. */
  maxQueue: number;
  /** V8 heap limit per thread (resourceLimits). Buffers and typed arrays live outside it. */
  memoryMb: number;
  /** Per task: a task still running after this is stopped with its thread. */
  timeoutMs: number;
  /** Threads left idle this long exit; the next task starts one again. */
  idleTimeoutMs?: number;
  /** Lower scheduling priority of the threads (Linux nice), so the event loop wins the CPU. */
  nice?: number;
  /** URL of the module whose exports are the tasks (workerModuleUrl). */
  tasks?: string;
}

type TaskModule = Record<string, (input: never) => unknown>;

export class WorkerPool<Tasks extends TaskModule = typeof import('./worker-tasks')> {
  private readonly pool: Piscina;
  private running = 0;
  // Tasks wait here, not in piscina's queue, so the time limit starts when a thread takes the task
  // (a long queue must not be blamed on the file) and the queue bound holds.
  private readonly waiting: { resolve(): void; reject(err: Error): void }[] = [];
  private closed = false;

  constructor(readonly options: WorkerPoolOptions) {
    this.pool = new Piscina({
      filename: BOOT,
      maxThreads: options.maxThreads,
      minThreads: 0,
      idleTimeout: options.idleTimeoutMs ?? 30_000,
      niceIncrement: options.nice ?? 0,
      resourceLimits: { maxOldGenerationSizeMb: options.memoryMb },
      workerData: { tasks: options.tasks ?? DEFAULT_TASKS },
    });
    // a thread that dies is replaced by piscina; the task it held is rejected through run()
    this.pool.on('error', (err) => console.error(`${options.name} worker pool:`, err));
  }

  /** Runs one task; rejects with WorkerTimeoutError, WorkerBusyError or WorkerCrashedError, or the task's own error. */
  async run<K extends keyof Tasks & string>(
    task: K,
    input: Parameters<Tasks[K]>[0],
    timeoutMs = this.options.timeoutMs,
  ): Promise<Awaited<ReturnType<Tasks[K]>>> {
    if (this.closed) throw new WorkerClosedError(`${this.options.name}: the pool is closed`);
    await this.takeThread();
    const signal = AbortSignal.timeout(timeoutMs);
    try {
      return await this.pool.run({ task, input }, { signal });
    } catch (err) {
      throw this.translate(err, signal, timeoutMs);
    } finally {
      this.releaseThread();
    }
  }

  /** Tasks waiting for a thread plus tasks running. */
  get pending(): number {
    return this.running + this.waiting.length;
  }

  private async takeThread(): Promise<void> {
    if (this.running < this.options.maxThreads) {
      this.running += 1;
      return;
    }
    if (this.waiting.length >= this.options.maxQueue) {
      throw new WorkerBusyError(`${this.options.name}: ${this.options.maxQueue} tasks are already waiting`);
    }
    // the finishing task hands its thread over, so `running` stays as it is
    await new Promise<void>((resolve, reject) => this.waiting.push({ resolve, reject }));
  }

  private releaseThread(): void {
    const next = this.waiting.shift();
    if (next) next.resolve();
    else this.running -= 1;
  }

  /** Stops the threads; tasks still waiting or running reject with WorkerClosedError. */
  async close(): Promise<void> {
    this.closed = true;
    for (const task of this.waiting.splice(0)) task.reject(new WorkerClosedError(`${this.options.name}: the pool was closed`));
    await this.pool.destroy();
  }

  private translate(err: unknown, signal: AbortSignal, timeoutMs: number): unknown {
    const message = err instanceof Error ? err.message : String(err);
    const code = (err as { code?: string } | null)?.code;
    if (this.closed) return new WorkerClosedError(`${this.options.name}: the pool was closed`);
    if (signal.aborted) return new WorkerTimeoutError(`${this.options.name}: the task took longer than ${Math.round(timeoutMs / 1000)} s and was stopped`);
    if (code === 'ERR_WORKER_OUT_OF_MEMORY') return new WorkerCrashedError(`${this.options.name}: the task ran out of memory (${this.options.memoryMb} MB)`);
    if (code?.startsWith('ERR_WORKER') || message.includes('exited')) return new WorkerCrashedError(`${this.options.name}: the worker stopped (${message})`);
    return err;
  }
}
