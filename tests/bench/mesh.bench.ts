/**
 * Mesh analysis benchmark on a 1,000,000-facet watertight torus (binary STL, 50 MB):
 *
 *   node_modules/.bin/tsx tests/bench/mesh.bench.ts [--facets 1000000]
 *
 * Rows, each in its own child process (node --expose-gc) so one cannot inflate another's memory:
 * - sequential read: every float of every facet read and summed, nothing else; no analysis can beat it;
 * - analyseModelFile (ours) on the bytes in memory, and the same on the facets in shuffled order
 *   (vertex welding loses its cache locality);
 * - the server's path: analyseModelPath(file) as inspect.ts calls it, reading from disk (peak
 *   includes the file), beside the path it replaced (readFile, then a copy into a new Uint8Array);
 * - two anchors: three's STLLoader feeding our own analyseTriangles (the honest one), and three's
 *   STLLoader feeding a deliberately straightforward analysis with string-keyed Maps;
 * - a 3MF of the same 1,000,000 triangles (XML in a ZIP), read by analyseModelFile.
 * A worker thread samples the process RSS every 2 ms during each run, which catches the peak even
 * though the run itself is synchronous.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { readFile } from 'node:fs/promises';
import { zipSync } from 'fflate';
import { STLLoader } from 'three/examples/jsm/loaders/STLLoader.js';
import { analyseModelPath } from '../../server/modules/files/analyse-model';
import { analyseModelFile, analyseTriangles } from '../../shared/mesh/index';

const MB = 1e6;
const REFERENCE_BUDGET_MS = 40_000;
const CHILD_TIMEOUT_MS = 100_000;

type Contender =
  'sequential-read' | 'ours' | 'ours-shuffled' | 'server-path' | 'server-path-before' | 'three-ours' | 'three-reference' | 'three-parse' | 'ours-3mf';

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

function torusStl(u: number, v: number, shuffled = false, majorRadius = 60, minorRadius = 20): Uint8Array {
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
  for (const [a, b, c] of torusTriangles(u, v, shuffled)) writeFacet(a, b, c);
  return bytes;
}

/** Vertex ids of the torus's triangles, in grid order or shuffled (a fixed-seed Fisher–Yates). */
function torusTriangles(u: number, v: number, shuffled = false): Uint32Array[] {
  const triangles: Uint32Array[] = [];
  for (let i = 0; i < u; i++) {
    const i1 = (i + 1) % u;
    for (let j = 0; j < v; j++) {
      const j1 = (j + 1) % v;
      const a = i * v + j,
        b = i1 * v + j,
        c = i1 * v + j1,
        d = i * v + j1;
      triangles.push(Uint32Array.of(a, b, c), Uint32Array.of(a, c, d));
    }
  }
  if (shuffled) {
    let seed = 12345;
    const random = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32;
    for (let n = triangles.length - 1; n > 0; n--) {
      const m = Math.floor(random() * (n + 1));
      [triangles[n], triangles[m]] = [triangles[m], triangles[n]];
    }
  }
  return triangles;
}

/** The same torus as a 3MF package (3MF Core Specification: OPC ZIP, model XML with vertices and triangles). */
function torus3mf(u: number, v: number, majorRadius = 60, minorRadius = 20): Uint8Array {
  const parts: string[] = [
    '<?xml version="1.0" encoding="UTF-8"?>\n<model unit="millimeter" xmlns="http://schemas.microsoft.com/3dmanufacturing/core/2015/02"><resources><object id="1" type="model"><mesh><vertices>',
  ];
  for (let i = 0; i < u; i++) {
    const theta = (2 * Math.PI * i) / u;
    for (let j = 0; j < v; j++) {
      const phi = (2 * Math.PI * j) / v;
      const x = Math.fround((majorRadius + minorRadius * Math.cos(phi)) * Math.cos(theta));
      const y = Math.fround((majorRadius + minorRadius * Math.cos(phi)) * Math.sin(theta));
      const z = Math.fround(minorRadius * Math.sin(phi));
      parts.push(`<vertex x="${x}" y="${y}" z="${z}"/>`);
    }
  }
  parts.push('</vertices><triangles>');
  for (const [a, b, c] of torusTriangles(u, v)) parts.push(`<triangle v1="${a}" v2="${b}" v3="${c}"/>`);
  parts.push('</triangles></mesh></object></resources><build><item objectid="1"/></build></model>');
  const encode = (text: string) => new TextEncoder().encode(text);
  return zipSync({
    '[Content_Types].xml': encode(
      '<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/></Types>',
    ),
    '_rels/.rels': encode(
      '<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Target="/3D/3dmodel.model" Id="rel0" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/></Relationships>',
    ),
    '3D/3dmodel.model': encode(parts.join('')),
  });
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
    const ax = positions[i],
      ay = positions[i + 1],
      az = positions[i + 2];
    const bx = positions[i + 3],
      by = positions[i + 4],
      bz = positions[i + 5];
    const cx = positions[i + 6],
      cy = positions[i + 7],
      cz = positions[i + 8];
    const ux = bx - ax,
      uy = by - ay,
      uz = bz - az,
      vx = cx - ax,
      vy = cy - ay,
      vz = cz - az;
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

async function run(contender: Contender, bytes: Uint8Array, buffer: ArrayBuffer, file: string, deadline: number): Promise<Figures | null> {
  const figures = (r: ReturnType<typeof analyseTriangles>): Figures => ({
    facets: r.facets,
    volumeMm3: r.volumeMm3,
    areaMm2: r.areaMm2,
    sizeMm: r.sizeMm,
    watertight: r.watertight,
    shells: r.shells,
  });
  switch (contender) {
    case 'sequential-read':
      return sequentialRead(bytes);
    case 'ours':
    case 'ours-shuffled':
    case 'ours-3mf':
      return figures(analyseModelFile(bytes));
    case 'server-path':
      return figures(await analyseModelPath(file));
    case 'server-path-before':
      return figures(analyseModelFile(new Uint8Array(await readFile(file))));
    default:
  }
  const geometry = new STLLoader().parse(buffer);
  if (contender === 'three-parse') return null;
  const positions = geometry.getAttribute('position').array as Float32Array;
  if (contender === 'three-ours') return figures(analyseTriangles(positions));
  return referenceAnalysis(positions, deadline);
}

/** Reads every coordinate once, as any analysis must, and does nothing else with it. */
function sequentialRead(bytes: Uint8Array): null {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const facets = view.getUint32(80, true);
  let sum = 0;
  for (let f = 0, o = 96; f < facets; f++, o += 50) {
    for (let k = 0; k < 36; k += 4) sum += view.getFloat32(o + k, true);
  }
  if (Number.isNaN(sum)) throw new Error('not a number');
  return null;
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
  for (let i = 0; i < 3; i++) await run(contender, warm, exactBuffer(warm), warmupFile, Infinity);
  // The server's paths read the file themselves, so their peak includes it.
  const fromDisk = contender === 'server-path' || contender === 'server-path-before';
  const bytes = fromDisk ? new Uint8Array(0) : new Uint8Array(readFileSync(file));
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
      figures = await run(contender, bytes, buffer, file, start + REFERENCE_BUDGET_MS);
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
  const dir = mkdtempSync(join(tmpdir(), 'mesh-bench-'));
  const files = {
    stl: join(dir, 'torus.stl'),
    shuffled: join(dir, 'shuffled.stl'),
    threeMf: join(dir, 'torus.3mf'),
    warmStl: join(dir, 'warmup.stl'),
    warmShuffled: join(dir, 'warmup-shuffled.stl'),
    warm3mf: join(dir, 'warmup.3mf'),
  };
  const stl = torusStl(u, v);
  writeFileSync(files.stl, stl);
  writeFileSync(files.shuffled, torusStl(u, v, true));
  const threeMf = torus3mf(u, v);
  writeFileSync(files.threeMf, threeMf);
  writeFileSync(files.warmStl, torusStl(100, 50));
  writeFileSync(files.warmShuffled, torusStl(100, 50, true));
  writeFileSync(files.warm3mf, torus3mf(100, 50));
  const sizeMb = stl.length / MB;
  console.log(
    `Torus ${u} × ${v}: ${(2 * u * v).toLocaleString('en-US')} facets, ${sizeMb.toFixed(1)} MB binary STL, ${(threeMf.length / MB).toFixed(1)} MB 3MF (generated in ${((performance.now() - started) / 1000).toFixed(1)} s)`,
  );
  console.log(
    `Node ${process.version}; each row in its own process; MB = 10^6 bytes; peak = RSS high-water above the pre-run RSS; MB/s over the row's own file.\n`,
  );

  const plan: [Contender, string, string, number][] = [
    ['sequential-read', files.stl, files.warmStl, 7],
    ['ours', files.stl, files.warmStl, 7],
    ['ours-shuffled', files.shuffled, files.warmShuffled, 5],
    ['server-path', files.stl, files.warmStl, 5],
    ['server-path-before', files.stl, files.warmStl, 5],
    ['three-parse', files.stl, files.warmStl, 5],
    ['three-ours', files.stl, files.warmStl, 5],
    ['three-reference', files.stl, files.warmStl, 2],
    ['ours-3mf', files.threeMf, files.warm3mf, 3],
  ];
  const labels: Record<Contender, string> = {
    'sequential-read': 'sequential read of every float (the limit)',
    ours: 'analyseModelFile (ours), bytes in memory',
    'ours-shuffled': 'ours, facets in shuffled order',
    'server-path': 'server path: analyseModelPath(file)',
    'server-path-before': 'server path before: copy of readFile + ours',
    'three-parse': 'three STLLoader.parse only (no figures)',
    'three-ours': 'anchor: three STLLoader + our analyseTriangles',
    'three-reference': 'anchor: three STLLoader + string-keyed figures',
    'ours-3mf': 'ours on the 3MF of the same triangles',
  };

  try {
    const reports = plan.map(([contender, file, warm, reps]) => ({
      ...spawnChild(contender, file, warm, reps),
      fileMb: (contender === 'ours-3mf' ? threeMf.length : stl.length) / MB,
    }));
    const byName = Object.fromEntries(reports.map((r) => [r.contender, r])) as Record<Contender, (typeof reports)[number]>;
    const oursMs = median(byName.ours.timesMs);
    const rows = reports.map((r) => {
      const ms = median(r.timesMs);
      return {
        row: labels[r.contender],
        'median ms': ms.toFixed(0),
        'MB/s': (r.fileMb / (ms / 1000)).toFixed(1),
        'peak MB': Math.max(...r.peakRssMb).toFixed(0),
        'peak / file': (Math.max(...r.peakRssMb) / r.fileMb).toFixed(2),
        'time ÷ ours': (ms / oursMs).toFixed(2),
        runs: r.timesMs.length,
        note: r.unfinished ?? '',
      };
    });
    console.table(rows);
    for (const r of reports) console.log(`${labels[r.contender]}: runs ${r.timesMs.map((t) => t.toFixed(0)).join(', ')} ms`);
    const ours = byName.ours;
    const reference = byName['three-reference'];
    if (ours.figures && reference.figures) {
      console.log(`Figures agree with the string-keyed reference: ${agree(ours.figures, reference.figures) ? 'yes' : 'NO'}`);
    }
    for (const other of ['three-ours', 'ours-shuffled', 'server-path', 'ours-3mf'] as const) {
      const f = byName[other].figures;
      if (ours.figures && f) console.log(`Figures agree, ${labels[other]}: ${agree(ours.figures, f) ? 'yes' : 'NO'}`);
    }
    if (ours.figures) {
      // Continuous torus volume 2π²Rr² (analytic formula); the faceted one is slightly smaller.
      const analytic = 2 * Math.PI ** 2 * 60 * 20 ** 2;
      console.log(`Ours: ${JSON.stringify(ours.figures)}; 2π²Rr² = ${analytic.toFixed(1)} mm³`);
    }
    const speedup = (c: Contender) => (median(byName[c].timesMs) / oursMs).toFixed(2);
    const lowerBound = reference.unfinished ? ' (reference unfinished: a lower bound)' : '';
    console.log(
      `Anchors, as multiples of our time: three + our analysis ${speedup('three-ours')}×, three + string-keyed figures ${speedup('three-reference')}×${lowerBound}.`,
    );
    console.log(
      `Sequential read is ${((median(byName['sequential-read'].timesMs) / oursMs) * 100).toFixed(0)} % of our time; shuffled order takes ${speedup('ours-shuffled')}× ours.`,
    );
    console.log(
      `Server path peak: ${(Math.max(...byName['server-path'].peakRssMb) / sizeMb).toFixed(2)}× the file (target ≤ 1.5×), before: ${(Math.max(...byName['server-path-before'].peakRssMb) / sizeMb).toFixed(2)}×.`,
    );
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
