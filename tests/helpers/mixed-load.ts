// Pieces of the mixed signed-in load and of the checks afterwards, shared by the single-machine chaos
// run (tests/chaos/harness.ts) and the cluster fault run (tests/cluster/harness.ts).

export const SEARCH_WORDS = ['bracket', 'rod', 'plate', 'clamp', 'monitor', 'cheese', '15mm', 'arri', 'cage', 'handle'];

export function pick<T>(items: T[]): T {
  return items[Math.floor(Math.random() * items.length)];
}

export interface Sample {
  route: string;
  /** 0: no answer (network error or client timeout); -1: cut off by the client on purpose. */
  status: number;
  ms: number;
  at: number;
  /** The start of the body of any answer from 500 up. */
  body?: string;
  /** What the client saw when no answer came (the network error's code, or the timeout). */
  error?: string;
}

/** Records every request's route, status, latency and (for 5xx) the start of its body. */
export class Recorder {
  readonly samples: Sample[] = [];

  async timed(route: string, run: () => Promise<Response>): Promise<Sample> {
    const at = Date.now();
    try {
      const res = await run();
      const body = await res.text();
      return this.add({ route, status: res.status, ms: Date.now() - at, at, body: res.status >= 500 ? body.slice(0, 300) : undefined });
    } catch (err) {
      const cause = (err as { cause?: { code?: string; message?: string } }).cause;
      const error = cause?.code ?? cause?.message ?? (err instanceof Error ? err.name : String(err));
      return this.add({ route, status: 0, ms: Date.now() - at, at, error });
    }
  }

  add(sample: Sample): Sample {
    this.samples.push(sample);
    return sample;
  }
}

export function statusLabel(status: number): string {
  return status === 0 ? 'no answer' : status === -1 ? 'cut off' : String(status);
}

export function countByRoute(samples: Sample[]): Record<string, { count: number; statuses: Record<string, number> }> {
  const byRoute: Record<string, { count: number; statuses: Record<string, number> }> = {};
  for (const s of samples) {
    const entry = (byRoute[s.route] ??= { count: 0, statuses: {} });
    entry.count += 1;
    const key = statusLabel(s.status);
    entry.statuses[key] = (entry.statuses[key] ?? 0) + 1;
  }
  return byRoute;
}

/** Nearest-rank percentile (p in 0..100) of `values`; 0 for none. */
export function percentile(values: number[], p: number): number {
  if (!values.length) return 0;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

/** Root SQL on one server, rows as arrays of strings. */
export type SqlRows = (q: string) => Promise<string[][]>;

export function rowsOf(sql: (q: string) => Promise<string>): SqlRows {
  return async (q) =>
    (await sql(q))
      .split('\n')
      .filter(Boolean)
      .map((line) => line.split('\t'));
}

export interface RatingAttempt {
  member: string;
  partId: number;
  stars: number;
  status: number;
  at: number;
}

/**
 * Every member's last acknowledged rating of a part is the one stored (or a later attempt that got
 * no clear answer and may have landed), in exactly one row.
 */
export async function ratingProblems(sql: SqlRows, db: string, emailLike: string, ratings: RatingAttempt[]): Promise<string[]> {
  const userIds = new Map<string, string>();
  for (const [id, email] of await sql(`SELECT id, email FROM ${db}.users WHERE email LIKE '${emailLike}'`)) userIds.set(email, id);
  const stored = new Map<string, { stars: number; rows: number }>();
  for (const [userId, partId, stars, rows] of await sql(
    `SELECT user_id, part_id, MAX(stars), COUNT(*) FROM ${db}.ratings WHERE user_id IN (${[...userIds.values()].join(',') || 0}) GROUP BY user_id, part_id`,
  )) {
    stored.set(`${userId}:${partId}`, { stars: Number(stars), rows: Number(rows) });
  }
  const problems: string[] = [];
  const byPair = new Map<string, RatingAttempt[]>();
  for (const r of ratings) {
    const key = `${userIds.get(r.member)}:${r.partId}`;
    byPair.set(key, [...(byPair.get(key) ?? []), r]);
  }
  for (const [key, attempts] of byPair) {
    const lastAck = attempts
      .map((a, i) => ({ a, i }))
      .filter(({ a }) => a.status === 200 || a.status === 201)
      .pop();
    if (!lastAck) continue;
    const row = stored.get(key);
    if (!row) {
      problems.push(`${key}: acknowledged rating missing`);
      continue;
    }
    if (row.rows !== 1) problems.push(`${key}: ${row.rows} rows`);
    const possible = new Set([
      lastAck.a.stars,
      ...attempts
        .slice(lastAck.i + 1)
        .filter((a) => a.status <= 0 || a.status >= 500)
        .map((a) => a.stars),
    ]);
    if (!possible.has(row.stars)) problems.push(`${key}: ${row.stars} stars stored, last acknowledged ${lastAck.a.stars}`);
  }
  return problems;
}

/** Acknowledged (201) titles missing from part_revisions, and titles stored more than once. */
export async function submissionProblems(sql: SqlRows, db: string, titleLike: string, submissions: { title: string; status: number }[]) {
  const stored = new Map<string, number>();
  for (const [title, n] of await sql(`SELECT title, COUNT(*) FROM ${db}.part_revisions WHERE title LIKE '${titleLike}' GROUP BY title`)) {
    stored.set(title, Number(n));
  }
  const acked = submissions.filter((s) => s.status === 201);
  return {
    acknowledged: acked.length,
    missing: acked.filter((s) => !stored.has(s.title)).map((s) => s.title),
    duplicated: [...stored].filter(([, n]) => n > 1).map(([t]) => t),
  };
}

/** Half records: rows that exist without the rows that must come with them. */
export async function databaseOrphans(sql: SqlRows, db: string): Promise<Record<string, number>> {
  const count = async (q: string) => Number((await sql(q))[0]?.[0] ?? 0);
  return {
    partsWithoutRevision: await count(`SELECT COUNT(*) FROM ${db}.parts p WHERE NOT EXISTS (SELECT 1 FROM ${db}.part_revisions r WHERE r.part_id = p.id)`),
    partsWithoutLatestRevision: await count(`SELECT COUNT(*) FROM ${db}.parts WHERE latest_revision_id IS NULL`),
    filesOnNoRevision: await count(`SELECT COUNT(*) FROM ${db}.part_files f WHERE NOT EXISTS (SELECT 1 FROM ${db}.revision_files rf WHERE rf.file_id = f.id)`),
    revisionsWithoutModel: await count(
      `SELECT COUNT(*) FROM ${db}.part_revisions r WHERE NOT EXISTS (SELECT 1 FROM ${db}.revision_files rf JOIN ${db}.part_files f ON f.id = rf.file_id WHERE rf.revision_id = r.id AND f.kind = 'model')`,
    ),
    revisionsWithoutRecipe: await count(
      `SELECT COUNT(*) FROM ${db}.part_revisions r WHERE NOT EXISTS (SELECT 1 FROM ${db}.recipes c WHERE c.revision_id = r.id)`,
    ),
  };
}
