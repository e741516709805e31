// Layer slices of a triangle mesh, and the per-layer figures a print estimate needs.
//
// Slicing: the part is cut into n = ⌈height ÷ layer⌉ layers of equal thickness t = height ÷ n, each
// cut by the plane through its middle. Every facet crossing a plane gives one segment (exact
// plane–triangle intersection, each point computed from its edge's lower corner so the two facets
// sharing an edge give the same point); segments are joined into loops by their end points on a
// 1 µm grid, and a layer's region is the loops filled even-odd (so holes are holes whatever the
// facets' winding).
//
// Per layer, with d = walls × line width (all polygon work by Clipper2, through clipper2-ts):
// - walls: the band between the outline and its inset by d (the outline length × walls × line
//   width, less the overlap at corners; the whole layer when it is thinner than 2d);
// - skins: the inset area not covered by every layer within `skin layers` above and below it;
// - infill: the rest of the inset area, times the infill share.
// Volumes are areas × t. Path lengths for the time model are areas ÷ line width (a line of width w
// and length L covers w·L); line lengths are the region's mean chord π·A/P (Cauchy's formula for a
// convex region), corners are outline turns sharper than 45°. Outlines are simplified to within
// 20 µm first.
import { Clipper, EndType, FillRule, JoinType, type Path64, type Paths64 } from 'clipper2-ts';

/** Coordinates are kept as integers in micrometres for Clipper. */
const UNITS_PER_MM = 1000;
/** Inset joins: mitred, so the insets of prisms are exact; spikes longer than 2 d are cut (Clipper's default). */
const MITER_LIMIT = 2;
/**
 * Outlines are simplified to within 20 µm before the polygon work (our choice): well under a line
 * width (450 µm) and a printer's positioning, it drops most points of finely faceted curves; an area
 * moves by at most about ⅔ × 20 µm × the outline length (0.1 % for a 60 mm round part).
 */
const SIMPLIFY_UM = 20;
/** A turn of the outline sharper than this stops the nozzle (from memory: printers slow right down at corners). */
const CORNER_TURN_RAD = Math.PI / 4;

export interface SliceSettings {
  layerMm: number;
  walls: number;
  lineWidthMm: number;
  /** Solid layers at the top and at the bottom of every surface. */
  skinLayers: number;
}

/** Figures for one layer; areas in mm², lengths in mm. */
export interface LayerFigures {
  area: number;
  /** Outline length. */
  perimeter: number;
  wallArea: number;
  skinArea: number;
  /** Area inside the walls that is not skin (before the infill share). */
  sparseArea: number;
  /** Separate pieces of the layer (outer loops). */
  islands: number;
  /** Sharp turns along the outline. */
  corners: number;
  /** Mean chord of the area inside the walls (π·A/P), or of the layer when the walls fill it. */
  chord: number;
}

export interface SliceProfile {
  layers: LayerFigures[];
  /** Thickness of every layer (height ÷ layer count). */
  layerMm: number;
  heightMm: number;
  /** Loops that did not close (open meshes); they were closed straight across. */
  openLoops: number;
}

export type LayerPaths = Paths64[];

/**
 * Cuts the triangles (9 numbers per facet, mm) at the middle of each layer and returns each layer's
 * loops in micrometres.
 */
export function sliceLoops(positions: ArrayLike<number>, layerMm: number): { layers: LayerPaths; layerMm: number; heightMm: number; openLoops: number } {
  if (!(layerMm > 0)) throw new RangeError('Layer height must be a number > 0.');
  const facets = Math.floor(positions.length / 9);
  let zMin = Infinity,
    zMax = -Infinity;
  for (let i = 2; i < facets * 9; i += 3) {
    const z = positions[i];
    if (z < zMin) zMin = z;
    if (z > zMax) zMax = z;
  }
  const height = zMax - zMin;
  if (!(height > 0)) return { layers: [], layerMm, heightMm: 0, openLoops: 0 };
  const n = Math.max(1, Math.ceil(height / layerMm - 1e-9));
  const t = height / n;
  const planeOf = (i: number) => zMin + (i + 0.5) * t;
  // First layer whose plane lies strictly above z.
  const firstLayerOver = (z: number) => Math.max(0, Math.floor((z - zMin) / t - 0.5) + 1);
  // A corner exactly on a plane counts as above it, on every facet alike, so a facet crosses the
  // planes in (lowest corner, highest corner].
  const range = (lo: number, hi: number): [number, number] => [firstLayerOver(lo), Math.min(n, firstLayerOver(hi))];

  // Pass 1: segments per layer.
  const counts = new Int32Array(n + 1);
  for (let f = 0; f < facets; f++) {
    const o = f * 9;
    const za = positions[o + 2],
      zb = positions[o + 5],
      zc = positions[o + 8];
    const [from, to] = range(Math.min(za, zb, zc), Math.max(za, zb, zc));
    for (let i = from; i < to; i++) counts[i]++;
  }
  const starts = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) starts[i + 1] = starts[i] + counts[i];
  const total = starts[n];
  const fill = starts.slice(0, n);
  const sx = new Int32Array(total),
    sy = new Int32Array(total),
    ex = new Int32Array(total),
    ey = new Int32Array(total);

  // Pass 2: the segment of each facet in each layer it crosses.
  const px = [0, 0],
    py = [0, 0];
  for (let f = 0; f < facets; f++) {
    const o = f * 9;
    const za = positions[o + 2],
      zb = positions[o + 5],
      zc = positions[o + 8];
    const [from, to] = range(Math.min(za, zb, zc), Math.max(za, zb, zc));
    for (let i = from; i < to; i++) {
      const z = planeOf(i);
      let k = 0;
      for (let e = 0; e < 3 && k < 2; e++) {
        const p = o + e * 3,
          q = o + ((e + 1) % 3) * 3;
        const zp = positions[p + 2],
          zq = positions[q + 2];
        if (zp >= z === zq >= z) continue;
        const [lo, hi] = zp < zq ? [p, q] : [q, p];
        const s = (z - positions[lo + 2]) / (positions[hi + 2] - positions[lo + 2]);
        px[k] = Math.round((positions[lo] + s * (positions[hi] - positions[lo])) * UNITS_PER_MM);
        py[k] = Math.round((positions[lo + 1] + s * (positions[hi + 1] - positions[lo + 1])) * UNITS_PER_MM);
        k++;
      }
      // A facet touching the plane at one corner gives a point, not a segment.
      if (k < 2 || (px[0] === px[1] && py[0] === py[1])) continue;
      const slot = fill[i]++;
      sx[slot] = px[0];
      sy[slot] = py[0];
      ex[slot] = px[1];
      ey[slot] = py[1];
    }
  }

  // Join each layer's segments into loops through their shared end points.
  const layers: LayerPaths = [];
  let openLoops = 0;
  let table = new Int32Array(1024);
  let partner = new Int32Array(1024);
  let visited = new Uint8Array(512);
  for (let i = 0; i < n; i++) {
    const first = starts[i],
      count = fill[i] - first;
    const capacity = nextPowerOfTwo(Math.max(16, count * 4));
    if (table.length < capacity) table = new Int32Array(capacity);
    if (partner.length < count * 2) partner = new Int32Array(count * 2);
    if (visited.length < count) visited = new Uint8Array(count);
    const mask = capacity - 1;
    table.fill(-1, 0, capacity);
    partner.fill(-1, 0, count * 2);
    visited.fill(0, 0, count);
    const xOf = (end: number) => ((end & 1) === 0 ? sx : ex)[first + (end >> 1)];
    const yOf = (end: number) => ((end & 1) === 0 ? sy : ey)[first + (end >> 1)];
    for (let end = 0; end < count * 2; end++) {
      const x = xOf(end),
        y = yOf(end);
      let slot = hash2(x, y) & mask;
      for (;;) {
        const other = table[slot];
        if (other < 0) {
          table[slot] = end;
          break;
        }
        if (xOf(other) === x && yOf(other) === y) {
          if (partner[other] < 0 && other >> 1 !== end >> 1) {
            partner[other] = end;
            partner[end] = other;
          } else {
            table[slot] = end; // a third use (non-manifold): pair the newer ends instead
          }
          break;
        }
        slot = (slot + 1) & mask;
      }
    }
    const loops: Paths64 = [];
    for (let s = 0; s < count; s++) {
      if (visited[s]) continue;
      visited[s] = 1;
      const path: Path64 = [{ x: sx[first + s], y: sy[first + s] }];
      let end = s * 2 + 1;
      let closed = false;
      for (;;) {
        path.push({ x: xOf(end), y: yOf(end) });
        const next = partner[end];
        if (next < 0) break;
        const seg = next >> 1;
        if (seg === s) {
          closed = true;
          break;
        }
        if (visited[seg]) break;
        visited[seg] = 1;
        end = next ^ 1;
      }
      if (closed)
        path.pop(); // the last point repeats the first
      else openLoops++;
      if (path.length >= 3) loops.push(path);
    }
    layers.push(loops);
  }
  return { layers, layerMm: t, heightMm: height, openLoops };
}

function hash2(x: number, y: number): number {
  let h = Math.imul(x ^ (x >>> 16), 0x85ebca6b) ^ y;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return h ^ (h >>> 16);
}

function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

const area = (paths: Paths64) => Math.abs(Clipper.areaPaths(paths)) / (UNITS_PER_MM * UNITS_PER_MM);

function perimeter(paths: Paths64): number {
  let length = 0;
  for (const path of paths) {
    for (let i = 0, j = path.length - 1; i < path.length; j = i++) length += Math.hypot(path[i].x - path[j].x, path[i].y - path[j].y);
  }
  return length / UNITS_PER_MM;
}

function corners(paths: Paths64): number {
  let count = 0;
  for (const path of paths) {
    const m = path.length;
    for (let i = 0; i < m; i++) {
      const a = path[(i + m - 1) % m],
        b = path[i],
        c = path[(i + 1) % m];
      const ux = b.x - a.x,
        uy = b.y - a.y,
        vx = c.x - b.x,
        vy = c.y - b.y;
      const turn = Math.abs(Math.atan2(ux * vy - uy * vx, ux * vx + uy * vy));
      if (turn > CORNER_TURN_RAD) count++;
    }
  }
  return count;
}

function samePaths(a: Paths64, b: Paths64): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const p = a[i],
      q = b[i];
    if (p.length !== q.length) return false;
    for (let k = 0; k < p.length; k++) if (p[k].x !== q[k].x || p[k].y !== q[k].y) return false;
  }
  return true;
}

function intersect(a: Paths64, b: Paths64): Paths64 {
  if (a === b || samePaths(a, b)) return a;
  if (a.length === 0 || b.length === 0) return [];
  return Clipper.intersect(a, b, FillRule.NonZero);
}

/**
 * Intersections of every run of `width` consecutive regions (van Herk / Gil-Werman: about three
 * intersections per layer whatever the width). Entry i covers regions i … i + width − 1.
 */
function windowIntersections(regions: Paths64[], width: number): Paths64[] {
  const n = regions.length;
  if (width <= 1) return regions.slice();
  const prefix: Paths64[] = new Array(n);
  const suffix: Paths64[] = new Array(n);
  for (let i = 0; i < n; i++) prefix[i] = i % width === 0 ? regions[i] : intersect(prefix[i - 1], regions[i]);
  for (let i = n - 1; i >= 0; i--) suffix[i] = i % width === width - 1 || i === n - 1 ? regions[i] : intersect(suffix[i + 1], regions[i]);
  const out: Paths64[] = [];
  for (let i = 0; i + width <= n; i++) {
    const last = i + width - 1;
    out.push(i % width === 0 ? prefix[last] : intersect(suffix[i], prefix[last]));
  }
  return out;
}

/** A layer's loops filled even-odd, simplified; a single loop (the common case) needs no union, only counter-clockwise order. */
function regionOf(loops: Paths64): Paths64 {
  if (loops.length === 0) return [];
  const simple = Clipper.simplifyPaths(loops, SIMPLIFY_UM, true).filter((p) => p.length >= 3);
  if (simple.length === 1) return Clipper.isPositive(simple[0]) ? simple : [simple[0].slice().reverse()];
  return Clipper.union(simple, FillRule.EvenOdd);
}

/** Slices the mesh and measures walls, skins and the sparse inside of every layer. */
export function sliceProfile(positions: ArrayLike<number>, settings: SliceSettings): SliceProfile {
  const { layers: loops, layerMm, heightMm, openLoops } = sliceLoops(positions, settings.layerMm);
  const n = loops.length;
  const inset = settings.walls * settings.lineWidthMm * UNITS_PER_MM;
  const regions = loops.map(regionOf);
  const cores = regions.map((r) => (inset > 0 && r.length ? Clipper.inflatePaths(r, -inset, JoinType.Miter, EndType.Polygon, MITER_LIMIT) : r));
  const k = Math.max(0, Math.floor(settings.skinLayers));
  const width = 2 * k + 1;
  // covered[i]: the part of layer i's neighbourhood present in every layer from i − k to i + k.
  const windows = k > 0 ? windowIntersections(regions, width) : null;

  const layers: LayerFigures[] = [];
  for (let i = 0; i < n; i++) {
    const region = regions[i];
    const core = cores[i];
    const a = area(region);
    const coreArea = area(core);
    let skinArea: number;
    if (k === 0) skinArea = 0;
    else if (i - k < 0 || i + k >= n) skinArea = coreArea;
    else skinArea = Math.max(0, coreArea - area(intersect(core, windows![i - k])));
    const outlinePerimeter = perimeter(region);
    const corePerimeter = perimeter(core);
    const chord = corePerimeter > 0 ? (Math.PI * coreArea) / corePerimeter : outlinePerimeter > 0 ? (Math.PI * a) / outlinePerimeter : 0;
    layers.push({
      area: a,
      perimeter: outlinePerimeter,
      wallArea: Math.max(0, a - coreArea),
      skinArea,
      sparseArea: Math.max(0, coreArea - skinArea),
      islands: region.filter((p) => Clipper.isPositive(p)).length,
      corners: corners(region),
      chord,
    });
  }
  return { layers, layerMm, heightMm, openLoops };
}
