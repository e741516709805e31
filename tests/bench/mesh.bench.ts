/**
 * Mesh analysis benchmark: our analyseModelFile against three.js's STLLoader followed by a
 * straightforward analysis of its geometry (string-keyed Maps for welding and edges).
 *
 *   node_modules/.bin/tsx tests/bench/mesh.bench.ts [--facets 1000000]
 *
 * The parent generates a watertight torus as binary STL, writes it to a temporary file, and runs
 * each contender in its own child process (node --expose-gc) so one cannot inflate the other's
 * memory. A worker thread samples the process RSS every 2 ms during each run, which catches the
 * peak even though the run itself is synchronous.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { STLLoader } from 'three/examples/jsm/loaders/STLLoader.js';
import { analyseModelFile } from '../../shared/mesh/index';

const MB = 1e6;
const REFERENCE_BUDGET_MS = 40_000;
const CHILD_TIMEOUT_MS = 100_000;

type Contender = 'ours' | 'three-reference' | 'three-parse';

interface Figures {
  facets: number;
  volumeMm3: number;
  areaMm2: number;
  sizeMm: number[];
  watertight: boolean;
  shells: number;
}

interface ChildReport {
  contender: Contender;
  timesMs: number[];
  peakRssMb: number[];
  retainedHeapAndBuffersMb: number[];
  figures: Figures | null;
  unfinished?: string;
}

// ---------------------------------------------------------------------------
// Test mesh: a torus of u × v quads, 2·u·v facets, every edge shared by two facets.

function torusStl(u: number, v: number, majorRadius = 60, minorRadius = 20): Uint8Array {
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
  bytes.set(new TextEncoder().encode('solid torus benchmark (binary, despite the first word)'));
  view.setUint32(80, facets, true);
  let o = 84;
  const writeFacet = (a: number, b: number, c: number) => {
    const p = [a, b, c].map((id) => [vertices[id * 3], vertices[id * 3 + 1], vertices[id * 3 + 2]]);
    const e1 = [0, 1, 2].map((n) => p[1][n] - p[0][n]);
    const e2 = [0, 1, 2].map((n) => p[2][n] - p[0][n]);
    const normal = [e1[1] * e2[2] - e1[2] * e2[1], e1[2] * e2[0] - e1[0] * e2[2], e1[0] * e2[1] - e1[1] * e2[0]];
    const length = Math.hypot(...normal) || 1;
    for (const n of normal) view.setFloat32((o += 4) - 4, n / length, true);
    for (const corner of p) for (const x of corner) view.setFloat32((o += 4) - 4, x, true);
    o += 2;
  };
  for (let i = 0; i < u; i++) {
    const i1 = (i + 1) % u;
    for (let j = 0; j < v; j++) {
      const j1 = (j + 1) % v;
      const a = i * v + j, b = i1 * v + j, c = i1 * v + j1, d = i * v + j1;
      writeFacet(a, b, c);
      writeFacet(a, c, d);
    }
  }
  return bytes;
}

// ---------------------------------------------------------------------------
// The reference analysis of three.js geometry

class OverBudget extends Error {}

function referenceAnalysis(positions: ArrayLike<number>, deadline: number): Figures {
  const checkClock = (i: number, phase: string, total: number) => {
    if ((i & 0xffff) === 0 && performance.now() > deadline) {
      throw new OverBudget(`${phase} at ${((100 * i) / total).toFixed(0)}%`);
    }
  };
  const facets = positions.length / 9;
  const min = [Infinity, Infinity, Infinity];
  const max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i++) {
    const axis = i % 3;
    if (positions[i] < min[axis]) min[axis] = positions[i];
    if (positions[i] > max[axis]) max[axis] = positions[i];
  }
  let area = 0;
  let volume = 0;
  for (let i = 0; i < positions.length; i += 9) {
    const ax = positions[i], ay = positions[i + 1], az = positions[i + 2];
    const bx = positions[i + 3], by = positions[i + 4], bz = positions[i + 5];
    const cx = positions[i + 6], cy = positions[i + 7], cz = positions[i + 8];
    const ux = bx - ax, uy = by - ay, uz = bz - az, vx = cx - ax, vy = cy - ay, vz = cz - az;
    area += Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx) / 2;
    volume += (ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx)) / 6;
  }

  const vertexIds = new Map<string, number>();
  const ids = new Int32Array(facets * 3);
  for (let n = 0; n < facets * 3; n++) {
    checkClock(n, 'welding', facets * 3);
    const key = `${positions[n * 3]},${positions[n * 3 + 1]},${positions[n * 3 + 2]}`;
    let id = vertexIds.get(key);
    if (id === undefined) vertexIds.set(key, (id = vertexIds.size));
    ids[n] = id;
  }

  const edgeUse = new Map<string, number>();
  for (let f = 0; f < facets; f++) {
    checkClock(f, 'edges', facets);
    for (let corner = 0; corner < 3; corner++) {
      const a = ids[f * 3 + corner];
      const b = ids[f * 3 + ((corner + 1) % 3)];
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      edgeUse.set(key, (edgeUse.get(key) ?? 0) + 1);
    }
  }
  const watertight = [...edgeUse.values()].every((uses) => uses === 2);

  const parent = Array.from({ length: vertexIds.size }, (_, i) => i);
  const find = (x: number): number => {
    while (parent[x] !== x) x = parent[x] = parent[parent[x]];
    return x;
  };
  for (let f = 0; f < facets; f++) {
    parent[find(ids[f * 3 + 1])] = find(ids[f * 3]);
    parent[find(ids[f * 3 + 2])] = find(ids[f * 3]);
  }
  const shells = new Set(parent.map((_, i) => find(i))).size;
  return { facets, volumeMm3: Math.abs(volume), areaMm2: area, sizeMm: [0, 1, 2].map((n) => max[n] - min[n]), watertight, shells };
}

// ---------------------------------------------------------------------------
// Child process: runs one contender and reports JSON on stdout.

function run(contender: Contender, bytes: Uint8Array, buffer: ArrayBuffer, deadline: number): Figures | null {
  if (contender === 'ours') {
    const r = analyseModelFile(bytes);
    return { facets: r.facets, volumeMm3: r.volumeMm3, areaMm2: r.areaMm2, sizeMm: r.sizeMm, watertight: r.watertight, shells: r.shells };
  }
  const geometry = new STLLoader().parse(buffer);
  if (contender === 'three-parse') return null;
  return referenceAnalysis(geometry.getAttribute('position').array, deadline);
}

function exactBuffer(bytes: Uint8Array): ArrayBuffer {
  const { buffer, byteOffset, byteLength } = bytes;
  return byteOffset === 0 && byteLength === buffer.byteLength ? (buffer as ArrayBuffer) : (buffer.slice(byteOffset, byteOffset + byteLength) as ArrayBuffer);
}

function startRssSampler() {
  const worker = new Worker(
    `const { parentPort } = require('node:worker_threads');
     let peak = 0;
     setInterval(() => { const rss = process.memoryUsage.rss(); if (rss > peak) peak = rss; }, 2);
     parentPort.on('message', (m) => { if (m === 'reset') peak = process.memoryUsage.rss(); parentPort.postMessage(peak); });`,
    { eval: true },
  );
  const ask = (message: 'reset' | 'read') =>
    new Promise<number>((resolve) => {
      worker.once('message', resolve);
      worker.postMessage(message);
    });
  return { reset: () => ask('reset'), read: () => ask('read'), stop: () => worker.terminate() };
}

async function child(contender: Contender, file: string, warmupFile: string, reps: number): Promise<void> {
  const gc = (globalThis as { gc?: () => void }).gc ?? (() => {});
  const warm = new Uint8Array(readFileSync(warmupFile));
  for (let i = 0; i < 3; i++) run(contender, warm, exactBuffer(warm), Infinity);
  const bytes = new Uint8Array(readFileSync(file));
  const buffer = exactBuffer(bytes);
  const sampler = startRssSampler();
  const report: ChildReport = { contender, timesMs: [], peakRssMb: [], retainedHeapAndBuffersMb: [], figures: null };
  for (let rep = 0; rep < reps; rep++) {
    gc();
    const before = process.memoryUsage();
    await sampler.reset();
    const start = performance.now();
    let figures: Figures | null = null;
    try {
      figures = run(contender, bytes, buffer, start + REFERENCE_BUDGET_MS);
    } catch (error) {
      if (!(error instanceof OverBudget)) throw error;
      report.unfinished = `over the ${REFERENCE_BUDGET_MS / 1000} s budget, stopped in ${error.message}`;
    }
    const elapsed = performance.now() - start;
    const after = process.memoryUsage();
    const peak = Math.max(await sampler.read(), after.rss);
    report.timesMs.push(elapsed);
    report.peakRssMb.push((peak - before.rss) / MB);
    report.retainedHeapAndBuffersMb.push((after.heapUsed + after.arrayBuffers - before.heapUsed - before.arrayBuffers) / MB);
    report.figures = figures;
    if (report.unfinished) break;
  }
  await sampler.stop();
  process.stdout.write(`${JSON.stringify(report)}\n`);
}

// ---------------------------------------------------------------------------
// Parent: generate, spawn, tabulate.

function spawnChild(contender: Contender, file: string, warmupFile: string, reps: number): ChildReport {
  const self = fileURLToPath(import.meta.url);
  const result = spawnSync(process.execPath, ['--expose-gc', '--import', 'tsx', self, '--child', contender, file, warmupFile, String(reps)], {
    encoding: 'utf8',
    timeout: CHILD_TIMEOUT_MS,
    maxBuffer: 16 * 1024 * 1024,
  });
  if (result.status !== 0) {
    throw new Error(`${contender} child failed (status ${result.status}, signal ${result.signal}):\n${result.stderr}`);
  }
  return JSON.parse(result.stdout.trim().split('\n').pop()!) as ChildReport;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function agree(a: Figures, b: Figures): boolean {
  const close = (x: number, y: number) => Math.abs(x - y) <= 1e-6 * Math.max(1, Math.abs(y));
  return (
    a.facets === b.facets &&
    a.watertight === b.watertight &&
    a.shells === b.shells &&
    close(a.volumeMm3, b.volumeMm3) &&
    close(a.areaMm2, b.areaMm2) &&
    a.sizeMm.every((s, i) => close(s, b.sizeMm[i]))
  );
}

async function parent(targetFacets: number): Promise<void> {
  const v = Math.round(Math.sqrt(targetFacets / 4));
  const u = Math.round(targetFacets / (2 * v));
  const started = performance.now();
  const stl = torusStl(u, v);
  const dir = mkdtempSync(join(tmpdir(), 'mesh-bench-'));
  const file = join(dir, 'torus.stl');
  const warmupFile = join(dir, 'warmup.stl');
  writeFileSync(file, stl);
  writeFileSync(warmupFile, torusStl(100, 50));
  const sizeMb = stl.length / MB;
  console.log(`Torus ${u} × ${v}: ${(2 * u * v).toLocaleString('en-US')} facets, ${sizeMb.toFixed(1)} MB binary STL (generated in ${((performance.now() - started) / 1000).toFixed(1)} s)`);
  console.log(`Node ${process.version}; each contender in its own process; MB = 10^6 bytes; peak = RSS high-water above the pre-run RSS.\n`);

  try {
    const reports = [
      spawnChild('ours', file, warmupFile, 7),
      spawnChild('three-parse', file, warmupFile, 5),
      spawnChild('three-reference', file, warmupFile, 2),
    ];
    const ours = reports[0];
    const oursRate = sizeMb / (median(ours.timesMs) / 1000);
    const labels: Record<Contender, string> = {
      ours: 'analyseModelFile (ours)',
      'three-parse': 'three STLLoader.parse only (no figures)',
      'three-reference': 'three STLLoader + reference figures',
    };
    const rows = reports.map((r) => {
      const rate = sizeMb / (median(r.timesMs) / 1000);
      return {
        contender: labels[r.contender],
        'median ms': median(r.timesMs).toFixed(0),
        'MB/s': rate.toFixed(1),
        'peak MB': Math.max(...r.peakRssMb).toFixed(0),
        'peak / file': (Math.max(...r.peakRssMb) / sizeMb).toFixed(2),
        'ours ÷ this (speed)': (oursRate / rate).toFixed(2),
        runs: r.timesMs.length,
        note: r.unfinished ?? '',
      };
    });
    console.table(rows);
    for (const r of reports) console.log(`${labels[r.contender]}: runs ${r.timesMs.map((t) => t.toFixed(0)).join(', ')} ms`);
    const reference = reports[2];
    if (ours.figures && reference.figures) {
      console.log(`Figures agree with the reference: ${agree(ours.figures, reference.figures) ? 'yes' : 'NO'}`);
    }
    if (ours.figures) {
      // Continuous torus volume 2π²Rr² (analytic formula); the faceted one is slightly smaller.
      const analytic = 2 * Math.PI ** 2 * 60 * 20 ** 2;
      console.log(`Ours: ${JSON.stringify(ours.figures)}; 2π²Rr² = ${analytic.toFixed(1)} mm³`);
    }
    const target = reports[2].unfinished ? 'reference unfinished, ratio is a lower bound' : '';
    console.log(`Speed ratio vs three + reference: ${(oursRate / (sizeMb / (median(reference.timesMs) / 1000))).toFixed(2)}× (target ≥ 2×) ${target}`);
    console.log(`Total ${((performance.now() - started) / 1000).toFixed(1)} s`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const args = process.argv.slice(2);
if (args[0] === '--child') {
  await child(args[1] as Contender, args[2], args[3], Number(args[4]));
} else {
  const facetsFlag = args.indexOf('--facets');
  await parent(facetsFlag >= 0 ? Number(args[facetsFlag + 1]) : 1_000_000);
}
