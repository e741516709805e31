// JSCAD's 3D booleans can leave T-junctions: a corner of one facet lying on the edge of another,
// so the edge is not shared and the mesh is not watertight. Here every vertex is welded on a fine
// grid and each facet with such a corner on one of its edges is split there.

const GRID_MM = 1e-5;
const ON_EDGE_MM = 2e-5;

export function weldAndSplit(positions: ArrayLike<number>): Float32Array {
  const keyToIndex = new Map<string, number>();
  const xyz: number[] = [];
  const vertexOf = (x: number, y: number, z: number): number => {
    const qx = Math.round(x / GRID_MM);
    const qy = Math.round(y / GRID_MM);
    const qz = Math.round(z / GRID_MM);
    const key = `${qx},${qy},${qz}`;
    let index = keyToIndex.get(key);
    if (index === undefined) {
      index = xyz.length / 3;
      keyToIndex.set(key, index);
      xyz.push(qx * GRID_MM, qy * GRID_MM, qz * GRID_MM);
    }
    return index;
  };
  let tris: number[] = [];
  for (let i = 0; i + 8 < positions.length; i += 9) {
    const a = vertexOf(positions[i], positions[i + 1], positions[i + 2]);
    const b = vertexOf(positions[i + 3], positions[i + 4], positions[i + 5]);
    const c = vertexOf(positions[i + 6], positions[i + 7], positions[i + 8]);
    if (a !== b && b !== c && c !== a) tris.push(a, b, c);
  }

  // Vertices bucketed on a coarse grid to find the ones near an edge.
  const CELL = 2;
  const cells = new Map<string, number[]>();
  const vertexCount = xyz.length / 3;
  for (let v = 0; v < vertexCount; v++) {
    const key = `${Math.floor(xyz[3 * v] / CELL)},${Math.floor(xyz[3 * v + 1] / CELL)},${Math.floor(xyz[3 * v + 2] / CELL)}`;
    const list = cells.get(key);
    if (list) list.push(v);
    else cells.set(key, [v]);
  }

  const onEdge = (a: number, b: number): number[] => {
    const ax = xyz[3 * a], ay = xyz[3 * a + 1], az = xyz[3 * a + 2];
    const dx = xyz[3 * b] - ax, dy = xyz[3 * b + 1] - ay, dz = xyz[3 * b + 2] - az;
    const len2 = dx * dx + dy * dy + dz * dz;
    const found: { v: number; t: number }[] = [];
    const lo = [Math.min(ax, ax + dx), Math.min(ay, ay + dy), Math.min(az, az + dz)].map((n) => Math.floor((n - ON_EDGE_MM) / CELL));
    const hi = [Math.max(ax, ax + dx), Math.max(ay, ay + dy), Math.max(az, az + dz)].map((n) => Math.floor((n + ON_EDGE_MM) / CELL));
    for (let i = lo[0]; i <= hi[0]; i++) for (let j = lo[1]; j <= hi[1]; j++) for (let k = lo[2]; k <= hi[2]; k++) {
      for (const v of cells.get(`${i},${j},${k}`) ?? []) {
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

  for (let pass = 0; pass < 4; pass++) {
    const directed = new Set<string>();
    for (let i = 0; i < tris.length; i += 3) {
      directed.add(`${tris[i]}>${tris[i + 1]}`);
      directed.add(`${tris[i + 1]}>${tris[i + 2]}`);
      directed.add(`${tris[i + 2]}>${tris[i]}`);
    }
    let changed = false;
    const next: number[] = [];
    for (let i = 0; i < tris.length; i += 3) {
      const corners = [tris[i], tris[i + 1], tris[i + 2]];
      let split = false;
      for (let e = 0; e < 3 && !split; e++) {
        const a = corners[e];
        const b = corners[(e + 1) % 3];
        const c = corners[(e + 2) % 3];
        if (directed.has(`${b}>${a}`)) continue;
        const between = onEdge(a, b);
        if (between.length === 0) continue;
        const chain = [a, ...between, b];
        for (let k = 0; k + 1 < chain.length; k++) next.push(chain[k], chain[k + 1], c);
        split = true;
      }
      if (split) changed = true;
      else next.push(...corners);
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
