/**
 * Make-to-size benchmark: the time of one preview (generate the part from its parameters, then the
 * shared/mesh analysis the preview shows) per generator, at the default and at the fine resolution,
 * plus the STL and 3MF files at default.
 *
 *   npm run bench:make                       (node_modules/.bin/tsx tests/bench/make.bench.ts [--runs 40])
 *
 * Each generator runs over a few typical parameter sets in turn (its defaults first). Wall time
 * depends on what else the machine runs: the load average is printed with the figures, and the
 * process's CPU time per preview beside them as the figure that load does not inflate.
 * Target: preview p95 ≤ 150 ms at the default resolution for every generator.
 */
import { cpus, loadavg } from 'node:os';
import { GENERATOR_KINDS, GENERATORS, to3mf, toStl, type GeneratorKind } from '../../shared/make/index';
import { analyseTriangles } from '../../shared/mesh/index';

const args = process.argv.slice(2);
const runs = args.includes('--runs') ? Number(args[args.indexOf('--runs') + 1]) : 40;

const CASES: Record<GeneratorKind, Record<string, unknown>[]> = {
  washer: [
    {},
    { screw: 'M6', outerDiameterMm: 20, thicknessMm: 5, recess: 'hex', recessDepthMm: 3 },
    { screw: '3/8-16', outerDiameterMm: 30, recess: 'counterbore', thicknessMm: 8, recessDepthMm: 4 },
  ],
  'gear-ring': [{}, { barrelDiameterMm: 80 }, { barrelDiameterMm: 82, fit: 'clamp' }, { module: 0.5, barrelDiameterMm: 95 }],
  'rod-clamp': [{}, { layout: 'single' }, { rodMm: 19, centresMm: 104, mount: '3/8-16' }],
  'cable-clip': [{}, { mount: 'screw' }, { cableMm: 5, secondCableMm: 9, mount: 'rod19' }],
  'shoe-foot': [{}, { mount: 'rod15' }, { mount: '3/8-16', baseSizeMm: 30 }],
  'fit-gauge': [{}, { mode: 'pegs' }, { nominalMm: 19, stepsBelow: 2, stepsAbove: 4 }],
};

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

function time(fn: () => unknown): { wall: number; cpu: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  fn();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { wall, cpu: (c.user + c.system) / 1000 };
}

function measure(kind: GeneratorKind, resolution: 'default' | 'fine', count: number) {
  const sets = CASES[kind].map((p) => ({ ...p, resolution }));
  const g = GENERATORS[kind];
  for (let i = 0; i < 3; i++) analyseTriangles(g.generate(sets[i % sets.length]).mesh.positions);
  const walls: number[] = [];
  const cpus: number[] = [];
  let triangles = 0;
  for (let i = 0; i < count; i++) {
    const params = sets[i % sets.length];
    const t = time(() => {
      const part = g.generate(params);
      triangles = Math.max(triangles, part.mesh.triangles);
      analyseTriangles(part.mesh.positions);
    });
    walls.push(t.wall);
    cpus.push(t.cpu);
  }
  walls.sort((a, b) => a - b);
  cpus.sort((a, b) => a - b);
  return { p50: percentile(walls, 50), p95: percentile(walls, 95), cpu50: percentile(cpus, 50), triangles };
}

function fileTimes(kind: GeneratorKind) {
  const part = GENERATORS[kind].generate(GENERATORS[kind].defaults);
  const stl: number[] = [];
  const mf: number[] = [];
  for (let i = 0; i < 5; i++) {
    stl.push(time(() => toStl(part.mesh)).wall);
    mf.push(time(() => to3mf(part.mesh)).wall);
  }
  stl.sort((a, b) => a - b);
  mf.sort((a, b) => a - b);
  return { stl: percentile(stl, 50), mf: percentile(mf, 50) };
}

const ms = (n: number) => n.toFixed(1).padStart(7);
console.log(
  `make-to-size preview (generate + analysis), ${runs} runs per row; node ${process.version}, ${cpus().length} cores, load average ${loadavg()
    .map((l) => l.toFixed(2))
    .join(' ')}`,
);
console.log('generator      resolution    p50 ms    p95 ms  cpu p50   max facets   STL ms   3MF ms');
const misses: string[] = [];
for (const kind of GENERATOR_KINDS) {
  for (const resolution of ['default', 'fine'] as const) {
    const r = measure(kind, resolution, resolution === 'default' ? runs : Math.max(10, Math.round(runs / 2)));
    const files = resolution === 'default' ? fileTimes(kind) : null;
    console.log(
      `${kind.padEnd(14)} ${resolution.padEnd(10)} ${ms(r.p50)}   ${ms(r.p95)}  ${ms(r.cpu50)}   ${String(r.triangles).padStart(10)}  ${files ? ms(files.stl) : '      -'}  ${files ? ms(files.mf) : '      -'}`,
    );
    if (resolution === 'default' && r.p95 > 150) misses.push(`${kind} (p95 ${r.p95.toFixed(0)} ms)`);
  }
}
console.log(
  `load average after: ${loadavg()
    .map((l) => l.toFixed(2))
    .join(' ')}`,
);
console.log(
  misses.length === 0 ? 'target met: every preview p95 ≤ 150 ms at default resolution' : `over the 150 ms p95 target at default: ${misses.join(', ')}`,
);
