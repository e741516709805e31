/**
 * Shelf search benchmark: our lunr search (the service's own builder and searcher) against
 * MiniSearch and MariaDB FULLTEXT, on invented catalogues of 10,000 and 50,000 parts.
 *
 *   npm run bench:search                 (DB_PORT=3348 npm run bench:search to use another port)
 *   node_modules/.bin/tsx tests/bench/search.bench.ts --sizes 2000,10000
 *
 * The parent starts the private test MariaDB (server/scripts/local-env.ts, as `npm test` does),
 * creates the database rigshelf_bench and drops it at the end. Each contender × size runs in its
 * own child process (node --expose-gc) on the same seeded catalogue and the same fixed query set:
 *
 * - lunr: buildIndex / indexFileContent / lunr.Index.load + createSearcher, what the search worker
 *   does; a query is searcher.search() (text, filters, facets, sort, page). In a process of its
 *   own, the live path: a SearchWorker (the server's class) loads the index file and answers
 *   searches posted from the main thread; then a second worker builds and is swapped in while
 *   searches go on, and the main thread's longest event-loop stall is printed.
 * - MiniSearch: the same index records (indexRecord) and term processing (lunr's trimmer, stop
 *   words and stemmer), the same boosts, fuzzy 0.2, prefix, AND; then our filterAndPage().
 * - MariaDB: one table with a FULLTEXT index over all fields plus weighted ones (title ×10,
 *   bodies+mounts ×8, summary ×4, the rest ×1); MATCH … AGAINST in natural language mode, filters
 *   as WHERE clauses, one query for the page with its total, one for the facets.
 *
 * Latency: every query of the set once to warm up, then rounds of the whole set; p50/p95/p99 over
 * all samples. Memory: heap and RSS of the child after building, minus before (documents already
 * in memory in both); for MariaDB the server process's RSS and the tables' size on disk.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay, performance as perf } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import lunr from 'lunr';
import { createConnection, type Connection } from 'mariadb';
import MiniSearch from 'minisearch';
import { searchQuerySchema, type SearchQuery } from '../../shared/schemas/search';
import { expandMountAliases } from '../../shared/search/aliases';
import { readQueryText } from '../../shared/search/query';
import { resolveBody } from '../../shared/search/bodies';
import { SearchWorker } from '../../server/modules/search/service';
import { FIELD_BOOSTS, SEARCH_FIELDS, buildIndex, indexFileContent, indexRecord, type SearchDocument } from '../../server/modules/search/index-builder';
import { createSearcher, filterAndPage, sortNewestFirst, type Match } from '../../server/modules/search/searcher';
import { localInstance } from '../../server/scripts/local-env';
import { BENCH_QUERIES, inventedBodies, inventedCatalogue, type QueryKind } from './search-catalogue';

const MB = 1e6;
const BENCH_DB = 'rigshelf_bench';
const CHILD_TIMEOUT_MS = 600_000;
/** Time for the measured query rounds per contender and size (at least 3 rounds, at most 30). */
const QUERY_BUDGET_MS = 20_000;

type Contender = 'lunr' | 'minisearch' | 'mariadb';
/** The live path runs in a process of its own, so this main thread holds no index of its own to collect. */
type Child = Contender | 'lunr-live';

interface Report {
  contender: Contender;
  size: number;
  buildMs: number;
  serializedMb: number;
  loadMs: number | null;
  samples: number;
  rounds: number;
  latency: { p50: number; p95: number; p99: number };
  byKind: Record<QueryKind, number>;
  heapMb: number | null;
  rssMb: number;
  /** Sum of `total` over the query set, to show how differently the engines match. */
  hits: number;
  /** lunr only: the live path, through the search worker the server uses. */
  live?: { p50: number; p95: number; p99: number; stallMs: number; stallsOver50: number; stallP99Ms: number; utilisation: number; swapBuildMs: number };
  note?: string;
}

const gc = () => (globalThis as { gc?: () => void }).gc?.();
const memory = () => {
  gc();
  gc();
  return process.memoryUsage();
};

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

function summarise(samples: { kind: QueryKind; ms: number }[]) {
  const all = samples.map((s) => s.ms).sort((a, b) => a - b);
  const byKind = {} as Record<QueryKind, number>;
  for (const kind of ['text', 'text+filters', 'filters', 'envelope'] as QueryKind[]) {
    const k = samples
      .filter((s) => s.kind === kind)
      .map((s) => s.ms)
      .sort((a, b) => a - b);
    byKind[kind] = percentile(k, 50);
  }
  return { latency: { p50: percentile(all, 50), p95: percentile(all, 95), p99: percentile(all, 99) }, byKind };
}

const parsedQueries = () => BENCH_QUERIES.map((q) => ({ kind: q.kind, query: searchQuerySchema.parse(q.query) }));

/** Body names as slugs, for the contenders that do not read names themselves (our searcher does). */
const BODIES = inventedBodies();
function withBodySlugs(q: SearchQuery): SearchQuery {
  return {
    ...q,
    body: q.body.map((b) => {
      const r = resolveBody(b, BODIES);
      return r.ok ? r.slug : b;
    }),
  };
}

/** Runs the query set once to warm up, then whole rounds until the budget is spent. */
async function measureQueries(run: (q: SearchQuery) => Promise<number> | number) {
  const queries = parsedQueries();
  let hits = 0;
  for (const q of queries) hits += await run(q.query);
  const samples: { kind: QueryKind; ms: number }[] = [];
  const started = performance.now();
  let rounds = 0;
  while (rounds < 3 || (rounds < 30 && performance.now() - started < QUERY_BUDGET_MS)) {
    for (const q of queries) {
      const t = performance.now();
      await run(q.query);
      samples.push({ kind: q.kind, ms: performance.now() - t });
    }
    rounds += 1;
  }
  return { hits, rounds, samples };
}

// ---------------------------------------------------------------------------------------------
// lunr: the service's own code

async function benchLunr(docs: SearchDocument[]): Promise<Omit<Report, 'contender' | 'size'>> {
  const before = memory();
  const t = performance.now();
  const index = buildIndex(docs);
  const buildMs = performance.now() - t;
  const searcher = createSearcher({ index, documents: docs });
  const after = memory();
  const { serializedMb, loadMs } = (() => {
    const content = indexFileContent(docs, 'bench', index);
    // what start() does with a saved file
    const started = performance.now();
    const file = JSON.parse(content);
    const loaded = createSearcher({ index: lunr.Index.load(file.index), documents: file.documents });
    const ms = performance.now() - started;
    const first = parsedQueries()[0].query;
    if (loaded.search(first).total !== searcher.search(first).total) throw new Error('the loaded index answers differently');
    return { serializedMb: Buffer.byteLength(content) / MB, loadMs: ms };
  })();
  gc();
  const { hits, rounds, samples } = await measureQueries((q) => searcher.search(q).total);
  return {
    buildMs,
    serializedMb,
    loadMs,
    rounds,
    samples: samples.length,
    ...summarise(samples),
    heapMb: (after.heapUsed - before.heapUsed) / MB,
    rssMb: (after.rss - before.rss) / MB,
    hits,
  };
}

/**
 * The server's live path: a SearchWorker loads the saved index and answers searches posted from
 * this (main) thread. Then, while searches keep going to it, a second worker builds a new index
 * and is swapped in exactly as the service does it. The main thread's longest stall over the
 * whole rebuild and swap is what a request would have waited, at worst.
 */
async function liveLunr(catalogue: SearchDocument[]) {
  const dir = mkdtempSync(join(tmpdir(), 'rigshelf-bench-'));
  try {
    // the main thread keeps no documents and no index: both workers build from this file
    const documentsFile = join(dir, 'documents.json');
    writeFileSync(documentsFile, JSON.stringify({ documents: catalogue, bodies: BODIES }));
    catalogue.length = 0;
    let serving = new SearchWorker({ file: join(dir, 'first.json'), db: null });
    if ((await serving.run({ type: 'build-file', documentsFile, fingerprint: 'first' })).type !== 'ready') throw new Error('the search worker did not build');
    const { samples } = await measureQueries(async (q) => (await serving.search(q, 60_000)).total);
    const latency = summarise(samples).latency;

    const queries = parsedQueries().map((q) => q.query);
    gc();
    const delay = monitorEventLoopDelay({ resolution: 5 });
    let last = performance.now();
    let stall = 0;
    let over50 = 0;
    const probe = setInterval(() => {
      const now = performance.now();
      stall = Math.max(stall, now - last);
      if (now - last > 52) over50 += 1;
      last = now;
    }, 2);
    let searching = true;
    const traffic = (async () => {
      for (let i = 0; searching; i++) await serving.search(queries[i % queries.length], 60_000);
    })();
    delay.enable();
    const elu = perf.eventLoopUtilization();
    const next = new SearchWorker({ file: join(dir, 'second.json'), db: null });
    const built = await next.run({ type: 'build-file', documentsFile, fingerprint: 'second' });
    if (built.type !== 'ready') throw new Error('the second search worker did not build');
    // the swap, as service.ts swapIn does it
    next.sendRanks(new Map());
    const old = serving;
    serving = next;
    old.retire();
    await new Promise((r) => setTimeout(r, 300));
    searching = false;
    await traffic;
    const used = perf.eventLoopUtilization(elu);
    delay.disable();
    clearInterval(probe);
    await serving.stop();
    // the probe ticks every 2 ms: a gap of 2 ms is no stall
    return {
      ...latency,
      stallMs: Math.max(0, stall - 2),
      stallsOver50: over50,
      stallP99Ms: delay.percentile(99) / 1e6,
      utilisation: used.utilization,
      swapBuildMs: built.buildMs ?? 0,
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// MiniSearch, with our records and our term processing

function processTerm(term: string): string | null {
  let token: lunr.Token | undefined = lunr.trimmer(new lunr.Token(term.toLowerCase(), {}));
  token = token && lunr.stopWordFilter(token);
  token = token && lunr.stemmer(token);
  const text = token?.toString() ?? '';
  return text ? text : null;
}

const miniOptions = {
  idField: 'id',
  fields: SEARCH_FIELDS as string[],
  tokenize: (text: string) => text.split(/[\s-]+/),
  processTerm,
  searchOptions: { boost: { ...FIELD_BOOSTS }, fuzzy: 0.2, prefix: true, combineWith: 'AND' as const },
};

async function benchMiniSearch(docs: SearchDocument[]): Promise<Omit<Report, 'contender' | 'size'>> {
  const before = memory();
  const t = performance.now();
  const mini = new MiniSearch(miniOptions);
  mini.addAll(docs.map(indexRecord));
  const buildMs = performance.now() - t;
  const byId = new Map(docs.map((d) => [String(d.id), d]));
  const newest = sortNewestFirst(docs).map((doc) => ({ doc, score: 0 }));
  const after = memory();
  const { serializedMb, loadMs } = (() => {
    const content = JSON.stringify({ documents: docs, index: mini });
    const started = performance.now();
    const file = JSON.parse(content);
    MiniSearch.loadJS(file.index, miniOptions);
    return { serializedMb: Buffer.byteLength(content) / MB, loadMs: performance.now() - started };
  })();
  gc();
  const { hits, rounds, samples } = await measureQueries((raw) => {
    const q = withBodySlugs(raw);
    const text = readQueryText(q.q);
    let matches: Match[];
    if (text.kind === 'none') matches = newest;
    else matches = mini.search(expandMountAliases(q.q ?? '').replaced).map((r) => ({ doc: byId.get(String(r.id))!, score: r.score }));
    return filterAndPage(matches, q, text.kind !== 'none').total;
  });
  return {
    buildMs,
    serializedMb,
    loadMs,
    rounds,
    samples: samples.length,
    ...summarise(samples),
    heapMb: (after.heapUsed - before.heapUsed) / MB,
    rssMb: (after.rss - before.rss) / MB,
    hits,
  };
}

// ---------------------------------------------------------------------------------------------
// MariaDB FULLTEXT

function serverRssMb(): number {
  const pid = Number(process.env.BENCH_MARIADB_PID);
  const status = readFileSync(`/proc/${pid}/status`, 'utf8');
  return Number(/VmRSS:\s+(\d+)/.exec(status)![1]) / 1000;
}

const ALL_TEXT = 'title, bodies, mounts, summary, dimensions, category_label, materials, description';

async function createTables(db: Connection) {
  for (const t of ['bench_bodies', 'bench_mounts', 'bench_materials', 'bench_dims', 'bench_parts']) await db.query(`DROP TABLE IF EXISTS ${t}`);
  await db.query(`CREATE TABLE bench_parts (
    id INT UNSIGNED PRIMARY KEY,
    title VARCHAR(600) NOT NULL, bodies TEXT NOT NULL, mounts TEXT NOT NULL, summary VARCHAR(1200) NOT NULL,
    dimensions TEXT NOT NULL, category_label VARCHAR(80) NOT NULL, materials VARCHAR(120) NOT NULL, description TEXT NOT NULL,
    category VARCHAR(40) NOT NULL, adaptable BOOLEAN NOT NULL, rating DECIMAL(3,2) NULL, published_at DATETIME(3) NOT NULL,
    s1 DECIMAL(10,3) NULL, s2 DECIMAL(10,3) NULL, s3 DECIMAL(10,3) NULL,
    KEY (category), KEY (published_at)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  for (const [t, col] of [
    ['bench_bodies', 'slug VARCHAR(80)'],
    ['bench_mounts', 'slug VARCHAR(40)'],
    ['bench_materials', 'slug VARCHAR(20)'],
  ]) {
    await db.query(`CREATE TABLE ${t} (part_id INT UNSIGNED NOT NULL, ${col} NOT NULL, PRIMARY KEY (part_id, slug), KEY (slug, part_id)) ENGINE=InnoDB`);
  }
  await db.query(
    'CREATE TABLE bench_dims (part_id INT UNSIGNED NOT NULL, name VARCHAR(60) NOT NULL, value_mm DECIMAL(12,6) NOT NULL, KEY (part_id)) ENGINE=InnoDB',
  );
}

async function insertBatched(db: Connection, table: string, columns: string[], rows: unknown[][]) {
  const per = 500;
  for (let i = 0; i < rows.length; i += per) {
    const batch = rows.slice(i, i + per);
    const placeholders = batch.map(() => `(${columns.map(() => '?').join(',')})`).join(',');
    await db.query(`INSERT INTO ${table} (${columns.join(',')}) VALUES ${placeholders}`, batch.flat());
  }
}

function sqlFor(q: SearchQuery): { where: string; params: unknown[]; text: string | null } {
  const clauses: string[] = [];
  const params: unknown[] = [];
  const text = q.q ? expandMountAliases(q.q).replaced : null;
  if (text) {
    clauses.push(`MATCH(${ALL_TEXT}) AGAINST(? IN NATURAL LANGUAGE MODE)`);
    params.push(text);
  }
  const inList = (table: string, values: readonly string[]) => {
    clauses.push(`EXISTS (SELECT 1 FROM ${table} x WHERE x.part_id = p.id AND x.slug IN (${values.map(() => '?').join(',')}))`);
    params.push(...values);
  };
  if (q.body.length) inList('bench_bodies', q.body);
  if (q.mount.length) inList('bench_mounts', q.mount);
  if (q.material.length) inList('bench_materials', q.material);
  if (q.category.length) {
    clauses.push(`p.category IN (${q.category.map(() => '?').join(',')})`);
    params.push(...q.category);
  }
  if (q.adaptable !== undefined) {
    clauses.push('p.adaptable = ?');
    params.push(q.adaptable);
  }
  if (q.minRating) {
    clauses.push('p.rating >= ?');
    params.push(q.minRating);
  }
  if (q.fit) {
    const [e1, e2, e3] = [...q.fit].sort((a, b) => a - b);
    clauses.push('p.s1 <= ? AND p.s2 <= ? AND p.s3 <= ?');
    params.push(e1, e2, e3);
  }
  for (const d of q.dim) {
    clauses.push('EXISTS (SELECT 1 FROM bench_dims d WHERE d.part_id = p.id AND d.name LIKE ? AND ABS(d.value_mm - ?) <= ?)');
    params.push(`%${d.name.toLowerCase()}%`, d.valueMm, d.tolMm);
  }
  return { where: clauses.length ? clauses.join(' AND ') : '1', params, text };
}

async function sqlSearch(db: Connection, q: SearchQuery): Promise<number> {
  const { where, params, text } = sqlFor(q);
  const score = text
    ? `(MATCH(${ALL_TEXT}) AGAINST(? IN NATURAL LANGUAGE MODE) + 9 * MATCH(title) AGAINST(? IN NATURAL LANGUAGE MODE)
        + 7 * MATCH(bodies, mounts) AGAINST(? IN NATURAL LANGUAGE MODE) + 3 * MATCH(summary) AGAINST(? IN NATURAL LANGUAGE MODE))`
    : '0';
  const order = text && q.sort !== 'newest' ? 'score DESC, p.published_at DESC, p.id DESC' : 'p.published_at DESC, p.id DESC';
  const page = await db.query(
    `SELECT p.id, ${score} AS score, COUNT(*) OVER () AS total FROM bench_parts p WHERE ${where} ORDER BY ${order} LIMIT ? OFFSET ?`,
    [...(text ? [text, text, text, text] : []), ...params, q.pageSize, (q.page - 1) * q.pageSize],
  );
  await db.query(
    `WITH hits AS (SELECT p.id, p.category FROM bench_parts p WHERE ${where})
     SELECT 'category' AS facet, category AS value, COUNT(*) AS n FROM hits GROUP BY category
     UNION ALL SELECT 'mount', m.slug, COUNT(*) FROM hits JOIN bench_mounts m ON m.part_id = hits.id GROUP BY m.slug
     UNION ALL SELECT 'body', b.slug, COUNT(*) FROM hits JOIN bench_bodies b ON b.part_id = hits.id GROUP BY b.slug
     UNION ALL SELECT 'material', x.slug, COUNT(*) FROM hits JOIN bench_materials x ON x.part_id = hits.id GROUP BY x.slug`,
    params,
  );
  return page.length ? Number(page[0].total) : 0;
}

async function benchMariaDb(docs: SearchDocument[]): Promise<Omit<Report, 'contender' | 'size'>> {
  const db = await createConnection({
    host: process.env.DB_HOST,
    port: Number(process.env.DB_PORT),
    user: process.env.DB_USER,
    password: process.env.DB_PASSWORD,
    database: BENCH_DB,
  });
  try {
    await createTables(db);
    const rssBefore = serverRssMb();
    const t = performance.now();
    const records = docs.map((d) => ({ d, r: indexRecord(d) }));
    await insertBatched(
      db,
      'bench_parts',
      [
        'id',
        'title',
        'bodies',
        'mounts',
        'summary',
        'dimensions',
        'category_label',
        'materials',
        'description',
        'category',
        'adaptable',
        'rating',
        'published_at',
        's1',
        's2',
        's3',
      ],
      records.map(({ d, r }) => {
        const s = d.sizeMm ? [...d.sizeMm].sort((a, b) => a - b).map((v) => Math.round(v * 1000) / 1000) : [null, null, null];
        return [
          d.id,
          r.title,
          r.bodies,
          r.mounts,
          r.summary,
          r.dimensions,
          r.category,
          r.materials,
          r.description,
          d.category,
          d.adaptable,
          d.rating,
          new Date(d.publishedAt),
          ...s,
        ];
      }),
    );
    await insertBatched(
      db,
      'bench_bodies',
      ['part_id', 'slug'],
      docs.flatMap((d) => [...new Set(d.bodies.map((b) => b.slug))].map((s) => [d.id, s])),
    );
    await insertBatched(
      db,
      'bench_mounts',
      ['part_id', 'slug'],
      docs.flatMap((d) => [...new Set(d.mounts.map((m) => m.slug))].map((s) => [d.id, s])),
    );
    await insertBatched(
      db,
      'bench_materials',
      ['part_id', 'slug'],
      docs.flatMap((d) => d.materials.map((s) => [d.id, s])),
    );
    await insertBatched(
      db,
      'bench_dims',
      ['part_id', 'name', 'value_mm'],
      docs.flatMap((d) => d.keyDimensions.map((k) => [d.id, k.name.toLowerCase(), k.valueMm])),
    );
    // InnoDB builds one FULLTEXT index per statement
    for (const cols of [ALL_TEXT, 'title', 'bodies, mounts', 'summary']) await db.query(`ALTER TABLE bench_parts ADD FULLTEXT (${cols})`);
    await db.query('ANALYZE TABLE bench_parts, bench_bodies, bench_mounts, bench_materials, bench_dims');
    const buildMs = performance.now() - t;
    const [sizes] = await db.query(
      `SELECT SUM(data_length + index_length) AS bytes FROM information_schema.tables WHERE table_schema = ? AND table_name LIKE 'bench\\_%'`,
      [BENCH_DB],
    );
    const rssAfter = serverRssMb();
    const { hits, rounds, samples } = await measureQueries((q) => sqlSearch(db, withBodySlugs(q)));
    return {
      buildMs,
      serializedMb: Number(sizes.bytes) / MB,
      loadMs: null,
      rounds,
      samples: samples.length,
      ...summarise(samples),
      heapMb: null,
      rssMb: rssAfter - rssBefore,
      hits,
      note: 'size = InnoDB data + indexes; RSS = mariadbd (buffer pool 128 MB)',
    };
  } finally {
    await db.end();
  }
}

async function child(contender: Child, size: number) {
  const docs = inventedCatalogue(size);
  if (contender === 'lunr-live') {
    process.stdout.write(`${JSON.stringify(await liveLunr(docs))}\n`);
    return;
  }
  const run = { lunr: benchLunr, minisearch: benchMiniSearch, mariadb: benchMariaDb }[contender];
  const report: Report = { contender, size, ...(await run(docs)) };
  process.stdout.write(`${JSON.stringify(report)}\n`);
}

// ---------------------------------------------------------------------------------------------
// Parent

function spawnChild<T = Report>(contender: Child, size: number, env: NodeJS.ProcessEnv): T {
  const self = fileURLToPath(import.meta.url);
  const result = spawnSync(process.execPath, ['--expose-gc', '--import', 'tsx', self, '--child', contender, String(size)], {
    encoding: 'utf8',
    timeout: CHILD_TIMEOUT_MS,
    maxBuffer: 16 * 1024 * 1024,
    env,
  });
  if (result.status !== 0) throw new Error(`${contender} at ${size} failed (status ${result.status}, signal ${result.signal}):\n${result.stderr}`);
  return JSON.parse(result.stdout.trim().split('\n').pop()!) as T;
}

const f = (n: number | null, digits = 1) => (n === null ? 'n/a' : n.toFixed(digits));
const ratio = (a: number | null, b: number | null) => (a === null || b === null || b === 0 ? 'n/a' : `${(a / b).toFixed(2)}×`);

function table(reports: Report[]) {
  const [l, m, d] = (['lunr', 'minisearch', 'mariadb'] as Contender[]).map((c) => reports.find((r) => r.contender === c)!);
  const rows: [string, (r: Report) => number | null, number][] = [
    ['build / index ms', (r) => r.buildMs, 0],
    ['serialized / on-disk MB', (r) => r.serializedMb, 1],
    ['load ms', (r) => r.loadMs, 0],
    ['query p50 ms', (r) => r.latency.p50, 2],
    ['query p95 ms', (r) => r.latency.p95, 2],
    ['query p99 ms', (r) => r.latency.p99, 2],
    ['  p50 text only', (r) => r.byKind.text, 2],
    ['  p50 text + filters', (r) => r.byKind['text+filters'], 2],
    ['  p50 filters only', (r) => r.byKind.filters, 2],
    ['  p50 envelope', (r) => r.byKind.envelope, 2],
    ['heap delta MB', (r) => r.heapMb, 1],
    ['RSS delta MB', (r) => r.rssMb, 1],
    ['hits (sum of totals)', (r) => r.hits, 0],
  ];
  console.table(
    Object.fromEntries(
      rows.map(([label, get, digits]) => [
        label,
        {
          lunr: f(get(l), digits),
          minisearch: f(get(m), digits),
          'MariaDB FT': f(get(d), digits),
          'lunr/mini': ratio(get(l), get(m)),
          'lunr/MariaDB': ratio(get(l), get(d)),
        },
      ]),
    ),
  );
  console.log(`samples: lunr ${l.samples} (${l.rounds} rounds), minisearch ${m.samples}, MariaDB ${d.samples}; ${d.note}`);
  if (l.live) {
    console.log(
      `lunr live path (search worker, round trip from the main thread): p50 ${f(l.live.p50, 2)} ms, p95 ${f(l.live.p95, 2)} ms, p99 ${f(l.live.p99, 2)} ms; ` +
        `rebuild + swap under search traffic: longest main-thread stall ${f(l.live.stallMs, 1)} ms, ${l.live.stallsOver50} stall(s) over 50 ms ` +
        `(event-loop delay p99 ${f(l.live.stallP99Ms, 1)} ms; main-thread utilisation ${f(100 * l.live.utilisation, 1)} %; build in the worker ${f(l.live.swapBuildMs, 0)} ms)`,
    );
  }
}

async function parent(sizes: number[]) {
  const started = performance.now();
  const { db, env } = localInstance('test');
  const wasRunning = await db.isAcceptingLogins();
  await db.start();
  await db.provision({ database: BENCH_DB, user: env.DB_USER, password: env.DB_PASSWORD });
  const pid = readFileSync(db.pidFile, 'utf8').trim();
  const childEnv = { ...process.env, ...env, BENCH_MARIADB_PID: pid };
  console.log(
    `Node ${process.version}; ${BENCH_QUERIES.length} queries (text, text + filters, filters, envelope); MB = 10^6 bytes; each contender in its own process.`,
  );
  try {
    for (const size of sizes) {
      console.log(`\n${size.toLocaleString('en-US')} invented parts`);
      const reports = (['lunr', 'minisearch', 'mariadb'] as Contender[]).map((c) => spawnChild(c, size, childEnv));
      reports[0].live = spawnChild<Report['live']>('lunr-live', size, childEnv);
      table(reports);
    }
  } finally {
    await db.sql(`DROP DATABASE IF EXISTS \`${BENCH_DB}\``);
    if (!wasRunning) await db.stop();
  }
  console.log(`\nTotal ${((performance.now() - started) / 1000).toFixed(0)} s`);
}

const args = process.argv.slice(2);
if (args[0] === '--child') {
  await child(args[1] as Child, Number(args[2]));
} else {
  const sizesFlag = args.indexOf('--sizes');
  await parent(sizesFlag >= 0 ? args[sizesFlag + 1].split(',').map(Number) : [10_000, 50_000]);
}
