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
    this.xyz.push(qx * GRID_MM, qy * GRID_MM, qz * GRID_MM);
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
    const ax = xyz[3 * a], ay = xyz[3 * a + 1], az = xyz[3 * a + 2];
    const dx = xyz[3 * b] - ax, dy = xyz[3 * b + 1] - ay, dz = xyz[3 * b + 2] - az;
    const len2 = dx * dx + dy * dy + dz * dz;
    const found: { v: number; t: number }[] = [];
    const lo = [Math.min(ax, ax + dx), Math.min(ay, ay + dy), Math.min(az, az + dz)].map((n) => Math.floor((n - ON_EDGE_MM) / CELL_MM));
    const hi = [Math.max(ax, ax + dx), Math.max(ay, ay + dy), Math.max(az, az + dz)].map((n) => Math.floor((n + ON_EDGE_MM) / CELL_MM));
    for (let i = lo[0]; i <= hi[0]; i++) for (let j = lo[1]; j <= hi[1]; j++) for (let k = lo[2]; k <= hi[2]; k++) {
      for (const v of grid.get(`${i},${j},${k}`) ?? []) {
        if (v === a || v === b) continue;
        const px = xyz[3 * v] - ax, py = xyz[3 * v + 1] - ay, pz = xyz[3 * v + 2] - az;
        const t = (px * dx + py * dy + pz * dz) / len2;
        if (t <= 0 || t >= 1) continue;
        const ex = px - t * dx, ey = py - t * dy, ez = pz - t * dz;
        if (ex * ex + ey * ey + ez * ez <= ON_EDGE_MM * ON_EDGE_MM) found.push({ v, t });
      }
    }
    return found.sort((p, q) => p.t - q.t).map((f) => f.v);
  };

  for (let pass = 0; pass < 6; pass++) {
    const directed = new Set<number>();
    for (let i = 0; i < tris.length; i += 3) {
      directed.add(edgeKey(tris[i], tris[i + 1]));
      directed.add(edgeKey(tris[i + 1], tris[i + 2]));
      directed.add(edgeKey(tris[i + 2], tris[i]));
    }
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

  const out = new Float32Array(tris.length * 3);
  for (let i = 0; i < tris.length; i++) {
    out[3 * i] = xyz[3 * tris[i]];
    out[3 * i + 1] = xyz[3 * tris[i] + 1];
    out[3 * i + 2] = xyz[3 * tris[i] + 2];
  }
  return out;
}
