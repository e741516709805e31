// What the search service and its worker thread say to each other (search-worker.ts, service.ts).
import type { SearchQuery } from '../../../shared/schemas/search';
import type { CrewVisibility, Rank } from './searcher';

export interface DbSettings {
  database: string;
  username: string;
  password: string;
  host: string;
  port: number;
  /** DB_HOSTS: the worker's connections follow the same failover as the app's. */
  hosts?: { host: string; port: number }[];
}

export interface SearchWorkerData {
  /** Where the index file is read and written. */
  file: string;
  /** The database to read the shelf from; null when the worker is only given documents (benchmark). */
  db: DbSettings | null;
}

export type WorkerRequest =
  /** Load the saved index if it matches the shelf; otherwise build one and save it. */
  | { type: 'start' }
  /** Build from the database and save, unless the shelf's fingerprint is still `unless`. */
  | { type: 'build'; unless: string | null }
  /** Build from a JSON file of { documents, bodies } (the benchmark's catalogue) and save. */
  | { type: 'build-file'; documentsFile: string; fingerprint: string }
  | { type: 'search'; id: number; query: SearchQuery; visibility: CrewVisibility }
  /** Ratings and set-report figures, 6 numbers per part (RANK_FIELDS); NaN stands for null. */
  | { type: 'ranks'; data: Float64Array };

export type WorkerReply =
  | {
      type: 'ready';
      source: 'file' | 'build';
      /** Why the saved file was not used, when it was not. */
      reason: string | null;
      fingerprint: string;
      builtAt: string;
      documents: number;
      ids: Int32Array;
      buildMs: number | null;
      writeError: string | null;
    }
  | { type: 'unchanged' }
  | { type: 'failed'; error: string }
  | { type: 'answer'; id: number; ok: true; response: unknown }
  | { type: 'answer'; id: number; ok: false; error: { status: number; code: string; message: string; fields?: Record<string, string> } };

export const RANK_FIELDS = 7;

/** Ranks as a flat array, cheap to post: id, proven, reports, mean, count, adjusted, held up per part. */
export function packRanks(ranks: ReadonlyMap<number, Rank>): Float64Array {
  const data = new Float64Array(ranks.size * RANK_FIELDS);
  let i = 0;
  for (const [id, r] of ranks) {
    data.set([id, r.proven, r.reports, r.mean ?? NaN, r.count, r.adjusted ?? NaN, r.heldUp], i);
    i += RANK_FIELDS;
  }
  return data;
}

export function unpackRanks(data: Float64Array): Map<number, Rank> {
  const ranks = new Map<number, Rank>();
  const orNull = (v: number) => (Number.isNaN(v) ? null : v);
  for (let i = 0; i < data.length; i += RANK_FIELDS) {
    ranks.set(data[i], {
      proven: data[i + 1],
      reports: data[i + 2],
      mean: orNull(data[i + 3]),
      count: data[i + 4],
      adjusted: orNull(data[i + 5]),
      heldUp: data[i + 6],
    });
  }
  return ranks;
}
