// Shelf search: the current index and its documents live in memory. Rebuilds run off the request
// path in a worker thread and are swapped in whole; a search always sees one complete index.
import { readFile } from 'node:fs/promises';
import { Worker } from 'node:worker_threads';
import lunr from 'lunr';
import type { Sequelize } from 'sequelize';
import type { SearchResponse } from '@shared/api/search';
import type { SearchQuery } from '@shared/schemas/search';
import { AppError } from '../../errors';
import { loadBodies, loadDocuments, publishedFingerprint } from './documents';
import { SEARCH_FORMAT, type IndexFile, type SearchBody, type SearchDocument } from './index-builder';
import type { BuildJob, BuildResult } from './index-worker';
import { createSearcher, type Ranks, type Searcher } from './searcher';

export interface SearchServiceDeps {
  sequelize: Sequelize;
  /** Where the serialized index is kept between runs. */
  indexFile: string;
  /** How long to gather changes before rebuilding (ms). */
  rebuildDelayMs?: number;
  /** Ratings and set-report figures per part, for 'best proven' and the rating filter. */
  ranking?: (partIds: number[]) => Promise<Ranks>;
}

const WORKER_URL = new URL('./index-worker.ts', import.meta.url).href;
// Same start as the photo worker: load the TypeScript worker through tsx (works under tsx and vitest).
const BOOT = `import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(WORKER_URL)}); })`;

/** One worker thread for index builds, started on demand and stopped after a quiet minute. */
class IndexWorker {
  private worker: Worker | null = null;
  private waiting = new Map<number, { resolve(r: BuildResult): void; reject(e: Error): void }>();
  private nextId = 1;
  private idleTimer: NodeJS.Timeout | null = null;

  build(job: Omit<BuildJob, 'id'>): Promise<Extract<BuildResult, { ok: true }>> {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    const worker = this.ensure();
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      this.waiting.set(id, {
        resolve: (r) => (r.ok ? resolve(r) : reject(new Error(r.error))),
        reject,
      });
      worker.postMessage({ ...job, id } satisfies BuildJob);
    });
  }

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(BOOT, { eval: true });
    worker.on('message', (result: BuildResult) => {
      this.waiting.get(result.id)?.resolve(result);
      this.waiting.delete(result.id);
      if (!this.waiting.size) {
        this.idleTimer = setTimeout(() => void this.close(), 60_000);
        this.idleTimer.unref();
      }
    });
    worker.on('error', (err) => this.failAll(err));
    worker.on('exit', () => {
      if (this.worker === worker) this.worker = null;
      this.failAll(new Error('the search index worker stopped'));
    });
    worker.unref();
    this.worker = worker;
    return worker;
  }

  private failAll(err: Error) {
    for (const w of this.waiting.values()) w.reject(err);
    this.waiting.clear();
  }

  async close() {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }
}

interface Current {
  searcher: Searcher;
  fingerprint: string;
  builtAt: string;
}

export interface SearchStats {
  /** Index builds since this service was created (start-up included). */
  builds: number;
  /** Times an index was taken from the index file instead of being built. */
  loadsFromFile: number;
  /** Where the index in use came from. */
  source: 'file' | 'build' | null;
  documents: number;
  fingerprint: string | null;
  builtAt: string | null;
  lastError: string | null;
}

async function readIndexFile(file: string, fingerprint: string): Promise<{ file: IndexFile; index: lunr.Index } | string> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    return 'is missing';
  }
  let parsed: IndexFile;
  try {
    parsed = JSON.parse(text) as IndexFile;
  } catch {
    return 'is corrupt (not JSON)';
  }
  if (parsed?.format !== SEARCH_FORMAT) return `has format ${String(parsed?.format)}, this version writes ${SEARCH_FORMAT}`;
  if (parsed.fingerprint !== fingerprint) return 'is out of date with the shelf';
  if (!Array.isArray(parsed.documents) || !Array.isArray(parsed.bodies) || typeof parsed.index !== 'object' || !parsed.index) return 'is corrupt (missing parts)';
  try {
    return { file: parsed, index: lunr.Index.load(parsed.index) };
  } catch {
    return 'is corrupt (the index does not load)';
  }
}

export function createSearchService({ sequelize, indexFile, rebuildDelayMs = 250, ranking }: SearchServiceDeps) {
  let ranks: Ranks = new Map();
  let rankRefresh: Promise<void> | null = null;
  let rankAgain = false;

  /** Copies the mean rating onto the documents, where the minRating filter reads it. */
  function applyRanks(documents: readonly SearchDocument[]) {
    for (const doc of documents) doc.rating = ranks.get(doc.id)?.mean ?? null;
  }

  /** Reloads the ranking figures (cheap next to an index build); calls close together share one. */
  function refreshRanks(): Promise<void> {
    if (!ranking) return Promise.resolve();
    if (rankRefresh) {
      rankAgain = true;
      return rankRefresh;
    }
    rankRefresh = (async () => {
      do {
        rankAgain = false;
        const docs = current?.searcher.documents ?? [];
        try {
          ranks = await ranking(docs.map((d) => d.id));
          applyRanks(current?.searcher.documents ?? []);
        } catch (err) {
          if (!closed) console.error('rigshelf: search ranking could not be refreshed:', err);
        }
      } while (rankAgain && !closed);
    })().finally(() => {
      rankRefresh = null;
    });
    return rankRefresh;
  }

  const worker = new IndexWorker();
  let current: Current | null = null;
  let startup: Promise<SearchStats & { rebuiltBecause: string | null }> | null = null;
  let timer: NodeJS.Timeout | null = null;
  let running: Promise<void> | null = null;
  let dirty = false;
  let closed = false;
  let idleWaiters: (() => void)[] = [];
  let markReady!: () => void;
  const readyPromise = new Promise<void>((r) => (markReady = r));
  const stats: Omit<SearchStats, 'documents' | 'fingerprint' | 'builtAt'> = { builds: 0, loadsFromFile: 0, source: null, lastError: null };

  function install(documents: SearchDocument[], bodies: SearchBody[], index: lunr.Index, fingerprint: string, builtAt: string, source: 'file' | 'build') {
    // one assignment: a search that already holds the old searcher finishes with it
    applyRanks(documents);
    current = { searcher: createSearcher({ index, documents, bodies }), fingerprint, builtAt };
    stats.source = source;
    markReady();
    void refreshRanks();
  }

  /** Loads the published set and builds it in the worker, unless nothing changed since the last build. */
  async function rebuild() {
    const fingerprint = await publishedFingerprint(sequelize);
    if (current && current.fingerprint === fingerprint) return;
    const documents = await loadDocuments();
    const bodies = await loadBodies();
    if (closed) return;
    const built = await worker.build({ documents, bodies, fingerprint, file: indexFile });
    if (closed) return;
    if (built.writeError) console.error(`rigshelf: search index could not be saved to ${indexFile}: ${built.writeError}`);
    stats.builds += 1;
    install(documents, bodies, lunr.Index.load(built.index), fingerprint, new Date().toISOString(), 'build');
  }

  function settle() {
    if (timer || running) return;
    const waiters = idleWaiters;
    idleWaiters = [];
    for (const w of waiters) w();
  }

  /** Rebuilds until no change is waiting; one build at a time. */
  function run() {
    if (running || closed) return;
    running = (async () => {
      while (dirty && !closed) {
        dirty = false;
        try {
          await rebuild();
          stats.lastError = null;
        } catch (err) {
          stats.lastError = (err as Error).message;
          if (!closed) console.error('rigshelf: search index rebuild failed; searches keep the previous index:', err);
        }
      }
    })().finally(() => {
      running = null;
      settle();
    });
  }

  const service = {
    /**
     * Puts an index in place: the saved one if it matches the shelf, otherwise a fresh build
     * (saved for the next start). Says why it rebuilt ("is missing", "is out of date with the
     * shelf", …). Safe to call more than once.
     */
    start() {
      startup ??= (async () => {
        const fingerprint = await publishedFingerprint(sequelize);
        const saved = await readIndexFile(indexFile, fingerprint);
        if (typeof saved === 'object') {
          stats.loadsFromFile += 1;
          install(saved.file.documents, saved.file.bodies ?? [], saved.index, saved.file.fingerprint, saved.file.builtAt, 'file');
          return { ...service.stats(), rebuiltBecause: null };
        }
        dirty = true;
        run();
        await service.idle();
        if (!current) throw new Error(`The search index could not be built: ${stats.lastError ?? 'unknown error'}`);
        return { ...service.stats(), rebuiltBecause: `${indexFile} ${saved}` };
      })();
      return startup;
    },

    /** Resolves once an index is in place. */
    ready(): Promise<void> {
      return readyPromise;
    },

    /** Resolves when no rebuild (and no ranking refresh) is waiting or running. */
    async idle(): Promise<void> {
      if (timer || running) await new Promise<void>((resolve) => idleWaiters.push(resolve));
      while (rankRefresh) await rankRefresh;
    },

    /** Ratings or set reports changed: re-read the ranking figures (the text index stays). */
    rankingChanged(): void {
      if (!closed) void refreshRanks();
    },

    /** Asks for a rebuild; changes arriving close together share one. Searches go on meanwhile. */
    scheduleRebuild(): void {
      if (closed) return;
      dirty = true;
      if (timer || running) return; // a running build loops again for it
      timer = setTimeout(() => {
        timer = null;
        run();
      }, rebuildDelayMs);
      timer.unref();
    },

    search(query: SearchQuery): SearchResponse {
      const now = current;
      if (!now) throw new AppError(503, 'search_starting', 'Search is still starting up. Try again in a few seconds.');
      return now.searcher.search(query, ranks);
    },

    stats(): SearchStats {
      return {
        ...stats,
        documents: current?.searcher.size ?? 0,
        fingerprint: current?.fingerprint ?? null,
        builtAt: current?.builtAt ?? null,
      };
    },

    /** Stops pending rebuilds and the worker thread. */
    async close(): Promise<void> {
      closed = true;
      if (timer) clearTimeout(timer);
      timer = null;
      await worker.close();
      await running?.catch(() => undefined);
      settle();
    },
  };
  return service;
}

export type SearchService = ReturnType<typeof createSearchService>;
