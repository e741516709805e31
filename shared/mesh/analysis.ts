// Over 350 lines on purpose: the facet accumulator and the checks that read its typed arrays
// (welding, edge use, shells, orientation) share those arrays; bench:mesh measures them as one path.
import { MODEL_LIMITS } from '../uploads';
import { detectStlFormat, declaredFacetCount, nonFiniteFacet, readAsciiStl, readBinaryStl } from './stl';
import { isZip, read3mf } from './threemf';
import { type AnalyseFileOptions, type AnalyseOptions, type FacetSink, type MeshAnalysis, MeshError, type ModelFileAnalysis, type Vec3 } from './types';

export const MM_PER_INCH = 25.4;

/** Below this largest extent a part was most likely drawn in inches or metres. */
const TINY_PART_MM = 3;

/** sin²θ between a facet's two edges below which it counts as zero-area (corners collinear). */
const DEGENERATE_SIN2 = 1e-24;

// Scratch views for reading a coordinate's float32 bit pattern.
const F32 = new Float32Array(1);
const U32 = new Uint32Array(F32.buffer);
const NEGATIVE_ZERO_BITS = 0x80000000;

// Slots in MeshAccumulator.sums.
const MIN_X = 0,
  MIN_Y = 1,
  MIN_Z = 2,
  MAX_X = 3,
  MAX_Y = 4,
  MAX_Z = 5,
  DOUBLE_AREA = 6,
  SIX_VOLUME = 7;

/**
 * Welds vertices whose float32 coordinates are equal, with an open-addressing hash table keyed
 * by the coordinate bits, so a million-facet mesh needs no string keys.
 */
class VertexWelder {
  count = 0;
  private slots: Int32Array;
  private mask: number;
  private bits: Uint32Array;

  constructor(expectedVertices: number) {
    const capacity = nextPowerOfTwo(Math.max(64, expectedVertices * 2));
    this.slots = new Int32Array(capacity).fill(-1);
    this.mask = capacity - 1;
    this.bits = new Uint32Array(capacity * 1.5);
  }

  id(x: number, y: number, z: number): number {
    F32[0] = x;
    let bx = U32[0];
    F32[0] = y;
    let by = U32[0];
    F32[0] = z;
    let bz = U32[0];
    // -0 and +0 are the same point.
    if (bx === NEGATIVE_ZERO_BITS) bx = 0;
    if (by === NEGATIVE_ZERO_BITS) by = 0;
    if (bz === NEGATIVE_ZERO_BITS) bz = 0;

    const slots = this.slots;
    const bits = this.bits;
    const mask = this.mask;
    let slot = hash3(bx, by, bz) & mask;
    for (;;) {
      const id = slots[slot];
      if (id < 0) return this.insert(slot, bx, by, bz);
      const k = id * 3;
      if (bits[k] === bx && bits[k + 1] === by && bits[k + 2] === bz) return id;
      slot = (slot + 1) & mask;
    }
  }

  /** x, y, z of vertex id at [3·id …]; shares memory with the welder. */
  coordinates(): Float32Array {
    return new Float32Array(this.bits.buffer, 0, this.count * 3);
  }

  private insert(slot: number, bx: number, by: number, bz: number): number {
    const id = this.count++;
    if (id * 3 + 3 > this.bits.length) this.growBits();
    const k = id * 3;
    this.bits[k] = bx;
    this.bits[k + 1] = by;
    this.bits[k + 2] = bz;
    this.slots[slot] = id;
    if (this.count * 2 > this.slots.length) this.rehash();
    return id;
  }

  private growBits(): void {
    const bigger = new Uint32Array(this.bits.length * 2);
    bigger.set(this.bits);
    this.bits = bigger;
  }

  private rehash(): void {
    const capacity = this.slots.length * 2;
    const slots = new Int32Array(capacity).fill(-1);
    const mask = capacity - 1;
    const bits = this.bits;
    for (let id = 0; id < this.count; id++) {
      const k = id * 3;
      let slot = hash3(bits[k], bits[k + 1], bits[k + 2]) & mask;
      while (slots[slot] >= 0) slot = (slot + 1) & mask;
      slots[slot] = id;
    }
    this.slots = slots;
    this.mask = mask;
  }
}

/** Mixes three 32-bit words (murmur3-style finaliser) so regular grids of floats spread evenly. */
function hash3(a: number, b: number, c: number): number {
  let h = Math.imul(a ^ (a >>> 16), 0x85ebca6b) ^ b;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) ^ c;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  return h ^ (h >>> 13);
}

function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * Vertices closer than this share of the bounding-box diagonal are welded. A millionth is about
 * 16 float32 steps at the largest coordinate, far below what a printer resolves (our choice).
 */
export const WELD_TOLERANCE_PER_DIAGONAL = 1e-6;

// Values in MeshAccumulator.flags.
const FLAG_REPEATED_CORNER = 1;
const FLAG_ZERO_AREA = 2;

/**
 * Takes facets one at a time and keeps running bounding box, area and signed volume, plus the
 * welded vertex ids each facet uses; finish() then works out edges and shells from the ids.
 */
export class MeshAccumulator implements FacetSink {
  private ids: Uint32Array;
  /** 0 for a facet with area, else FLAG_REPEATED_CORNER or FLAG_ZERO_AREA. */
  private flags: Uint8Array;
  private facets = 0;
  // Running figures in a typed array: V8 keeps them as raw doubles there, unlike number fields.
  private readonly sums = new Float64Array([Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity, 0, 0]);
  private readonly welder: VertexWelder;

  constructor(expectedFacets = 1024) {
    const capacity = Math.max(16, Math.ceil(expectedFacets));
    this.ids = new Uint32Array(capacity * 3);
    this.flags = new Uint8Array(capacity);
    // A closed mesh has about half as many vertices as facets.
    this.welder = new VertexWelder(capacity * 0.6);
  }

  addFacet(ax: number, ay: number, az: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number): void {
    const f = this.facets;
    if (f === this.flags.length) this.grow();

    const ux = bx - ax,
      uy = by - ay,
      uz = bz - az;
    const vx = cx - ax,
      vy = cy - ay,
      vz = cz - az;
    const nx = uy * vz - uz * vy,
      ny = uz * vx - ux * vz,
      nz = ux * vy - uy * vx;
    const cross2 = nx * nx + ny * ny + nz * nz;
    if (!(cross2 < Infinity)) throw nonFiniteFacet(f);
    const s = this.sums;
    s[MIN_X] = Math.min(s[MIN_X], ax, bx, cx);
    s[MIN_Y] = Math.min(s[MIN_Y], ay, by, cy);
    s[MIN_Z] = Math.min(s[MIN_Z], az, bz, cz);
    s[MAX_X] = Math.max(s[MAX_X], ax, bx, cx);
    s[MAX_Y] = Math.max(s[MAX_Y], ay, by, cy);
    s[MAX_Z] = Math.max(s[MAX_Z], az, bz, cz);
    s[DOUBLE_AREA] += Math.sqrt(cross2);
    // v1·(v2×v3) = v1·((v2−v1)×(v3−v1)), which reuses the cross product already needed for the area.
    s[SIX_VOLUME] += ax * nx + ay * ny + az * nz;

    const welder = this.welder;
    const a = welder.id(ax, ay, az);
    const b = welder.id(bx, by, bz);
    const c = welder.id(cx, cy, cz);
    const k = f * 3;
    this.ids[k] = a;
    this.ids[k + 1] = b;
    this.ids[k + 2] = c;
    if (a === b || b === c || a === c) this.flags[f] = FLAG_REPEATED_CORNER;
    else if (cross2 <= DEGENERATE_SIN2 * (ux * ux + uy * uy + uz * uz) * (vx * vx + vy * vy + vz * vz)) this.flags[f] = FLAG_ZERO_AREA;
    this.facets = f + 1;
  }

  finish(unitScale = 1): MeshAnalysis {
    if (this.facets === 0) throw new MeshError('no_facets', 'The mesh has no facets.');
    const ids = this.ids.subarray(0, this.facets * 3);
    const flags = this.flags.subarray(0, this.facets);
    const sums = this.sums;
    const vertices = this.welder.count;
    const coords = this.welder.coordinates();

    const diagonal = Math.hypot(sums[MAX_X] - sums[MIN_X], sums[MAX_Y] - sums[MIN_Y], sums[MAX_Z] - sums[MIN_Z]);
    const tolerance = diagonal * WELD_TOLERANCE_PER_DIAGONAL;
    let edges = countEdgeUse(ids, flags, vertices);
    let weldedVertices = 0;
    // Welding within the tolerance can only close gaps, so it is only worth its time when exact welding left some open.
    if (edges.openEdges > 0) {
      const welded = weldWithinTolerance(coords, vertices, tolerance, sums[MIN_X], sums[MIN_Y], sums[MIN_Z]);
      if (welded.merged > 0) {
        weldedVertices = welded.merged;
        remapFacets(ids, flags, welded.remap);
        edges = countEdgeUse(ids, flags, vertices);
      }
    }
    const { openEdges, nonManifoldEdges, misorientedEdges } = edges;

    let degenerateFacets = 0;
    let zeroAreaFacets = 0;
    for (let f = 0; f < flags.length; f++) {
      if (flags[f] === FLAG_REPEATED_CORNER) degenerateFacets++;
      else if (flags[f] === FLAG_ZERO_AREA) zeroAreaFacets++;
    }
    const solidFacets = this.facets - degenerateFacets - zeroAreaFacets;
    const shells = countShells(ids, flags, vertices);

    const rawSixVolume = sums[SIX_VOLUME];
    let orientation: Orientation;
    if (misorientedEdges === 0 && shells <= 1) {
      // One consistently wound shell: its sign alone says whether it is inside out.
      orientation = { reversedFacets: 0, insideOutShells: rawSixVolume < 0 ? 1 : 0, unorientable: 0, sixVolume: Math.abs(rawSixVolume) };
    } else {
      orientation = orientShells(ids, flags, coords, vertices);
    }

    const s = unitScale;
    const min: Vec3 = [sums[MIN_X] * s, sums[MIN_Y] * s, sums[MIN_Z] * s];
    const max: Vec3 = [sums[MAX_X] * s, sums[MAX_Y] * s, sums[MAX_Z] * s];
    const signedVolumeMm3 = (rawSixVolume / 6) * s * s * s;
    const volumeMm3 = (orientation.sixVolume / 6) * s * s * s;
    const analysis: MeshAnalysis = {
      // Extents scaled after subtracting, so 1 inch comes out as exactly 25.4 mm.
      sizeMm: [(sums[MAX_X] - sums[MIN_X]) * s, (sums[MAX_Y] - sums[MIN_Y]) * s, (sums[MAX_Z] - sums[MIN_Z]) * s],
      min,
      max,
      volumeMm3,
      signedVolumeMm3,
      volumeRepaired: orientation.reversedFacets > 0 || (orientation.insideOutShells > 0 && orientation.insideOutShells < shells),
      insideOut: orientation.insideOutShells > 0,
      insideOutShells: orientation.insideOutShells,
      windingConsistent: misorientedEdges === 0 && orientation.unorientable === 0,
      reversedFacets: orientation.reversedFacets,
      misorientedEdges,
      areaMm2: (sums[DOUBLE_AREA] / 2) * s * s,
      facets: this.facets,
      degenerateFacets,
      zeroAreaFacets,
      watertight: solidFacets > 0 && openEdges === 0 && nonManifoldEdges === 0,
      openEdges,
      nonManifoldEdges,
      shells,
      vertices: vertices - weldedVertices,
      weldedVertices,
      weldToleranceMm: tolerance * s,
      warnings: [],
    };
    analysis.warnings = describeProblems(analysis, orientation.unorientable);
    return analysis;
  }

  private grow(): void {
    const ids = new Uint32Array(this.ids.length * 2);
    ids.set(this.ids);
    this.ids = ids;
    const flags = new Uint8Array(this.flags.length * 2);
    flags.set(this.flags);
    this.flags = flags;
  }
}

/**
 * Merges exact-welded vertices whose coordinates round to the same multiple of `tolerance`
 * (measured from the bounding box's corner). Two points closer than the tolerance can still stay
 * apart when a rounding boundary falls between them; the chance is their distance over the
 * tolerance, so hairline seams (1e-15 mm from trigonometry) almost always close.
 */
function weldWithinTolerance(
  coords: Float32Array,
  vertices: number,
  tolerance: number,
  ox: number,
  oy: number,
  oz: number,
): { remap: Uint32Array; merged: number } {
  const remap = new Uint32Array(vertices);
  if (!(tolerance > 0)) {
    for (let v = 0; v < vertices; v++) remap[v] = v;
    return { remap, merged: 0 };
  }
  const inverse = 1 / tolerance;
  const capacity = nextPowerOfTwo(Math.max(64, vertices * 2));
  const mask = capacity - 1;
  const slots = new Int32Array(capacity).fill(-1);
  const cells = new Int32Array(vertices * 3);
  let merged = 0;
  for (let v = 0, k = 0; v < vertices; v++, k += 3) {
    const qx = Math.round((coords[k] - ox) * inverse);
    const qy = Math.round((coords[k + 1] - oy) * inverse);
    const qz = Math.round((coords[k + 2] - oz) * inverse);
    cells[k] = qx;
    cells[k + 1] = qy;
    cells[k + 2] = qz;
    let slot = hash3(qx, qy, qz) & mask;
    for (;;) {
      const other = slots[slot];
      if (other < 0) {
        slots[slot] = v;
        remap[v] = v;
        break;
      }
      const j = other * 3;
      if (cells[j] === qx && cells[j + 1] === qy && cells[j + 2] === qz) {
        remap[v] = other;
        merged++;
        break;
      }
      slot = (slot + 1) & mask;
    }
  }
  return { remap, merged };
}

function remapFacets(ids: Uint32Array, flags: Uint8Array, remap: Uint32Array): void {
  for (let f = 0, k = 0; f < flags.length; f++, k += 3) {
    const a = (ids[k] = remap[ids[k]]);
    const b = (ids[k + 1] = remap[ids[k + 1]]);
    const c = (ids[k + 2] = remap[ids[k + 2]]);
    if (a === b || b === c || a === c) flags[f] = FLAG_REPEATED_CORNER;
  }
}

/**
 * Counts how often each edge is used, and in which direction. Instead of hashing edge keys, edges
 * are bucketed by their lower vertex id (a counting sort), so each bucket only holds the few higher
 * ids it joins; each entry is partner·2 + direction (0 when the facet runs from the lower id).
 */
function countEdgeUse(ids: Uint32Array, flags: Uint8Array, vertices: number): { openEdges: number; nonManifoldEdges: number; misorientedEdges: number } {
  const offsets = new Uint32Array(vertices + 1);
  let halfEdges = 0;
  for (let f = 0, k = 0; f < flags.length; f++, k += 3) {
    if (flags[f]) continue;
    const a = ids[k],
      b = ids[k + 1],
      c = ids[k + 2];
    offsets[a < b ? a : b]++;
    offsets[b < c ? b : c]++;
    offsets[c < a ? c : a]++;
    halfEdges += 3;
  }
  let end = 0;
  for (let v = 0; v < vertices; v++) {
    end += offsets[v];
    offsets[v] = end;
  }
  offsets[vertices] = end;

  const partners = new Uint32Array(halfEdges);
  for (let f = 0, k = 0; f < flags.length; f++, k += 3) {
    if (flags[f]) continue;
    const a = ids[k],
      b = ids[k + 1],
      c = ids[k + 2];
    if (a < b) partners[--offsets[a]] = b * 2;
    else partners[--offsets[b]] = a * 2 + 1;
    if (b < c) partners[--offsets[b]] = c * 2;
    else partners[--offsets[c]] = b * 2 + 1;
    if (c < a) partners[--offsets[c]] = a * 2;
    else partners[--offsets[a]] = c * 2 + 1;
  }
  // offsets[v] now marks the start of vertex v's bucket.

  let openEdges = 0;
  let nonManifoldEdges = 0;
  let misorientedEdges = 0;
  for (let v = 0; v < vertices; v++) {
    const start = offsets[v];
    const stop = offsets[v + 1];
    if (stop - start > 1) sortRange(partners, start, stop);
    for (let i = start; i < stop;) {
      const partner = partners[i] >>> 1;
      let j = i + 1;
      while (j < stop && partners[j] >>> 1 === partner) j++;
      if (j - i === 1) openEdges++;
      else if (j - i > 2) nonManifoldEdges++;
      // Sorted, so a sound pair is partner·2 then partner·2 + 1.
      else if (partners[i] === partners[i + 1]) misorientedEdges++;
      i = j;
    }
  }
  return { openEdges, nonManifoldEdges, misorientedEdges };
}

function sortRange(values: Uint32Array, start: number, stop: number): void {
  if (stop - start > 24) {
    values.subarray(start, stop).sort();
    return;
  }
  for (let i = start + 1; i < stop; i++) {
    const x = values[i];
    let j = i - 1;
    while (j >= start && values[j] > x) {
      values[j + 1] = values[j];
      j--;
    }
    values[j + 1] = x;
  }
}

/** Connected pieces, by union-find over welded vertices; zero-area facets join nothing. */
function countShells(ids: Uint32Array, flags: Uint8Array, vertices: number): number {
  const parent = new Int32Array(vertices).fill(-1); // -1: not used by any solid facet
  for (let f = 0, k = 0; f < flags.length; f++, k += 3) {
    if (flags[f]) continue;
    const a = ids[k],
      b = ids[k + 1],
      c = ids[k + 2];
    if (parent[a] < 0) parent[a] = a;
    if (parent[b] < 0) parent[b] = b;
    if (parent[c] < 0) parent[c] = c;
    union(parent, a, b);
    union(parent, a, c);
  }
  let shells = 0;
  for (let v = 0; v < vertices; v++) if (parent[v] === v) shells++;
  return shells;
}

function find(parent: Int32Array, x: number): number {
  while (parent[x] !== x) {
    parent[x] = parent[parent[x]]; // path halving
    x = parent[x];
  }
  return x;
}

function union(parent: Int32Array, a: number, b: number): void {
  const ra = find(parent, a);
  const rb = find(parent, b);
  if (ra !== rb) parent[ra > rb ? ra : rb] = ra > rb ? rb : ra;
}

interface Orientation {
  /** Facets wound against the majority of their edge-connected patch. */
  reversedFacets: number;
  insideOutShells: number;
  /** Edges where no choice of flips makes the patch consistent (a one-sided surface). */
  unorientable: number;
  /** Six times the enclosed volume once reversed facets and inside-out patches are flipped. */
  sixVolume: number;
}

/** Cavity tests (one ray each through every other facet) are run for at most this many patches. */
const MAX_CAVITY_TESTS = 32;

/**
 * Works out which facets to flip, when the quick check found edges run the same way by both their
 * facets or more than one shell. Facets sharing a two-facet edge are joined in a union-find that
 * also keeps each facet's winding relative to its root (flipped or not), so every edge-connected
 * patch ends up with two camps; the smaller camp is the reversed facets. A patch whose volume,
 * counted with the larger camp's winding, is negative is inside out, unless a ray from it crosses
 * another patch an odd number of times (then it is a cavity, wound inward on purpose).
 */
function orientShells(ids: Uint32Array, flags: Uint8Array, coords: Float32Array, vertices: number): Orientation {
  const facets = flags.length;
  // Half-edges bucketed by lower vertex, as in countEdgeUse, but holding the half-edge index.
  const offsets = new Uint32Array(vertices + 1);
  for (let f = 0, k = 0; f < facets; f++, k += 3) {
    if (flags[f]) continue;
    const a = ids[k],
      b = ids[k + 1],
      c = ids[k + 2];
    offsets[a < b ? a : b]++;
    offsets[b < c ? b : c]++;
    offsets[c < a ? c : a]++;
  }
  let end = 0;
  for (let v = 0; v < vertices; v++) offsets[v] = end += offsets[v];
  offsets[vertices] = end;
  const halves = new Uint32Array(end);
  const next = (h: number) => (h % 3 === 2 ? h - 2 : h + 1);
  for (let f = 0, k = 0; f < facets; f++, k += 3) {
    if (flags[f]) continue;
    for (let h = k; h < k + 3; h++) {
      const a = ids[h],
        b = ids[next(h)];
      halves[--offsets[a < b ? a : b]] = h;
    }
  }
  const higher = (h: number) => Math.max(ids[h], ids[next(h)]);

  const parent = new Int32Array(facets);
  const parity = new Uint8Array(facets);
  for (let f = 0; f < facets; f++) parent[f] = f;
  const root = (f: number): number => {
    let p = 0;
    let x = f;
    while (parent[x] !== x) {
      p ^= parity[x];
      x = parent[x];
    }
    // Compress: point f straight at the root with its accumulated parity.
    let y = f;
    let q = p;
    while (parent[y] !== y) {
      const up = parent[y];
      const before = parity[y];
      parent[y] = x;
      parity[y] = q;
      q ^= before;
      y = up;
    }
    return x;
  };

  let unorientable = 0;
  for (let v = 0; v < vertices; v++) {
    const start = offsets[v],
      stop = offsets[v + 1];
    // Insertion sort by the other end: buckets are small.
    for (let i = start + 1; i < stop; i++) {
      const h = halves[i];
      const key = higher(h);
      let j = i - 1;
      while (j >= start && higher(halves[j]) > key) {
        halves[j + 1] = halves[j];
        j--;
      }
      halves[j + 1] = h;
    }
    for (let i = start; i < stop;) {
      let j = i + 1;
      while (j < stop && higher(halves[j]) === higher(halves[i])) j++;
      if (j - i === 2) {
        const h1 = halves[i],
          h2 = halves[i + 1];
        // Same direction along the edge: one of the two facets must be flipped.
        const flip = ids[h1] === ids[h2] ? 1 : 0;
        const f1 = (h1 / 3) | 0,
          f2 = (h2 / 3) | 0;
        const r1 = root(f1),
          r2 = root(f2);
        const p1 = parity[f1] & (f1 === r1 ? 0 : 1),
          p2 = parity[f2] & (f2 === r2 ? 0 : 1);
        if (r1 === r2) {
          if ((p1 ^ p2) !== flip) unorientable++;
        } else {
          parent[r2] = r1;
          parity[r2] = p1 ^ p2 ^ flip;
        }
      }
      i = j;
    }
  }

  // Per patch: facets in each camp and six times the volume with the root's own winding.
  const camp = new Int32Array(facets);
  const sixVolume = new Float64Array(facets);
  const patchOf = new Int32Array(facets);
  const [ox, oy, oz] = [coords[0], coords[1], coords[2]];
  for (let f = 0, k = 0; f < facets; f++, k += 3) {
    if (flags[f]) {
      patchOf[f] = -1;
      continue;
    }
    const r = root(f);
    const p = f === r ? 0 : parity[f];
    patchOf[f] = r;
    camp[r] += p ? 1 : -1;
    const a = ids[k] * 3,
      b = ids[k + 1] * 3,
      c = ids[k + 2] * 3;
    const ax = coords[a] - ox,
      ay = coords[a + 1] - oy,
      az = coords[a + 2] - oz;
    const bx = coords[b] - ox,
      by = coords[b + 1] - oy,
      bz = coords[b + 2] - oz;
    const cx = coords[c] - ox,
      cy = coords[c + 1] - oy,
      cz = coords[c + 2] - oz;
    const v6 = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
    sixVolume[r] += p ? -v6 : v6;
  }

  let reversedFacets = 0;
  let insideOutShells = 0;
  let total = 0;
  let cavityTests = 0;
  const counts = new Int32Array(facets);
  for (let f = 0; f < facets; f++) if (patchOf[f] >= 0) counts[patchOf[f]]++;
  for (let r = 0; r < facets; r++) {
    if (patchOf[r] !== r) continue;
    // camp = (flipped) − (unflipped); the smaller camp is reversed.
    const flipped = (counts[r] + camp[r]) / 2;
    const kept = counts[r] - flipped;
    const majorityFlipped = flipped > kept;
    reversedFacets += Math.min(flipped, kept);
    const volume = majorityFlipped ? -sixVolume[r] : sixVolume[r];
    if (volume >= 0) {
      total += volume;
    } else if (cavityTests++ < MAX_CAVITY_TESTS && insideAnotherPatch(r, ids, coords, patchOf)) {
      total += volume;
    } else {
      insideOutShells++;
      total -= volume;
    }
  }
  return { reversedFacets, insideOutShells, unorientable, sixVolume: Math.abs(total) };
}

/** Casts a ray from a corner of the patch and counts crossings of other patches' facets (odd means inside). */
function insideAnotherPatch(patch: number, ids: Uint32Array, coords: Float32Array, patchOf: Int32Array): boolean {
  const p = ids[patch * 3] * 3;
  const px = coords[p],
    py = coords[p + 1],
    pz = coords[p + 2];
  // An oblique direction, so the ray is unlikely to graze an edge of an axis-aligned mesh.
  const dx = 0.5773502691896258,
    dy = 0.5776502691896258,
    dz = 0.5770502691896258;
  let crossings = 0;
  for (let f = 0, k = 0; f < patchOf.length; f++, k += 3) {
    const other = patchOf[f];
    if (other < 0 || other === patch) continue;
    // Möller–Trumbore ray–triangle intersection.
    const a = ids[k] * 3,
      b = ids[k + 1] * 3,
      c = ids[k + 2] * 3;
    const e1x = coords[b] - coords[a],
      e1y = coords[b + 1] - coords[a + 1],
      e1z = coords[b + 2] - coords[a + 2];
    const e2x = coords[c] - coords[a],
      e2y = coords[c + 1] - coords[a + 1],
      e2z = coords[c + 2] - coords[a + 2];
    const hx = dy * e2z - dz * e2y,
      hy = dz * e2x - dx * e2z,
      hz = dx * e2y - dy * e2x;
    const det = e1x * hx + e1y * hy + e1z * hz;
    if (det === 0) continue;
    const inv = 1 / det;
    const sx = px - coords[a],
      sy = py - coords[a + 1],
      sz = pz - coords[a + 2];
    const u = (sx * hx + sy * hy + sz * hz) * inv;
    if (u < 0 || u > 1) continue;
    const qx = sy * e1z - sz * e1y,
      qy = sz * e1x - sx * e1z,
      qz = sx * e1y - sy * e1x;
    const w = (dx * qx + dy * qy + dz * qz) * inv;
    if (w < 0 || u + w > 1) continue;
    if ((e2x * qx + e2y * qy + e2z * qz) * inv > 0) crossings++;
  }
  return crossings % 2 === 1;
}

const plural = (n: number, one: string, many: string) => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;

const formatVolume = (mm3: number) => `${Math.round(mm3).toLocaleString('en-US')} mm³`;

function describeProblems(m: MeshAnalysis, unorientable: number): string[] {
  const warnings: string[] = [];
  if (m.degenerateFacets + m.zeroAreaFacets === m.facets) {
    warnings.push('Every facet has zero area, so there is no solid shape to print; export the part again.');
    return warnings;
  }
  if (!m.watertight) {
    const parts: string[] = [];
    if (m.openEdges > 0) parts.push(`${plural(m.openEdges, 'edge borders', 'edges border')} only one facet (holes or gaps)`);
    if (m.nonManifoldEdges > 0) parts.push(`${plural(m.nonManifoldEdges, 'edge is', 'edges are')} shared by more than two facets`);
    warnings.push(
      `The mesh is not watertight: ${parts.join(' and ')}. Its volume is unreliable and it may print with gaps; repair the mesh and export it again.`,
    );
  }
  const asWound = `summed as wound in the file it reads ${m.signedVolumeMm3 < 0 ? '−' : ''}${formatVolume(Math.abs(m.signedVolumeMm3))}`;
  if (m.reversedFacets > 0) {
    warnings.push(
      `${plural(m.reversedFacets, 'facet is', 'facets are')} wound backwards against the rest of ${m.shells === 1 ? 'the shell' : 'their shell'}. The volume shown (${formatVolume(m.volumeMm3)}) is that of the mesh with ${m.reversedFacets === 1 ? 'it' : 'them'} flipped; ${asWound}. Fix the facet orientation before exporting.`,
    );
  }
  if (unorientable > 0) {
    warnings.push(
      `The facets cannot be wound consistently (${plural(unorientable, 'edge contradicts', 'edges contradict')} the rest, as on a one-sided surface); the volume is unreliable. Repair the mesh and export it again.`,
    );
  }
  if (m.insideOutShells > 0) {
    if (m.insideOutShells === m.shells) {
      warnings.push('The facets are wound inside out (the enclosed volume comes out negative); flip the normals before exporting.');
    } else {
      warnings.push(
        `${m.insideOutShells} of the ${m.shells} shells ${m.insideOutShells === 1 ? 'is' : 'are'} wound inside out. The volume shown (${formatVolume(m.volumeMm3)}) counts ${m.insideOutShells === 1 ? 'it' : 'them'} as solid; ${asWound}. Flip ${m.insideOutShells === 1 ? 'its' : 'their'} normals before exporting.`,
      );
    }
  }
  if (m.degenerateFacets > 0 || m.zeroAreaFacets > 0) {
    const parts: string[] = [];
    if (m.degenerateFacets > 0) parts.push(`${plural(m.degenerateFacets, 'facet has', 'facets have')} a repeated corner`);
    if (m.zeroAreaFacets > 0) parts.push(`${plural(m.zeroAreaFacets, 'facet has', 'facets have')} three corners in a line`);
    warnings.push(`${parts.join(' and ')}, so zero area; they add nothing to the shape and can upset repair tools.`);
  }
  if (m.shells > 1) {
    warnings.push(`The model is made of ${m.shells} separate shells. That is fine for a kit of parts; if it should print as one piece, join them.`);
  }
  const largest = Math.max(...m.sizeMm);
  if (largest < TINY_PART_MM) {
    warnings.push(
      `The part is only ${formatMm(largest)} mm across at its largest. If it was drawn in inches it needs scaling by 25.4, and if in metres by 1000.`,
    );
  }
  return warnings;
}

function formatMm(mm: number): string {
  return mm >= 0.01 ? mm.toFixed(2) : mm.toPrecision(2);
}

/** Figures for a flat list of triangles: 9 numbers per facet (x, y, z of each corner), in mm unless `unitScale` says otherwise. */
export function analyseTriangles(positions: Float32Array | Float64Array, options: AnalyseOptions = {}): MeshAnalysis {
  if (positions.length % 9 !== 0) {
    throw new MeshError('bad_input', `Expected 9 numbers per triangle but got ${positions.length} numbers.`);
  }
  if (positions.length === 0) throw new MeshError('no_facets', 'The mesh has no facets.');
  const facets = positions.length / 9;
  const acc = new MeshAccumulator(facets);
  const p = positions;
  for (let i = 0; i < p.length; i += 9) {
    acc.addFacet(p[i], p[i + 1], p[i + 2], p[i + 3], p[i + 4], p[i + 5], p[i + 6], p[i + 7], p[i + 8]);
  }
  return acc.finish(options.unitScale ?? 1);
}

/** Reads an STL or 3MF file and analyses it; throws MeshError with a contributor-facing message when it cannot. */
export function analyseModelFile(bytes: Uint8Array, options: AnalyseFileOptions = {}): ModelFileAnalysis {
  return checkPrintableSize(readAndAnalyse(bytes, options));
}

function readAndAnalyse(bytes: Uint8Array, options: AnalyseFileOptions): ModelFileAnalysis {
  const format = options.format ?? (isZip(bytes) ? '3mf' : 'stl');
  if (format === '3mf') {
    const model = read3mf(bytes, { maxUncompressedBytes: options.maxUncompressedBytes, maxTriangles: options.maxTriangles });
    const acc = new MeshAccumulator(model.triangleCount);
    model.emit(acc);
    return { ...acc.finish(model.unitScale), format: '3mf', unitScale: model.unitScale };
  }

  const unitScale = options.drawnInInches ? MM_PER_INCH : 1;
  const stlFormat = detectStlFormat(bytes);
  if (stlFormat === 'stl-binary') {
    const acc = new MeshAccumulator(declaredFacetCount(bytes));
    readBinaryStl(bytes, acc);
    return { ...acc.finish(unitScale), format: stlFormat, unitScale };
  }
  const acc = new MeshAccumulator(bytes.length / 256);
  readAsciiStl(bytes, acc);
  return { ...acc.finish(unitScale), format: stlFormat, unitScale };
}

const sizeText = (mm: number) => (mm < 1e6 ? `${Math.round(mm).toLocaleString('en-US')}` : mm.toPrecision(3));

/** A mesh larger than any printer, or with figures that overflowed, is a units mistake or a forgery. */
export function checkPrintableSize(analysis: ModelFileAnalysis): ModelFileAnalysis {
  const limit = MODEL_LIMITS.maxExtentMm;
  const figures = [...analysis.sizeMm, analysis.volumeMm3, analysis.areaMm2];
  if (figures.some((x) => !Number.isFinite(x))) {
    throw new MeshError('non_finite', 'The mesh is so large that its size, area or volume cannot be computed; the file is broken — export the part again.');
  }
  if (Math.max(...analysis.sizeMm) > limit) {
    const inches = analysis.unitScale === MM_PER_INCH ? ' If it was drawn in millimetres, do not mark it as drawn in inches.' : '';
    throw new MeshError(
      'implausible_size',
      `The part measures ${analysis.sizeMm.map(sizeText).join(' × ')} mm, larger than any printer builds (at most ${limit.toLocaleString('en-US')} mm on a side). Check the units it was exported in.${inches}`,
    );
  }
  return analysis;
}
