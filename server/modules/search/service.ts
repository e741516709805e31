// Shelf search. A worker thread owns the index and answers the searches (search-worker.ts); this
// side only posts queries and passes pages back, so neither a search nor an index swap can hold
// the main event loop. A rebuild starts a second worker that reads the shelf, builds and saves
// the index while the first keeps answering; then new searches go to the new worker and the old
// one stops once its last answer is out. A search that runs past its time stops its worker, which
// is replaced from the saved file; that search gets a 503 and everyone else goes on.
import { QueryTypes, type Sequelize } from 'sequelize';
import type { SearchResponse } from '@shared/api/search';
import type { SearchQuery } from '@shared/schemas/search';
import { SEARCH_LIMITS } from '@shared/search/query';
import { AppError } from '../../errors';
import { PUBLIC_ONLY, type CrewVisibility, type Ranks } from './searcher';
import type { DbSettings, SearchWorkerData, WorkerReply } from './search-protocol';
import { SearchWorker, type Ready } from './search-worker-client';

export { SearchWorker } from './search-worker-client';

export interface SearchServiceDeps {
  sequelize: Sequelize;
  /** Where the serialized index is kept between runs. */
  indexFile: string;
  /** How long to gather changes before rebuilding (ms). */
  rebuildDelayMs?: number;
  /** Ratings and set-report figures per part, for 'best proven' and the rating filter. */
  ranking?: (partIds: number[]) => Promise<Ranks>;
  /** How long one search may take, the worker's round trip included, before it is stopped (ms). */
  queryTimeoutMs?: number;
  /**
   * How often the shelf's change log (shelf_changes, written by every instance in the transaction of
   * each change) is read, so changes made through other instances reach this index (ms; 0 = never).
   */
  changePollMs?: number;
  /** DB_HOSTS, when the database is several servers. */
  dbHosts?: { host: string; port: number }[];
}

/** Default poll of the change log: a change made elsewhere is in this instance's index within poll + rebuild delay + one build. */
export const CHANGE_POLL_MS = 1000;

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

function dbSettings(sequelize: Sequelize): DbSettings {
  const c = sequelize.config;
  return { database: c.database, username: c.username, password: c.password ?? '', host: c.host ?? '127.0.0.1', port: Number(c.port) };
}

export function createSearchService({
  sequelize,
  indexFile,
  rebuildDelayMs = 250,
  ranking,
  queryTimeoutMs = SEARCH_LIMITS.budgetMs * 3,
  changePollMs = CHANGE_POLL_MS,
  dbHosts,
}: SearchServiceDeps) {
  const workerData: SearchWorkerData = { file: indexFile, db: { ...dbSettings(sequelize), ...(dbHosts && { hosts: dbHosts }) } };
  let ranks: Ranks = new Map();
  let rankRefresh: Promise<void> | null = null;
  let rankAgain = false;

  let current: SearchWorker | null = null;
  let startup: Promise<SearchStats & { rebuiltBecause: string | null }> | null = null;
  let timer: NodeJS.Timeout | null = null;
  let running: Promise<void> | null = null;
  let replacing: Promise<void> | null = null;
  let dirty = false;
  let closed = false;
  let idleWaiters: (() => void)[] = [];
  const starting = new Set<SearchWorker>();
  const stats: Omit<SearchStats, 'documents' | 'fingerprint' | 'builtAt'> = { builds: 0, loadsFromFile: 0, source: null, lastError: null };

  // The change log as last seen, per kind: row count and highest id. Both, because on a Galera
  // cluster ids from different nodes interleave, so a change can commit with an id below the highest.
  const seen: Record<'index' | 'ranking', string | null> = { index: null, ranking: null };
  let seenVersion = 0;
  let pollTimer: NodeJS.Timeout | null = null;
  let polling = false;
  let pollFailing = false;

  async function readChangeLog(): Promise<Record<'index' | 'ranking', string>> {
    const rows = await sequelize.query<{ kind: 'index' | 'ranking'; n: number; top: number | null }>(
      "SELECT kind, COUNT(*) AS n, MAX(id) AS top FROM shelf_changes WHERE kind IN ('index', 'ranking') GROUP BY kind",
      { type: QueryTypes.SELECT },
    );
    const out = { index: '0:0', ranking: '0:0' };
    for (const r of rows) out[r.kind] = `${Number(r.n)}:${r.top ?? 0}`;
    return out;
  }

  /** One read of the change log: a move since the last read asks for a rebuild (or new ranking figures). */
  async function pollChanges(): Promise<void> {
    if (polling || closed) return;
    polling = true;
    const asOf = seenVersion;
    try {
      const now = await readChangeLog();
      // a rebuild that started meanwhile read the log after this poll did: its reading stands
      if (asOf !== seenVersion) return;
      if (seen.index !== null && now.index !== seen.index) service.scheduleRebuild();
      if (seen.ranking !== null && now.ranking !== seen.ranking) void refreshRanks();
      seen.index = now.index;
      seen.ranking = now.ranking;
      if (pollFailing) console.log('rigshelf: the search change log is readable again');
      pollFailing = false;
    } catch (err) {
      if (!pollFailing && !closed) console.error(`rigshelf: the search change log could not be read: ${(err as Error).message}`);
      pollFailing = true;
    } finally {
      polling = false;
    }
  }

  function startPolling() {
    if (pollTimer || closed || changePollMs <= 0) return;
    pollTimer = setInterval(() => void pollChanges(), changePollMs);
    pollTimer.unref();
  }

  /** Reloads the ranking figures for the parts the current index holds; calls close together share one. */
  function refreshRanks(): Promise<void> {
    if (!ranking) return Promise.resolve();
    if (rankRefresh) {
      rankAgain = true;
      return rankRefresh;
    }
    rankRefresh = (async () => {
      do {
        rankAgain = false;
        const serving = current;
        const ids = serving?.ready ? [...serving.ready.ids] : [];
        try {
          ranks = await ranking(ids);
          current?.sendRanks(ranks);
        } catch (err) {
          if (!closed) console.error('rigshelf: search ranking could not be refreshed:', err);
        }
      } while (rankAgain && !closed);
    })().finally(() => {
      rankRefresh = null;
    });
    return rankRefresh;
  }

  function spawn(): SearchWorker {
    const worker = new SearchWorker(workerData, (stuck) => replaceStuck(stuck));
    starting.add(worker);
    return worker;
  }

  // A worker booted ahead for the next rebuild: starting a thread and loading its modules takes
  // seconds on a busy CPU, which a change would otherwise wait for before its build even begins.
  let spare: SearchWorker | null = null;
  function takeSpare(): SearchWorker {
    const worker = spare ?? spawn();
    spare = null;
    return worker;
  }

  /** Puts a ready worker in place of the current one; the old one finishes what it was asked. */
  function swapIn(worker: SearchWorker, ready: Ready) {
    starting.delete(worker);
    worker.sendRanks(ranks);
    const old = current;
    current = worker;
    if (ready.source === 'build') stats.builds += 1;
    else stats.loadsFromFile += 1;
    stats.source = ready.source;
    if (ready.writeError) console.error(`rigshelf: search index could not be saved to ${indexFile}: ${ready.writeError}`);
    old?.retire();
    void refreshRanks();
    if (!spare && !closed) spare = spawn();
  }

  /** A search ran past its time: that worker is stopped and a fresh one loads the saved index. */
  function replaceStuck(stuck: SearchWorker) {
    void stuck.stop();
    if (current !== stuck || closed || replacing) return;
    current = null;
    replacing = (async () => {
      const worker = spawn();
      try {
        const reply = await worker.run({ type: 'start' });
        if (reply.type === 'ready' && !closed) swapIn(worker, reply);
        else await worker.stop();
      } catch (err) {
        stats.lastError = (err as Error).message;
        await worker.stop();
      } finally {
        starting.delete(worker);
      }
    })().finally(() => {
      replacing = null;
    });
  }

  /** Builds in a new worker unless the shelf is unchanged, then swaps it in. */
  async function rebuild() {
    // the build reads the shelf after this, so it covers every change logged so far (this
    // instance's own ones included, which then do not come back through the poll)
    if (changePollMs > 0) {
      const log = await readChangeLog().catch(() => null);
      if (log) {
        seen.index = log.index;
        seenVersion += 1;
      }
    }
    const worker = takeSpare();
    try {
      const reply = await worker.run({ type: 'build', unless: current?.ready?.fingerprint ?? null });
      if (reply.type === 'failed') throw new Error(reply.error);
      if (reply.type !== 'ready' || closed) {
        await worker.stop();
        return;
      }
      swapIn(worker, reply);
    } catch (err) {
      await worker.stop();
      throw err;
    } finally {
      starting.delete(worker);
    }
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
          // the next poll that reads the change log asks again
          seen.index = 'failed';
          seenVersion += 1;
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
        // read before the build: a change committed while it runs shows up at the first poll
        if (changePollMs > 0) await pollChanges();
        const worker = spawn();
        let reply: WorkerReply;
        try {
          reply = await worker.run({ type: 'start' });
        } catch (err) {
          await worker.stop();
          throw new Error(`The search index could not be built: ${(err as Error).message}`);
        }
        if (reply.type !== 'ready') {
          await worker.stop();
          throw new Error(`The search index could not be built: ${reply.type === 'failed' ? reply.error : reply.type}`);
        }
        swapIn(worker, reply);
        startPolling();
        return { ...service.stats(), rebuiltBecause: reply.reason };
      })();
      return startup;
    },

    /** Resolves when no rebuild (and no ranking refresh) is waiting or running. */
    async idle(): Promise<void> {
      if (timer || running) await new Promise<void>((resolve) => idleWaiters.push(resolve));
      while (rankRefresh || replacing) await (rankRefresh ?? replacing);
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

    /** Answered by the worker that holds the current index; the page comes back, nothing else. */
    search(query: SearchQuery, visibility: CrewVisibility = PUBLIC_ONLY): Promise<SearchResponse> {
      const now = current;
      if (!now) return Promise.reject(new AppError(503, 'search_starting', 'Search is still starting up. Try again in a few seconds.'));
      return now.search(query, queryTimeoutMs, visibility);
    },

    stats(): SearchStats {
      const ready = current?.ready;
      return { ...stats, documents: ready?.documents ?? 0, fingerprint: ready?.fingerprint ?? null, builtAt: ready?.builtAt ?? null };
    },

    /** Stops pending rebuilds and every worker thread. */
    async close(): Promise<void> {
      closed = true;
      if (pollTimer) clearInterval(pollTimer);
      pollTimer = null;
      if (timer) clearTimeout(timer);
      timer = null;
      const workers = [current, ...starting].filter((w): w is SearchWorker => !!w);
      current = null;
      await Promise.all(workers.map((w) => w.stop()));
      await running?.catch(() => undefined);
      settle();
    },
  };
  return service;
}

export type SearchService = ReturnType<typeof createSearchService>;
