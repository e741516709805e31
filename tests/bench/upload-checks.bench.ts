/**
 * Upload checks off the event loop: how long the event loop stalls while a large STL is analysed
 * on the main thread (as uploads used to be) and through the upload-check worker pool.
 *
 *   npm run bench:uploads [-- --mb 40 --burst 20]
 *
 * A watertight torus is written as a binary STL of about --mb megabytes. The figures are the event
 * loop's delay as node:perf_hooks monitorEventLoopDelay sees it (timer resolution 5 ms), the wall
 * time, and the process RSS (main thread and worker threads together), sampled every 20 ms. The
 * first row measures an idle loop: on a shared, loaded machine that is the floor for the others.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay, performance } from 'node:perf_hooks';
import { analyseModelFile } from '../../shared/mesh/index';
import { CHECK_POOL, closeCheckPool } from '../../server/modules/files/inspect';
import { WorkerPool } from '../../server/modules/files/worker-pool';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const megabytes = arg('mb', 40);
const burst = arg('burst', 20);

function torusStl(facetsWanted: number): Uint8Array {
  const v = 400;
  const u = Math.max(3, Math.round(facetsWanted / (2 * v)));
  const point = (i: number, j: number) => {
    const theta = (2 * Math.PI * (i % u)) / u;
    const phi = (2 * Math.PI * (j % v)) / v;
    return [(60 + 20 * Math.cos(phi)) * Math.cos(theta), (60 + 20 * Math.cos(phi)) * Math.sin(theta), 20 * Math.sin(phi)];
  };
  const facets = 2 * u * v;
  const bytes = new Uint8Array(84 + 50 * facets);
  const view = new DataView(bytes.buffer);
  view.setUint32(80, facets, true);
  let o = 84;
  const facet = (...corners: number[][]) => {
    o += 12; // normal left as zero: readers recompute it
    for (const c of corners) for (const x of c) view.setFloat32((o += 4) - 4, x, true);
    o += 2;
  };
  for (let i = 0; i < u; i++) {
    for (let j = 0; j < v; j++) {
      const a = point(i, j),
        b = point(i + 1, j),
        c = point(i + 1, j + 1),
        d = point(i, j + 1);
      facet(a, b, c);
      facet(a, c, d);
    }
  }
  return bytes;
}

interface Figures {
  wallMs: number;
  lagP50Ms: number;
  lagP99Ms: number;
  lagMaxMs: number;
  peakRssMb: number;
}

async function measure(work: () => Promise<unknown>): Promise<Figures> {
  const lag = monitorEventLoopDelay({ resolution: 5 });
  let peak = process.memoryUsage().rss;
  const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 20);
  lag.enable();
  // the delay timer must be running before the work starts, or a stall at once goes unseen
  await new Promise((r) => setTimeout(r, 50));
  const start = performance.now();
  await work();
  const wallMs = performance.now() - start;
  // let the delay timer fire once more, so a stall that just ended is counted
  await new Promise((r) => setTimeout(r, 20));
  lag.disable();
  clearInterval(sampler);
  const ms = (ns: number) => Math.round(ns / 1e5) / 10;
  return {
    wallMs: Math.round(wallMs),
    lagP50Ms: ms(lag.percentile(50)),
    lagP99Ms: ms(lag.percentile(99)),
    lagMaxMs: ms(lag.max),
    peakRssMb: Math.round(peak / 1e6),
  };
}

const dir = mkdtempSync(join(tmpdir(), 'rigshelf-bench-uploads-'));
try {
  const path = join(dir, 'torus.stl');
  writeFileSync(path, torusStl(Math.floor((megabytes * 1e6 - 84) / 50)));
  const size = readFileSync(path).length;
  console.log(
    `binary STL of ${(size / 1e6).toFixed(1)} MB (${((size - 84) / 50).toLocaleString('en-US')} facets); check pool: ${CHECK_POOL.maxThreads} thread(s), queue ${CHECK_POOL.maxQueue}\n`,
  );

  const rows: [string, Figures][] = [];
  const pool = new WorkerPool(CHECK_POOL);
  // warm both paths once (module loading, thread start) so the figures are the analysis itself
  analyseModelFile(new Uint8Array(readFileSync(path)));
  await pool.run('analyseModel', { path, drawnInInches: false });

  rows.push(["nothing (the machine's own noise)", await measure(() => new Promise((r) => setTimeout(r, 2000)))]);
  rows.push([`1 file on the main thread (before)`, await measure(async () => analyseModelFile(new Uint8Array(readFileSync(path))))]);
  rows.push([`1 file through the pool`, await measure(() => pool.run('analyseModel', { path, drawnInInches: false }))]);
  rows.push([
    `${burst} files at once through the pool`,
    await measure(() => Promise.allSettled(Array.from({ length: burst }, () => pool.run('analyseModel', { path, drawnInInches: false })))),
  ]);
  await pool.close();
  await closeCheckPool();

  const header = ['run', 'wall ms', 'loop lag p50 ms', 'p99 ms', 'max ms', 'peak RSS MB'];
  console.log(header.join(' | '));
  for (const [name, f] of rows) console.log([name, f.wallMs, f.lagP50Ms, f.lagP99Ms, f.lagMaxMs, f.peakRssMb].join(' | '));
} finally {
  rmSync(dir, { recursive: true, force: true });
}
