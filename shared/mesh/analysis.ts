import { MODEL_LIMITS } from '../uploads';
import { detectStlFormat, declaredFacetCount, nonFiniteFacet, readAsciiStl, readBinaryStl } from './stl';
import { isZip, read3mf } from './threemf';
import {
  type AnalyseFileOptions,
  type AnalyseOptions,
  type FacetSink,
  type MeshAnalysis,
  MeshError,
  type ModelFileAnalysis,
  type Vec3,
} from './types';

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
const MIN_X = 0, MIN_Y = 1, MIN_Z = 2, MAX_X = 3, MAX_Y = 4, MAX_Z = 5, DOUBLE_AREA = 6, SIX_VOLUME = 7;

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
 * Takes facets one at a time and keeps running bounding box, area and signed volume, plus the
 * welded vertex ids each facet uses; finish() then works out edges and shells from the ids.
 */
export class MeshAccumulator implements FacetSink {
  private ids: Uint32Array;
  private degenerate: Uint8Array;
  private facets = 0;
  private degenerateCount = 0;
  // Running figures in a typed array: V8 keeps them as raw doubles there, unlike number fields.
  private readonly sums = new Float64Array([Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity, 0, 0]);
  private readonly welder: VertexWelder;

  constructor(expectedFacets = 1024) {
    const capacity = Math.max(16, Math.ceil(expectedFacets));
    this.ids = new Uint32Array(capacity * 3);
    this.degenerate = new Uint8Array(capacity);
    // A closed mesh has about half as many vertices as facets.
    this.welder = new VertexWelder(capacity * 0.6);
  }

  addFacet(ax: number, ay: number, az: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number): void {
    const f = this.facets;
    if (f === this.degenerate.length) this.grow();

    const ux = bx - ax, uy = by - ay, uz = bz - az;
    const vx = cx - ax, vy = cy - ay, vz = cz - az;
    const nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
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
    if (a === b || b === c || a === c || cross2 <= DEGENERATE_SIN2 * (ux * ux + uy * uy + uz * uz) * (vx * vx + vy * vy + vz * vz)) {
      this.degenerate[f] = 1;
      this.degenerateCount++;
    }
    this.facets = f + 1;
  }

  finish(unitScale = 1): MeshAnalysis {
    if (this.facets === 0) throw new MeshError('no_facets', 'The mesh has no facets.');
    const ids = this.ids.subarray(0, this.facets * 3);
    const degenerate = this.degenerate.subarray(0, this.facets);
    const vertices = this.welder.count;
    const { openEdges, nonManifoldEdges } = countEdgeUse(ids, degenerate, vertices);
    const solidFacets = this.facets - this.degenerateCount;

    const sums = this.sums;
    const s = unitScale;
    const min: Vec3 = [sums[MIN_X] * s, sums[MIN_Y] * s, sums[MIN_Z] * s];
    const max: Vec3 = [sums[MAX_X] * s, sums[MAX_Y] * s, sums[MAX_Z] * s];
    const signedVolumeMm3 = (sums[SIX_VOLUME] / 6) * s * s * s;
    const analysis: MeshAnalysis = {
      // Extents scaled after subtracting, so 1 inch comes out as exactly 25.4 mm.
      sizeMm: [(sums[MAX_X] - sums[MIN_X]) * s, (sums[MAX_Y] - sums[MIN_Y]) * s, (sums[MAX_Z] - sums[MIN_Z]) * s],
      min,
      max,
      volumeMm3: Math.abs(signedVolumeMm3),
      signedVolumeMm3,
      insideOut: signedVolumeMm3 < 0,
      areaMm2: (sums[DOUBLE_AREA] / 2) * s * s,
      facets: this.facets,
      degenerateFacets: this.degenerateCount,
      watertight: solidFacets > 0 && openEdges === 0 && nonManifoldEdges === 0,
      openEdges,
      nonManifoldEdges,
      shells: countShells(ids, degenerate, vertices),
      warnings: [],
    };
    analysis.warnings = describeProblems(analysis);
    return analysis;
  }

  private grow(): void {
    const ids = new Uint32Array(this.ids.length * 2);
    ids.set(this.ids);
    this.ids = ids;
    const degenerate = new Uint8Array(this.degenerate.length * 2);
    degenerate.set(this.degenerate);
    this.degenerate = degenerate;
  }
}

/**
 * Counts how often each edge is used. Instead of hashing edge keys, edges are bucketed by their
 * lower vertex id (a counting sort), so each bucket only holds the few higher ids it joins.
 */
function countEdgeUse(ids: Uint32Array, degenerate: Uint8Array, vertices: number): { openEdges: number; nonManifoldEdges: number } {
  const offsets = new Uint32Array(vertices + 1);
  let halfEdges = 0;
  for (let f = 0, k = 0; f < degenerate.length; f++, k += 3) {
    if (degenerate[f]) continue;
    const a = ids[k], b = ids[k + 1], c = ids[k + 2];
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
  for (let f = 0, k = 0; f < degenerate.length; f++, k += 3) {
    if (degenerate[f]) continue;
    const a = ids[k], b = ids[k + 1], c = ids[k + 2];
    if (a < b) partners[--offsets[a]] = b; else partners[--offsets[b]] = a;
    if (b < c) partners[--offsets[b]] = c; else partners[--offsets[c]] = b;
    if (c < a) partners[--offsets[c]] = a; else partners[--offsets[a]] = c;
  }
  // offsets[v] now marks the start of vertex v's bucket.

  let openEdges = 0;
  let nonManifoldEdges = 0;
  for (let v = 0; v < vertices; v++) {
    const start = offsets[v];
    const stop = offsets[v + 1];
    if (stop - start > 1) sortRange(partners, start, stop);
    for (let i = start; i < stop; ) {
      let j = i + 1;
      while (j < stop && partners[j] === partners[i]) j++;
      if (j - i === 1) openEdges++;
      else if (j - i > 2) nonManifoldEdges++;
      i = j;
    }
  }
  return { openEdges, nonManifoldEdges };
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
function countShells(ids: Uint32Array, degenerate: Uint8Array, vertices: number): number {
  const parent = new Int32Array(vertices).fill(-1); // -1: not used by any solid facet
  for (let f = 0, k = 0; f < degenerate.length; f++, k += 3) {
    if (degenerate[f]) continue;
    const a = ids[k], b = ids[k + 1], c = ids[k + 2];
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

const plural = (n: number, one: string, many: string) => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;

function describeProblems(m: MeshAnalysis): string[] {
  const warnings: string[] = [];
  if (m.degenerateFacets === m.facets) {
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
  if (m.insideOut) {
    warnings.push('The facets are wound inside out (the enclosed volume comes out negative); flip the normals before exporting.');
  }
  if (m.degenerateFacets > 0) {
    warnings.push(
      `${plural(m.degenerateFacets, 'facet has', 'facets have')} zero area (repeated or collinear corners); they add nothing to the shape and can upset repair tools.`,
    );
  }
  if (m.shells > 1) {
    warnings.push(
      `The model is made of ${m.shells} separate shells. That is fine for a kit of parts; if it should print as one piece, join them.`,
    );
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
function checkPrintableSize(analysis: ModelFileAnalysis): ModelFileAnalysis {
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
