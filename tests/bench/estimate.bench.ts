/**
 * Estimate benchmark: slicing a 1,000,000-facet model 100 mm tall at 0.2 mm layers, in the worker
 * thread the server uses (server/modules/planning/slice-queue.ts), so the timing includes reading
 * the file and handing the layers back.
 *
 *   node_modules/.bin/tsx tests/bench/estimate.bench.ts [--facets 1000000] [--runs 3]
 *
 * The model is a fluted column (tests/bench/column-mesh.ts) written as binary STL. While the worker
 * slices, the main thread's event loop is sampled: its largest delay shows slicing stays off it.
 * Wall time depends on what else the machine runs; the process's CPU time (user + system, nearly
 * all of it the worker's) is printed beside it as the load-independent figure.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { estimateFromSlices } from '../../shared/estimate';
import { SliceQueue } from '../../server/modules/planning/slice-queue';
import { flutedColumn } from './column-mesh';

function binaryStl(positions: Float32Array): Uint8Array {
  const facets = positions.length / 9;
  const bytes = new Uint8Array(84 + 50 * facets);
  const view = new DataView(bytes.buffer);
  view.setUint32(80, facets, true);
  for (let f = 0; f < facets; f++) for (let k = 0; k < 9; k++) view.setFloat32(84 + 50 * f + 12 + 4 * k, positions[f * 9 + k], true);
  return bytes;
}

const args = process.argv.slice(2);
const flag = (name: string, fallback: number) => (args.includes(name) ? Number(args[args.indexOf(name) + 1]) : fallback);
const targetFacets = flag('--facets', 1_000_000);
const runs = flag('--runs', 4);

const rows = 500;
const around = Math.round((targetFacets - 2 * Math.round(targetFacets / (2 * rows + 2))) / (2 * rows));
const positions = flutedColumn(around, rows);
const dir = mkdtempSync(join(tmpdir(), 'estimate-bench-'));
const file = join(dir, 'column.stl');
writeFileSync(file, binaryStl(positions));
console.log(`Fluted column: ${(positions.length / 9).toLocaleString('en-US')} facets, 100 mm tall, sliced at 0.2 mm; Node ${process.version}.`);

const settings = { material: 'PLA' as const, nozzleMm: 0.4, layerMm: 0.2, walls: 2, topBottomLayers: 4, infillPct: 20, speedMmS: 50 };
const times: number[] = [];
const delays: number[] = [];
const cpuTimes: number[] = [];
try {
  // One queue, as in the server: the first run starts the worker (and compiles it), later runs find it warm.
  const queue = new SliceQueue();
  for (let run = 0; run < runs; run++) {
    const loop = monitorEventLoopDelay({ resolution: 10 });
    loop.enable();
    // The queue's worker does not keep the process alive on its own (unref), as in the server.
    const keepAlive = setInterval(() => {}, 1000);
    const cpuBefore = process.cpuUsage();
    const start = performance.now();
    const profile = await queue.slice({ path: file, stlUnitScale: 1, settings: { layerMm: 0.2, walls: 2, lineWidthMm: 0.45, skinLayers: 4 } }, `run ${run}`);
    const estimate = estimateFromSlices(profile, settings);
    const elapsed = performance.now() - start;
    const cpu = process.cpuUsage(cpuBefore);
    cpuTimes.push((cpu.user + cpu.system) / 1000);
    loop.disable();
    clearInterval(keepAlive);
    times.push(elapsed);
    delays.push(loop.max / 1e6);
    console.log(
      `run ${run + 1}${run === 0 ? ' (starts the worker)' : ''}: ${(elapsed / 1000).toFixed(2)} s wall, ${(cpuTimes[run] / 1000).toFixed(2)} s CPU (read, slice, measure, estimate); ${profile.layers.length} layers; ` +
        `${estimate.massG.toFixed(1)} g, ${estimate.timeMin.toFixed(0)} min; main-thread event loop at most ${(loop.max / 1e6).toFixed(0)} ms late`,
    );
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const warm = (xs: number[]) => (xs.length > 1 ? xs.slice(1) : xs);
  console.log(
    `Warm worker: median ${(median(warm(times)) / 1000).toFixed(2)} s wall, ${(median(warm(cpuTimes)) / 1000).toFixed(2)} s CPU over ${warm(times).length} runs (target ≤ 3 s); ` +
      `first run with the worker's start ${(times[0] / 1000).toFixed(2)} s wall; largest event-loop delay ${Math.max(...delays).toFixed(0)} ms; load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores.`,
  );
  await queue.close();
} finally {
  rmSync(dir, { recursive: true, force: true });
}
