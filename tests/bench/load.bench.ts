/**
 * Load benchmark: throughput and p50/p95/p99 per route at 25 and 50 signed-in members against the
 * real server process on a private MariaDB, then the event-loop lag while 40 MB STL files are
 * analysed. Prints figures; asserts nothing.
 *
 *   npm run bench:load [-- --seconds 30 --levels 25,50 --think-ms 250 --stl-mb 40]
 *
 * Each member runs a closed loop (one request at a time) over a mix of search, part page, model
 * download, a part submission with a small STL, and a rating, pausing 0–2×think-ms between requests.
 * Load and server share the machine, so the figures include the load generator's own CPU.
 * Event-loop lag comes from inside the server (LOOP_LAG_LOG_S makes it log monitorEventLoopDelay
 * figures; nothing new is served) and, as a cross-check, from timing a tiny /api/health request
 * every 50 ms during the uploads. Targets: p95 ≤ 300 ms at 25 members on 2 cores; lag ≤ 50 ms
 * while a 40 MB STL is analysed.
 */
import { cpus, loadavg } from 'node:os';
import { boxStl } from '../helpers/meshes';
import { addMembers, Member, publishedParts, scratchDb, sleep, spawnServer, loadSubmission } from '../helpers/system';

function flag(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}
const SECONDS = Number(flag('seconds', '30'));
const LEVELS = flag('levels', '25,50').split(',').map(Number);
const THINK_MS = Number(flag('think-ms', '250'));
const STL_MB = Number(flag('stl-mb', '40'));
const PASSWORD = 'bench load password';

type Route = 'search' | 'part page' | 'download' | 'submit (STL)' | 'rating';
interface Sample {
  route: Route;
  ms: number;
  status: number;
}

// A torus of u × v quads, 2·u·v facets (a watertight mesh, as tests/bench/mesh.bench.ts makes).
function torusStl(u: number, v: number, majorRadius = 60, minorRadius = 20): Uint8Array<ArrayBuffer> {
  const vertices = new Float32Array(u * v * 3);
  for (let i = 0; i < u; i++) {
    const theta = (2 * Math.PI * i) / u;
    for (let j = 0; j < v; j++) {
      const phi = (2 * Math.PI * j) / v;
      const k = (i * v + j) * 3;
      vertices[k] = (majorRadius + minorRadius * Math.cos(phi)) * Math.cos(theta);
      vertices[k + 1] = (majorRadius + minorRadius * Math.cos(phi)) * Math.sin(theta);
      vertices[k + 2] = minorRadius * Math.sin(phi);
    }
  }
  const facets = 2 * u * v;
  const bytes = new Uint8Array(84 + 50 * facets);
  const view = new DataView(bytes.buffer);
  bytes.set(new TextEncoder().encode('solid load benchmark torus (binary)'));
  view.setUint32(80, facets, true);
  let o = 84;
  const writeFacet = (a: number, b: number, c: number) => {
    o += 12; // normal left as zero: readers recompute it
    for (const id of [a, b, c]) for (let n = 0; n < 3; n++) view.setFloat32((o += 4) - 4, vertices[id * 3 + n], true);
    o += 2;
  };
  for (let i = 0; i < u; i++) {
    const i1 = (i + 1) % u;
    for (let j = 0; j < v; j++) {
      const j1 = (j + 1) % v;
      const a = i * v + j,
        b = i1 * v + j,
        c = i1 * v + j1,
        d = i * v + j1;
      writeFacet(a, b, c);
      writeFacet(a, c, d);
    }
  }
  return bytes;
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

const pick = <T>(items: T[]): T => items[Math.floor(Math.random() * items.length)];
const WORDS = ['plate', 'rod', 'clamp', 'bracket', 'monitor', 'handle', 'cheese plate', '15 mm', 'arm', 'cradle'];

async function main() {
  const load = () =>
    loadavg()
      .map((l) => l.toFixed(1))
      .join(' ');
  console.log(
    `load bench: ${cpus().length} CPU(s) (load average ${load()} before the run: other work on the machine skews every figure), levels ${LEVELS.join(' and ')} members, ${SECONDS} s each, think time 0–${2 * THINK_MS} ms`,
  );
  const db = await scratchDb('bench');
  const server = await spawnServer(db.env, { LOOP_LAG_LOG_S: '0.25' }, 'bench').catch(async (err) => {
    await db.dispose();
    throw err;
  });
  try {
    const small = boxStl(40, 30, 6);
    const { ids, downloads } = await publishedParts(db.db, server.url, 8, small);
    const emails = await addMembers(db.db, `bench-${Date.now().toString(36)}`, Math.max(...LEVELS), PASSWORD);
    const members: Member[] = [];
    for (const email of emails) {
      const m = new Member(server.url);
      await m.signIn(email, PASSWORD);
      members.push(m);
    }
    let n = 0;
    // answers other than 2xx, by route, status and error code (the body's code, never its details)
    const failures = new Map<string, number>();
    const smallBlob = new Blob([new Uint8Array(small)]);

    async function one(m: Member): Promise<Sample> {
      const roll = Math.random();
      const started = performance.now();
      let route: Route;
      let res: Response;
      try {
        if (roll < 0.35) {
          route = 'search';
          res = await m.request('GET', `/api/search?q=${encodeURIComponent(pick(WORDS))}`);
        } else if (roll < 0.6) {
          route = 'part page';
          res = await m.request('GET', `/api/parts/${pick(ids)}`);
        } else if (roll < 0.75) {
          route = 'download';
          res = await m.request('GET', pick(downloads));
        } else if (roll < 0.85) {
          route = 'submit (STL)';
          const form = new FormData();
          form.append('data', JSON.stringify(loadSubmission(`Bench plate ${Date.now().toString(36)} ${(n += 1)}`)));
          form.append('model', smallBlob, 'plate.stl');
          res = await m.request('POST', '/api/parts', form);
        } else {
          route = 'rating';
          res = await m.request('POST', `/api/parts/${pick(ids)}/ratings`, { stars: 1 + Math.floor(Math.random() * 5) });
        }
        const text = await res.text();
        if (res.status >= 400) {
          const code = /"code":"([^"]+)"/.exec(text)?.[1] ?? 'no code';
          const key = `${route} ${res.status} ${code}`;
          failures.set(key, (failures.get(key) ?? 0) + 1);
        }
        return { route, ms: performance.now() - started, status: res.status };
      } catch {
        return { route: route!, ms: performance.now() - started, status: 0 };
      }
    }

    async function level(count: number, seconds: number) {
      const samples: Sample[] = [];
      const until = Date.now() + seconds * 1000;
      const lagFrom = Date.now();
      await Promise.all(
        members.slice(0, count).map(async (m) => {
          while (Date.now() < until) {
            samples.push(await one(m));
            await sleep(Math.random() * 2 * THINK_MS);
          }
        }),
      );
      return { samples, lag: lagBetween(lagFrom, Date.now()) };
    }

    function lagBetween(from: number, to: number) {
      const figures = server.lines
        .filter((l) => l.text.startsWith('rigshelf: loop-lag '))
        .map((l) => JSON.parse(l.text.slice('rigshelf: loop-lag '.length)) as { at: number; p50: number; p99: number; max: number })
        .filter((f) => f.at >= from && f.at <= to + 300);
      return {
        p99: figures.reduce((m, f) => Math.max(m, f.p99), 0),
        max: figures.reduce((m, f) => Math.max(m, f.max), 0),
        windows: figures.length,
      };
    }

    function report(count: number, seconds: number, samples: Sample[], lag: { p99: number; max: number }) {
      console.log(
        `\n${count} members, ${seconds} s: ${samples.length} requests, ${(samples.length / seconds).toFixed(1)} req/s; event-loop lag worst p99 ${lag.p99} ms, max ${lag.max} ms`,
      );
      console.log(
        `  ${'route'.padEnd(14)} ${'count'.padStart(6)} ${'req/s'.padStart(7)} ${'p50 ms'.padStart(8)} ${'p95 ms'.padStart(8)} ${'p99 ms'.padStart(8)}  answers`,
      );
      const routes: (Route | 'all')[] = ['search', 'part page', 'download', 'submit (STL)', 'rating', 'all'];
      for (const route of routes) {
        const rows = route === 'all' ? samples : samples.filter((s) => s.route === route);
        const sorted = rows.map((s) => s.ms).sort((a, b) => a - b);
        const statuses = new Map<number, number>();
        for (const s of rows) statuses.set(s.status, (statuses.get(s.status) ?? 0) + 1);
        const answers = [...statuses].map(([k, v]) => `${k === 0 ? 'none' : k}×${v}`).join(' ');
        console.log(
          `  ${route.padEnd(14)} ${String(rows.length).padStart(6)} ${(rows.length / seconds).toFixed(1).padStart(7)} ${percentile(sorted, 50).toFixed(0).padStart(8)} ${percentile(sorted, 95).toFixed(0).padStart(8)} ${percentile(sorted, 99).toFixed(0).padStart(8)}  ${answers}`,
        );
      }
    }

    await level(Math.min(5, members.length), 3); // warm-up: JIT, pools, search index
    const results: { count: number; p95: number }[] = [];
    for (const count of LEVELS) {
      const { samples, lag } = await level(count, SECONDS);
      report(count, SECONDS, samples, lag);
      results.push({
        count,
        p95: percentile(
          samples.map((s) => s.ms).sort((a, b) => a - b),
          95,
        ),
      });
    }

    // event-loop lag while big STL files are analysed, nothing else running
    const facets = Math.round((STL_MB * 1e6 - 84) / 50);
    const u = Math.round(Math.sqrt(facets / 2) * 2);
    const big = torusStl(u, Math.round(facets / 2 / u));
    const bigBlob = new Blob([big]);
    console.log(`\nevent-loop lag during ${(big.length / 1e6).toFixed(1)} MB STL uploads (${(big.length - 84) / 50} facets):`);
    const lagRows: { label: string; lag: ReturnType<typeof lagBetween>; healthMax: number; statuses: string }[] = [];
    for (const parallel of [1, 4]) {
      await sleep(1000);
      const from = Date.now();
      let stop = false;
      let healthMax = 0;
      const probe = (async () => {
        while (!stop) {
          const t = performance.now();
          try {
            await (await fetch(`${server.url}/api/health`, { signal: AbortSignal.timeout(60_000) })).arrayBuffer();
          } catch {
            // counted by its time
          }
          healthMax = Math.max(healthMax, performance.now() - t);
          await sleep(50);
        }
      })();
      const answers = await Promise.all(
        members.slice(0, parallel).map(async (m, i) => {
          const form = new FormData();
          form.append('data', JSON.stringify(loadSubmission(`Bench big torus ${Date.now().toString(36)} ${parallel}-${i}`)));
          form.append('model', bigBlob, 'torus.stl');
          const res = await m.request('POST', '/api/parts', form, 300_000);
          await res.arrayBuffer();
          return res.status;
        }),
      );
      stop = true;
      await probe;
      await sleep(600); // the last lag window
      const lag = lagBetween(from, Date.now());
      const statuses = answers.join(',');
      lagRows.push({ label: `${parallel} at once`, lag, healthMax, statuses });
      console.log(`  ${parallel} at once: lag p99 ${lag.p99} ms, max ${lag.max} ms; slowest /api/health ${healthMax.toFixed(0)} ms; answers ${statuses}`);
    }

    if (failures.size) {
      console.log('\nanswers other than 2xx (route, status, error code: count):');
      for (const [key, count] of [...failures].sort((a, b) => b[1] - a[1])) console.log(`  ${key}: ${count}`);
    }
    console.log(`\ntargets (load average now ${load()}):`);
    const at25 = results.find((r) => r.count === 25);
    if (at25) console.log(`  p95 at 25 members: ${at25.p95.toFixed(0)} ms (target ≤ 300 ms) ${at25.p95 <= 300 ? 'met' : 'NOT met'}`);
    const single = lagRows[0];
    console.log(
      `  event-loop lag while one ${STL_MB} MB STL is analysed: max ${single.lag.max} ms (target ≤ 50 ms) ${single.lag.max <= 50 ? 'met' : 'NOT met'}`,
    );
  } finally {
    server.child.kill('SIGTERM');
    await Promise.race([server.exited, sleep(20_000)]);
    await server.dispose();
    await db.dispose();
  }
}

await main();
process.exit(0);
