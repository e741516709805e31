// A fluted column for the estimate benchmark: a closed surface of revolution, `around` × `rows`
// quads on the side (2 facets each) plus two fans for the caps; wound outward.
export function flutedColumn(around: number, rows: number, heightMm = 100, radiusMm = 30): Float32Array {
  const radius = (theta: number, z: number) => radiusMm + 4 * Math.sin(6 * theta) + 2 * Math.sin(z / 9);
  const point = (i: number, j: number): [number, number, number] => {
    const theta = (2 * Math.PI * (i % around)) / around;
    const z = (heightMm * j) / rows;
    const r = radius(theta, z);
    return [r * Math.cos(theta), r * Math.sin(theta), z];
  };
  const facets = 2 * around * rows + 2 * around;
  const out = new Float32Array(facets * 9);
  let o = 0;
  const put = (...corners: [number, number, number][]) => {
    for (const c of corners) {
      out[o++] = c[0];
      out[o++] = c[1];
      out[o++] = c[2];
    }
  };
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < around; i++) {
      const a = point(i, j),
        b = point(i + 1, j),
        c = point(i + 1, j + 1),
        d = point(i, j + 1);
      put(a, b, c);
      put(a, c, d);
    }
  }
  const bottom: [number, number, number] = [0, 0, 0],
    top: [number, number, number] = [0, 0, heightMm];
  for (let i = 0; i < around; i++) {
    put(bottom, point(i + 1, 0), point(i, 0));
    put(top, point(i, rows), point(i + 1, rows));
  }
  return out;
}
