import { describe, expect, it } from 'vitest';
import { estimateFromSlices, type PrintSettings } from '@shared/estimate';
import { sliceLoops, sliceProfile } from '@shared/slice';

// Meshes with known layer outlines are built here facet by facet; every expected figure is the hand
// computation written beside it. Line width 0.45 mm (0.4 mm nozzle × 1.125, common practice),
// 2 walls: the inset is d = 0.9 mm. Layers 0.2 mm, 4 solid layers at the top and bottom.

type XY = readonly [number, number];

/** A closed prism of a polygon (counter-clockwise, convex) between z0 and z1, wound outward; caps as fans. */
function prism(outline: XY[], z0: number, z1: number): number[] {
  const out: number[] = [];
  const n = outline.length;
  for (let i = 0; i < n; i++) {
    const [ax, ay] = outline[i],
      [bx, by] = outline[(i + 1) % n];
    out.push(ax, ay, z0, bx, by, z0, bx, by, z1, ax, ay, z0, bx, by, z1, ax, ay, z1);
  }
  for (let i = 1; i < n - 1; i++) {
    const [ax, ay] = outline[0],
      [bx, by] = outline[i],
      [cx, cy] = outline[i + 1];
    out.push(ax, ay, z1, bx, by, z1, cx, cy, z1); // top, facing +z
    out.push(ax, ay, z0, cx, cy, z0, bx, by, z0); // bottom, facing −z
  }
  return out;
}

const rect = (x0: number, y0: number, x1: number, y1: number): XY[] => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
];
const ngon = (n: number, r: number): XY[] =>
  Array.from({ length: n }, (_, i) => [r * Math.cos((2 * Math.PI * i) / n), r * Math.sin((2 * Math.PI * i) / n)] as const);

/** Ring of N segments between radii R and r, height h, wound outward. */
function ring(R: number, r: number, h: number, N: number): number[] {
  const at = (radius: number, i: number, z: number) => [radius * Math.cos((2 * Math.PI * i) / N), radius * Math.sin((2 * Math.PI * i) / N), z];
  const quad = (p: number[], q: number[], s: number[], t: number[]) => [...p, ...q, ...s, ...p, ...s, ...t];
  const out: number[] = [];
  for (let i = 0; i < N; i++) {
    const j = i + 1;
    out.push(...quad(at(R, i, 0), at(R, j, 0), at(R, j, h), at(R, i, h)));
    out.push(...quad(at(r, i, 0), at(r, i, h), at(r, j, h), at(r, j, 0)));
    out.push(...quad(at(r, i, h), at(R, i, h), at(R, j, h), at(r, j, h)));
    out.push(...quad(at(r, i, 0), at(r, j, 0), at(R, j, 0), at(R, i, 0)));
  }
  return out;
}

const recipe: PrintSettings = { material: 'PLA', nozzleMm: 0.4, layerMm: 0.2, walls: 2, topBottomLayers: 4, infillPct: 20 };
const slicing = { layerMm: 0.2, walls: 2, lineWidthMm: 0.45, skinLayers: 4 };
const d = 0.9;

function volumes(positions: number[], settings = recipe) {
  const profile = sliceProfile(new Float64Array(positions), {
    ...slicing,
    layerMm: settings.layerMm,
    walls: settings.walls,
    skinLayers: settings.topBottomLayers,
  });
  return { profile, estimate: estimateFromSlices(profile, settings) };
}

const within1pct = (actual: number, expected: number) => expect(Math.abs(actual / expected - 1)).toBeLessThan(0.01);

describe('slices · shapes whose layers are known exactly', () => {
  it('slices · 20 mm cube · walls (20² − 18.2²)·20, skins 8·0.2·18.2², infill 0.2·92·0.2·18.2²', () => {
    const { profile, estimate } = volumes(prism(rect(0, 0, 20, 20), 0, 20));
    expect(profile.layers).toHaveLength(100);
    within1pct(estimate.partsMm3.walls, (400 - 18.2 ** 2) * 20); // 1375.2 mm³
    within1pct(estimate.partsMm3.skins, 8 * 0.2 * 18.2 ** 2); // 529.984 mm³
    within1pct(estimate.partsMm3.infill, 0.2 * 92 * 0.2 * 18.2 ** 2); // 1218.9632 mm³
    expect(estimate.method).toBe('slices');
  });

  it('slices · cylinder as a 64-gon, R 10, 10 tall · areas N/2·R²·sin(2π/N) and N·(a − d)²·tan(π/N), a = R·cos(π/N)', () => {
    const N = 64,
      R = 10;
    const area = (N / 2) * R * R * Math.sin((2 * Math.PI) / N);
    const a = R * Math.cos(Math.PI / N);
    const inset = N * (a - d) ** 2 * Math.tan(Math.PI / N);
    const { estimate } = volumes(prism(ngon(N, R), 0, 10));
    within1pct(estimate.partsMm3.walls, (area - inset) * 10);
    within1pct(estimate.partsMm3.skins, 8 * 0.2 * inset);
    within1pct(estimate.partsMm3.infill, 0.2 * 42 * 0.2 * inset);
  });

  it('slices · washer R 12 / r 6.5, 3 tall, 48 segments · ring N/2·sin(2π/N)·(R² − r²), inset N·tan(π/N)·((a_R − d)² − (a_r + d)²)', () => {
    const N = 48,
      R = 12,
      r = 6.5;
    const t = Math.tan(Math.PI / N),
      c = Math.cos(Math.PI / N);
    const area = (N / 2) * Math.sin((2 * Math.PI) / N) * (R * R - r * r);
    const inset = N * t * ((R * c - d) ** 2 - (r * c + d) ** 2);
    const { estimate } = volumes(ring(R, r, 3, N));
    within1pct(estimate.partsMm3.walls, (area - inset) * 3);
    within1pct(estimate.partsMm3.skins, 8 * 0.2 * inset); // 15 layers: 4 + 4 solid
    within1pct(estimate.partsMm3.infill, 0.2 * 7 * 0.2 * inset);
  });

  it('slices · flat plate 100 × 40 × 3, 0 % infill · walls (4000 − 98.2·38.2)·3, skins 8·0.2·98.2·38.2, about 9 g', () => {
    const { estimate } = volumes(prism(rect(0, 0, 100, 40), 0, 3), { ...recipe, infillPct: 0 });
    within1pct(estimate.partsMm3.walls, (4000 - 98.2 * 38.2) * 3); // 746.28 mm³
    within1pct(estimate.partsMm3.skins, 8 * 0.2 * 98.2 * 38.2); // 6001.98 mm³
    expect(estimate.partsMm3.infill).toBe(0);
    // 6748.26 mm³ × 1.24 g/cm³ = 8.37 g: the audit's "about 9 g", against 14.9 g solid.
    within1pct(estimate.massG, 6.74826 * 1.24);
  });

  it('slices · tall thin wall 40 × 0.8 × 30 · thinner than two walls, so all wall: 40·0.8·30 = 960 mm³', () => {
    const { estimate } = volumes(prism(rect(0, 0, 40, 0.8), 0, 30));
    within1pct(estimate.partsMm3.walls, 960);
    expect(estimate.partsMm3.skins).toBe(0);
    expect(estimate.partsMm3.infill).toBe(0);
  });

  it('slices · overhang: a 30 × 10 × 5 slab on a 10 × 10 × 10 stem · skin under the overhang only', () => {
    const stem = prism(rect(10, 0, 20, 10), 0, 10); // layers 0–49
    const slab = prism(rect(0, 0, 30, 10), 10, 15); // layers 50–74
    const { profile, estimate } = volumes([...stem, ...slab]);
    expect(profile.layers).toHaveLength(75);
    // Stem core 8.2² = 67.24, slab core 28.2 × 8.2 = 231.24; the stem under the slab's first layers
    // covers 10 × 8.2 = 82 of its core. Walls: (100 − 67.24)·10 + (300 − 231.24)·5.
    within1pct(estimate.partsMm3.walls, (100 - 67.24) * 10 + (300 - 231.24) * 5);
    // Skins: stem bottom 4 layers; slab layers 50–53 over the overhang (231.24 − 82); slab top 4 layers.
    within1pct(estimate.partsMm3.skins, 0.2 * (4 * 67.24 + 4 * (231.24 - 82) + 4 * 231.24));
    // Sparse: stem layers 4–49 (46), the stem-covered part of layers 50–53, slab layers 54–70 (17).
    within1pct(estimate.partsMm3.infill, 0.2 * 0.2 * (46 * 67.24 + 4 * 82 + 17 * 231.24));
  });

  it('slices · a facet corner exactly on a cutting plane · loops still close', () => {
    // Layers 0.25 mm on a 1 mm cube: planes at 0.125, 0.375 …; add a vertex row at z = 0.375 by stacking.
    const loops = sliceLoops(new Float64Array([...prism(rect(0, 0, 1, 1), 0, 0.375), ...prism(rect(0, 0, 1, 1), 0.375, 1)]), 0.25);
    expect(loops.openLoops).toBe(0);
    expect(loops.layers.every((l) => l.length >= 1)).toBe(true);
  });
});

describe('slices · sanity', () => {
  const shapes = {
    cube: prism(rect(0, 0, 20, 20), 0, 20),
    washer: ring(12, 6.5, 3, 48),
    overhang: [...prism(rect(10, 0, 20, 10), 0, 10), ...prism(rect(0, 0, 30, 10), 10, 15)],
  };

  it.each(Object.keys(shapes))('%s · more walls, infill or top/bottom layers never weigh less; faster never slower', (name) => {
    const mesh = shapes[name as keyof typeof shapes];
    const mass = (s: Partial<PrintSettings>) => volumes(mesh, { ...recipe, ...s }).estimate.massG;
    for (const [key, values] of [
      ['walls', [1, 2, 3, 4]],
      ['infillPct', [0, 10, 20, 50, 100]],
      ['topBottomLayers', [0, 2, 4, 6]],
    ] as const) {
      const masses = values.map((v) => mass({ [key]: v }));
      masses.slice(1).forEach((m, i) => expect(m, `${key}`).toBeGreaterThanOrEqual(masses[i] - 1e-9));
    }
    const profile = sliceProfile(new Float64Array(mesh), slicing);
    const times = [20, 40, 60, 100, 200].map((speedMmS) => estimateFromSlices(profile, { ...recipe, speedMmS }).timeMin);
    times.slice(1).forEach((t, i) => expect(t).toBeLessThanOrEqual(times[i] + 1e-9));
  });

  it('slices · 20 mm cube at 0.4 mm nozzle, 0.2 mm, 2 walls, 4 top/bottom, 20 %, 50 mm/s · 15–25 min and 3–5 g of PLA (common practice)', () => {
    const { estimate } = volumes(shapes.cube, { ...recipe, speedMmS: 50 });
    expect(estimate.timeMin).toBeGreaterThan(15);
    expect(estimate.timeMin).toBeLessThan(25);
    expect(estimate.massG).toBeGreaterThan(3);
    expect(estimate.massG).toBeLessThan(5);
    expect(estimate.assumptions.join(' ')).toMatch(/Sliced from the mesh: 100 layers of 0\.2 mm/);
  });
});
