// One search worker thread and the index it holds, seen from the main thread: queries posted with
// ids, answers matched back, a query past its time stops the thread (the service replaces it).
import { Worker } from 'node:worker_threads';
import type { SearchResponse } from '@shared/api/search';
import type { SearchQuery } from '@shared/schemas/search';
import { AppError } from '../../errors';
import { workerBootSource, workerModuleUrl } from '../../worker-module';
import { PUBLIC_ONLY, type CrewVisibility, type Ranks } from './searcher';
import { packRanks, type SearchWorkerData, type WorkerReply, type WorkerRequest } from './search-protocol';

const BOOT = workerBootSource(workerModuleUrl('./search-worker', import.meta.url));

export type Ready = Extract<WorkerReply, { type: 'ready' }>;
export type Answer = Extract<WorkerReply, { type: 'answer' }>;

/** One worker thread and the index it holds. */
export class SearchWorker {
  private readonly worker: Worker;
  private readonly answers = new Map<number, { resolve(r: Answer): void; reject(e: Error): void; timer: NodeJS.Timeout }>();
  private control: { resolve(r: WorkerReply): void; reject(e: Error): void } | null = null;
  private nextId = 1;
  private retiring = false;
  private exited = false;
  ready: Ready | null = null;

  constructor(
    data: SearchWorkerData,
    private readonly onStuck: (w: SearchWorker) => void = () => undefined,
  ) {
    this.worker = new Worker(BOOT, { eval: true, workerData: data });
    this.worker.unref();
    this.worker.on('message', (reply: WorkerReply) => {
      if (reply.type === 'answer') {
        const waiting = this.answers.get(reply.id);
        if (!waiting) return;
        clearTimeout(waiting.timer);
        this.answers.delete(reply.id);
        waiting.resolve(reply);
        if (this.retiring && this.answers.size === 0) void this.stop();
        return;
      }
      if (reply.type === 'ready') this.ready = reply;
      const control = this.control;
      this.control = null;
      control?.resolve(reply);
    });
    this.worker.on('error', (err) => this.failAll(err));
    this.worker.on('exit', () => {
      this.exited = true;
      this.failAll(new Error('the search worker stopped'));
    });
  }

  /** Start, build or build from documents: one at a time, answered by ready / unchanged / failed. */
  run(request: Exclude<WorkerRequest, { type: 'search' | 'ranks' }>): Promise<WorkerReply> {
    if (this.control) return Promise.reject(new Error('the search worker is busy with another index job'));
    return new Promise((resolve, reject) => {
      this.control = { resolve, reject };
      this.worker.postMessage(request);
    });
  }

  sendRanks(ranks: Ranks) {
    if (this.exited) return;
    const data = packRanks(ranks);
    this.worker.postMessage({ type: 'ranks', data } satisfies WorkerRequest, [data.buffer as ArrayBuffer]);
  }

  search(query: SearchQuery, timeoutMs: number, visibility: CrewVisibility = PUBLIC_ONLY): Promise<SearchResponse> {
    if (this.exited) return Promise.reject(new AppError(503, 'search_starting', 'Search is restarting. Try again in a few seconds.'));
    const id = this.nextId++;
    return new Promise<Answer>((resolve, reject) => {
      const timer = setTimeout(() => {
        this.answers.delete(id);
        reject(
          new AppError(503, 'search_too_costly', 'This search took too long and was stopped. Use fewer words with wildcards (*) or typos (~), then try again.'),
        );
        this.onStuck(this);
      }, timeoutMs);
      this.answers.set(id, { resolve, reject, timer });
      this.worker.postMessage({ type: 'search', id, query, visibility } satisfies WorkerRequest);
    }).then((answer) => {
      if (answer.ok) return answer.response as SearchResponse;
      throw new AppError(answer.error.status, answer.error.code, answer.error.message, answer.error.fields);
    });
  }

  /** Stops once the searches already sent have their answers. */
  retire() {
    this.retiring = true;
    if (this.answers.size === 0) void this.stop();
  }

  async stop() {
    if (this.exited) return;
    this.exited = true;
    await this.worker.terminate();
  }

  private failAll(err: Error) {
    const busy = err.message === 'the search worker stopped' ? new AppError(503, 'search_starting', 'Search is restarting. Try again in a few seconds.') : err;
    for (const w of this.answers.values()) {
      clearTimeout(w.timer);
      w.reject(busy);
    }
    this.answers.clear();
    this.control?.reject(err);
    this.control = null;
  }
}
