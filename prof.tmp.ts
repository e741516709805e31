import { Session } from 'node:inspector/promises';
import { writeFileSync } from 'node:fs';
import { searchQuerySchema } from './shared/schemas/search';
import { buildIndex } from './server/modules/search/index-builder';
import { createSearcher } from './server/modules/search/searcher';
import { BENCH_QUERIES, inventedCatalogue, inventedBodies } from './tests/bench/search-catalogue';
const docs = inventedCatalogue(Number(process.argv[2] ?? 10000));
const s = createSearcher({ index: buildIndex(docs), documents: docs, bodies: inventedBodies() });
const qs = BENCH_QUERIES.map((q) => searchQuerySchema.parse(q.query));
for (const q of qs) s.search(q);
const session = new Session(); session.connect(); await session.post('Profiler.enable'); await session.post('Profiler.start');
const per = new Map<string, number>();
for (let r = 0; r < 3; r++) for (let i = 0; i < qs.length; i++) { const t = performance.now(); s.search(qs[i]); per.set(JSON.stringify(BENCH_QUERIES[i].query), (per.get(JSON.stringify(BENCH_QUERIES[i].query)) ?? 0) + (performance.now() - t) / 3); }
const { profile } = await session.post('Profiler.stop');
writeFileSync('/tmp/s/search.cpuprofile', JSON.stringify(profile));
const self = new Map<string, number>(); const total = profile.samples!.length;
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
const counts = new Map<number, number>(); for (const id of profile.samples!) counts.set(id, (counts.get(id) ?? 0) + 1);
for (const [id, c] of counts) { const n = byId.get(id)!; const k = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').slice(-2).join('/')}:${n.callFrame.lineNumber}`; self.set(k, (self.get(k) ?? 0) + c); }
console.log([...self].sort((a, b) => b[1] - a[1]).slice(0, 25).map(([k, v]) => `${(100 * v / total).toFixed(1)}% ${k}`).join('\n'));
console.log([...per].sort((a, b) => b[1] - a[1]).slice(0, 12).map(([k, v]) => `${v.toFixed(1)}ms ${k}`).join('\n'));
