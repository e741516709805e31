// Solids put together from pieces (stacked prisms, glued blocks, JSCAD's 3D booleans) can leave
// T-junctions: a corner of one facet lying on the edge of another, so that edge is not shared and
// the mesh is not watertight. Here every vertex is welded on a fine grid and each facet with such a
// corner on an unshared edge is split there.

const GRID_MM = 1e-5;
const ON_EDGE_MM = 2e-5;
const CELL_MM = 2;

/** Integer-keyed vertex table (open addressing), much faster than string keys. */
class VertexTable {
  private slots: Int32Array;
  readonly xyz: number[] = [];
  readonly q: number[] = [];
  constructor(expected: number) {
    let size = 1024;
    while (size < expected * 2) size *= 2;
    this.slots = new Int32Array(size).fill(-1);
  }

  get count(): number {
    return this.q.length / 3;
  }

  index(x: number, y: number, z: number): number {
    const qx = Math.round(x / GRID_MM);
    const qy = Math.round(y / GRID_MM);
    const qz = Math.round(z / GRID_MM);
    const mask = this.slots.length - 1;
    let h = (Math.imul(qx, 73856093) ^ Math.imul(qy, 19349663) ^ Math.imul(qz, 83492791)) & mask;
    for (;;) {
      const v = this.slots[h];
      if (v === -1) break;
      if (this.q[3 * v] === qx && this.q[3 * v + 1] === qy && this.q[3 * v + 2] === qz) return v;
      h = (h + 1) & mask;
    }
    const v = this.count;
    this.slots[h] = v;
    this.q.push(qx, qy, qz);
    this.xyz.push(Math.fround(qx * GRID_MM), Math.fround(qy * GRID_MM), Math.fround(qz * GRID_MM));
    if (this.count * 2 > this.slots.length) this.grow();
    return v;
  }

  private grow(): void {
    const next = new Int32Array(this.slots.length * 2).fill(-1);
    const mask = next.length - 1;
    for (let v = 0; v < this.count; v++) {
      let h = (Math.imul(this.q[3 * v], 73856093) ^ Math.imul(this.q[3 * v + 1], 19349663) ^ Math.imul(this.q[3 * v + 2], 83492791)) & mask;
      while (next[h] !== -1) h = (h + 1) & mask;
      next[h] = v;
    }
    this.slots = next;
  }
}

export function weldAndSplit(positions: ArrayLike<number>): Float32Array {
  const table = new VertexTable(positions.length / 6);
  let tris: number[] = [];
  for (let i = 0; i + 8 < positions.length; i += 9) {
    const a = table.index(positions[i], positions[i + 1], positions[i + 2]);
    const b = table.index(positions[i + 3], positions[i + 4], positions[i + 5]);
    const c = table.index(positions[i + 6], positions[i + 7], positions[i + 8]);
    if (a !== b && b !== c && c !== a) tris.push(a, b, c);
  }
  const xyz = table.xyz;
  // Facets with three corners in a line, or within the on-edge tolerance of one (earcut leaves them
  // where corners line up), enclose nothing; dropping them leaves T-junctions that the splitting below closes.
  const solid: number[] = [];
  for (let i = 0; i < tris.length; i += 3) {
    const [a, b, c] = [tris[i], tris[i + 1], tris[i + 2]];
    const ux = xyz[3 * b] - xyz[3 * a],
      uy = xyz[3 * b + 1] - xyz[3 * a + 1],
      uz = xyz[3 * b + 2] - xyz[3 * a + 2];
    const vx = xyz[3 * c] - xyz[3 * a],
      vy = xyz[3 * c + 1] - xyz[3 * a + 1],
      vz = xyz[3 * c + 2] - xyz[3 * a + 2];
    const cx = uy * vz - uz * vy,
      cy = uz * vx - ux * vz,
      cz = ux * vy - uy * vx;
    const cross2 = cx * cx + cy * cy + cz * cz;
    const wx = vx - ux,
      wy = vy - uy,
      wz = vz - uz;
    const longest2 = Math.max(ux * ux + uy * uy + uz * uz, vx * vx + vy * vy + vz * vz, wx * wx + wy * wy + wz * wz);
    // Height = 2·area / longest edge; below the on-edge tolerance the middle corner lies on that edge.
    if (cross2 > ON_EDGE_MM * ON_EDGE_MM * longest2 * 0.25) solid.push(a, b, c);
  }
  tris = solid;
  const vertexCount = table.count;
  const edgeKey = (a: number, b: number) => a * vertexCount + b;

  let cells: Map<string, number[]> | null = null;
  const cellsOf = () => {
    if (cells) return cells;
    cells = new Map();
    for (let v = 0; v < vertexCount; v++) {
      const key = `${Math.floor(xyz[3 * v] / CELL_MM)},${Math.floor(xyz[3 * v + 1] / CELL_MM)},${Math.floor(xyz[3 * v + 2] / CELL_MM)}`;
      const list = cells.get(key);
      if (list) list.push(v);
      else cells.set(key, [v]);
    }
    return cells;
  };

  const onEdge = (a: number, b: number): number[] => {
    const grid = cellsOf();
    const ax = xyz[3 * a],
      ay = xyz[3 * a + 1],
      az = xyz[3 * a + 2];
    const dx = xyz[3 * b] - ax,
      dy = xyz[3 * b + 1] - ay,
      dz = xyz[3 * b + 2] - az;
    const len2 = dx * dx + dy * dy + dz * dz;
    const found: { v: number; t: number }[] = [];
    const lo = [Math.min(ax, ax + dx), Math.min(ay, ay + dy), Math.min(az, az + dz)].map((n) => Math.floor((n - ON_EDGE_MM) / CELL_MM));
    const hi = [Math.max(ax, ax + dx), Math.max(ay, ay + dy), Math.max(az, az + dz)].map((n) => Math.floor((n + ON_EDGE_MM) / CELL_MM));
    for (let i = lo[0]; i <= hi[0]; i++)
      for (let j = lo[1]; j <= hi[1]; j++)
        for (let k = lo[2]; k <= hi[2]; k++) {
          for (const v of grid.get(`${i},${j},${k}`) ?? []) {
            if (v === a || v === b) continue;
            const px = xyz[3 * v] - ax,
              py = xyz[3 * v + 1] - ay,
              pz = xyz[3 * v + 2] - az;
            const t = (px * dx + py * dy + pz * dz) / len2;
            if (t <= 0 || t >= 1) continue;
            const ex = px - t * dx,
              ey = py - t * dy,
              ez = pz - t * dz;
            if (ex * ex + ey * ey + ez * ez <= ON_EDGE_MM * ON_EDGE_MM) found.push({ v, t });
          }
        }
    return found.sort((p, q) => p.t - q.t).map((f) => f.v);
  };

  for (let pass = 0; pass < 6; pass++) {
    // Directed edges as sorted numbers: an edge is shared when its reverse is among them.
    const keys = new Float64Array(tris.length);
    for (let i = 0; i < tris.length; i += 3) {
      keys[i] = edgeKey(tris[i], tris[i + 1]);
      keys[i + 1] = edgeKey(tris[i + 1], tris[i + 2]);
      keys[i + 2] = edgeKey(tris[i + 2], tris[i]);
    }
    const sorted = keys.slice().sort();
    const directed = {
      has(key: number): boolean {
        let lo = 0;
        let hi = sorted.length - 1;
        while (lo <= hi) {
          const mid = (lo + hi) >> 1;
          const v = sorted[mid];
          if (v === key) return true;
          if (v < key) lo = mid + 1;
          else hi = mid - 1;
        }
        return false;
      },
    };
    let open = false;
    for (let i = 0; i < tris.length && !open; i += 3) {
      open = !directed.has(edgeKey(tris[i + 1], tris[i])) || !directed.has(edgeKey(tris[i + 2], tris[i + 1])) || !directed.has(edgeKey(tris[i], tris[i + 2]));
    }
    if (!open) break;
    let changed = false;
    const next: number[] = [];
    for (let i = 0; i < tris.length; i += 3) {
      let split = false;
      for (let e = 0; e < 3 && !split; e++) {
        const a = tris[i + e];
        const b = tris[i + ((e + 1) % 3)];
        if (directed.has(edgeKey(b, a))) continue;
        const between = onEdge(a, b);
        if (between.length === 0) continue;
        const c = tris[i + ((e + 2) % 3)];
        const chain = [a, ...between, b];
        for (let k = 0; k + 1 < chain.length; k++) next.push(chain[k], chain[k + 1], c);
        split = true;
      }
      if (split) changed = true;
      else next.push(tris[i], tris[i + 1], tris[i + 2]);
    }
    tris = next;
    if (!changed) break;
  }

  tris = flipSlivers(tris, xyz);

  const out = new Float32Array(tris.length * 3);
  for (let i = 0; i < tris.length; i++) {
    out[3 * i] = xyz[3 * tris[i]];
    out[3 * i + 1] = xyz[3 * tris[i] + 1];
    out[3 * i + 2] = xyz[3 * tris[i] + 2];
  }
  return out;
}

/**
 * The file serializers snap every corner to a grid of 1e-5 of the part's mean size; a sliver thinner
 * than a few grid steps could collapse to zero area there and open the mesh. Such slivers (earcut
 * leaves them between far-apart corners) get their longest edge flipped with the coplanar
 * neighbour's when that makes both facets fatter.
 */
function flipSlivers(input: number[], xyz: number[]): number[] {
  const tris = input.slice();
  const count = tris.length / 3;
  if (count === 0) return tris;
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < xyz.length; i += 3)
    for (let k = 0; k < 3; k++) {
      lo[k] = Math.min(lo[k], xyz[i + k]);
      hi[k] = Math.max(hi[k], xyz[i + k]);
    }
  const snapGrid = (1e-5 * (hi[0] - lo[0] + hi[1] - lo[1] + hi[2] - lo[2])) / 3;
  const minHeight = 4 * snapGrid;
  /** Smallest height of triangle t, without allocating. */
  const heightOf = (a: number, b: number, c: number) => {
    const ux = xyz[3 * b] - xyz[3 * a],
      uy = xyz[3 * b + 1] - xyz[3 * a + 1],
      uz = xyz[3 * b + 2] - xyz[3 * a + 2];
    const vx = xyz[3 * c] - xyz[3 * a],
      vy = xyz[3 * c + 1] - xyz[3 * a + 1],
      vz = xyz[3 * c + 2] - xyz[3 * a + 2];
    const wx = vx - ux,
      wy = vy - uy,
      wz = vz - uz;
    const cx = uy * vz - uz * vy,
      cy = uz * vx - ux * vz,
      cz = ux * vy - uy * vx;
    const longest2 = Math.max(ux * ux + uy * uy + uz * uz, vx * vx + vy * vy + vz * vz, wx * wx + wy * wy + wz * wz);
    return Math.sqrt((cx * cx + cy * cy + cz * cz) / longest2);
  };
  let thin = false;
  for (let t = 0; t < count && !thin; t++) thin = heightOf(tris[3 * t], tris[3 * t + 1], tris[3 * t + 2]) < minHeight;
  if (!thin) return tris;
  const P = (v: number) => [xyz[3 * v], xyz[3 * v + 1], xyz[3 * v + 2]];
  const sub = (a: number[], b: number[]) => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
  const cross = (a: number[], b: number[]) => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  const dot = (a: number[], b: number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
  const len = (a: number[]) => Math.sqrt(dot(a, a));
  /** Smallest height of a triangle and its normal (unnormalised). */
  const shape = (a: number, b: number, c: number) => {
    const pa = P(a),
      pb = P(b),
      pc = P(c);
    return { height: heightOf(a, b, c), n: cross(sub(pb, pa), sub(pc, pa)) };
  };
  const vertexCount = xyz.length / 3;
  const edgeOwner = new Map<number, number>();
  const own = (t: number) => {
    for (let e = 0; e < 3; e++) edgeOwner.set(tris[3 * t + e] * vertexCount + tris[3 * t + ((e + 1) % 3)], t);
  };
  for (let t = 0; t < count; t++) own(t);
  let candidates: number[] = [];
  for (let t = 0; t < count; t++) if (heightOf(tris[3 * t], tris[3 * t + 1], tris[3 * t + 2]) < minHeight) candidates.push(t);
  for (let pass = 0; pass < 20 && candidates.length > 0; pass++) {
    const next: number[] = [];
    for (const t of candidates) {
      if (heightOf(tris[3 * t], tris[3 * t + 1], tris[3 * t + 2]) >= minHeight) continue;
      const v = [tris[3 * t], tris[3 * t + 1], tris[3 * t + 2]];
      const mine = shape(v[0], v[1], v[2]);
      // The longest edge (a, b) and the corner c opposite it.
      let best = 0;
      let bestLen = -1;
      for (let e = 0; e < 3; e++) {
        const l = len(sub(P(v[(e + 1) % 3]), P(v[e])));
        if (l > bestLen) {
          bestLen = l;
          best = e;
        }
      }
      const a = v[best],
        b = v[(best + 1) % 3],
        c = v[(best + 2) % 3];
      const u = edgeOwner.get(b * vertexCount + a);
      if (u === undefined) continue;
      const w = [tris[3 * u], tris[3 * u + 1], tris[3 * u + 2]];
      const d = w.find((x) => x !== a && x !== b)!;
      const other = shape(w[0], w[1], w[2]);
      const n1 = mine.n,
        n2 = other.n;
      if (len(cross(n1, n2)) > 1e-9 * len(n1) * len(n2) || dot(n1, n2) <= 0) continue;
      if (edgeOwner.has(c * vertexCount + d) || edgeOwner.has(d * vertexCount + c)) continue;
      const first = shape(a, d, c);
      const second = shape(d, b, c);
      if (dot(first.n, n1) <= 0 || dot(second.n, n1) <= 0) continue;
      if (Math.min(first.height, second.height) <= Math.min(mine.height, other.height)) continue;
      for (const x of [t, u]) for (let e = 0; e < 3; e++) edgeOwner.delete(tris[3 * x + e] * vertexCount + tris[3 * x + ((e + 1) % 3)]);
      tris[3 * t] = a;
      tris[3 * t + 1] = d;
      tris[3 * t + 2] = c;
      tris[3 * u] = d;
      tris[3 * u + 1] = b;
      tris[3 * u + 2] = c;
      own(t);
      own(u);
      next.push(t, u);
    }
    candidates = next;
  }
  return tris;
}
