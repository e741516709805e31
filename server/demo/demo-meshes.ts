// Simple closed meshes for the demo parts, written as binary STL (80-byte header, uint32 count,
// 50 bytes per facet). Every shape is a prism of a 2D outline, wound outward, so it is watertight.

type P2 = [number, number];
type Tri = [number, number, number, number, number, number, number, number, number];

function prismBetweenLoops(outer: P2[], inner: P2[] | null, h: number, closed = true): Tri[] {
  const tris: Tri[] = [];
  const n = outer.length;
  const wall = (a: P2, b: P2, outward: boolean) => {
    const [p, q] = outward ? [a, b] : [b, a];
    tris.push([p[0], p[1], 0, q[0], q[1], 0, q[0], q[1], h], [p[0], p[1], 0, q[0], q[1], h, p[0], p[1], h]);
  };
  const segments = closed ? n : n - 1;
  for (let i = 0; i < segments; i++) {
    const j = (i + 1) % n;
    wall(outer[i], outer[j], true);
    if (inner) wall(inner[i], inner[j], false);
    const a = outer[i];
    const b = outer[j];
    if (inner) {
      const c = inner[j];
      const d = inner[i];
      // bottom faces down, top faces up
      tris.push([a[0], a[1], 0, c[0], c[1], 0, b[0], b[1], 0], [a[0], a[1], 0, d[0], d[1], 0, c[0], c[1], 0]);
      tris.push([a[0], a[1], h, b[0], b[1], h, c[0], c[1], h], [a[0], a[1], h, c[0], c[1], h, d[0], d[1], h]);
    }
  }
  if (inner && !closed) {
    // end caps of an open ring (a clip)
    wall(inner[0], outer[0], true);
    wall(outer[n - 1], inner[n - 1], true);
  }
  if (!inner) {
    const [cx, cy] = outer.reduce(([x, y], p) => [x + p[0] / n, y + p[1] / n], [0, 0]);
    for (let i = 0; i < n; i++) {
      const a = outer[i];
      const b = outer[(i + 1) % n];
      tris.push([cx, cy, 0, b[0], b[1], 0, a[0], a[1], 0], [cx, cy, h, a[0], a[1], h, b[0], b[1], h]);
    }
  }
  return tris;
}

function circle(r: number, n: number, from = 0, to = 2 * Math.PI, includeEnd = false): P2[] {
  const count = includeEnd ? n + 1 : n;
  return Array.from({ length: count }, (_, i) => {
    const t = from + ((to - from) * i) / n;
    return [r * Math.cos(t), r * Math.sin(t)] as P2;
  });
}

/** A box x × y × z with one corner at the origin. */
export function box(x: number, y: number, z: number): Tri[] {
  return prismBetweenLoops(
    [
      [0, 0],
      [x, 0],
      [x, y],
      [0, y],
    ],
    null,
    z,
  );
}

/** A ring (rod clamp, gear blank): outer and inner radius, height. */
export function ring(rOuter: number, rInner: number, h: number, segments = 64): Tri[] {
  return prismBetweenLoops(circle(rOuter, segments), circle(rInner, segments), h);
}

/** An open ring, e.g. a snap-on cable clip, from `gapDeg / 2` to `360 - gapDeg / 2`. */
export function clip(rOuter: number, rInner: number, h: number, gapDeg: number, segments = 48): Tri[] {
  const half = (gapDeg / 2) * (Math.PI / 180);
  return prismBetweenLoops(circle(rOuter, segments, half, 2 * Math.PI - half, true), circle(rInner, segments, half, 2 * Math.PI - half, true), h, false);
}

export function toBinaryStl(tris: Tri[], name: string): Buffer {
  const buf = Buffer.alloc(84 + 50 * tris.length);
  buf.write(`Rigshelf demo: ${name}`.slice(0, 80), 0, 'latin1');
  buf.writeUInt32LE(tris.length, 80);
  tris.forEach((t, i) => t.forEach((v, j) => buf.writeFloatLE(v, 84 + 50 * i + 12 + 4 * j)));
  return buf;
}
