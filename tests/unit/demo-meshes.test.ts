import { describe, expect, it } from 'vitest';
import { analyseModelFile } from '@shared/mesh';
import { box, clip, ring, toBinaryStl } from '../../server/demo/demo-meshes';

// The demo shapes must be closed and wound outward, or the demo shelf would show warnings.
describe('demo meshes · closed prisms', () => {
  it('demo meshes · a box · the analytic volume x·y·z', () => {
    const a = analyseModelFile(new Uint8Array(toBinaryStl(box(100, 70, 6), 'box')));
    expect(a).toMatchObject({ watertight: true, insideOut: false, shells: 1 });
    expect(a.volumeMm3).toBeCloseTo(42000, 1);
  });

  it('demo meshes · a ring · the volume of its polygonal annulus: n/2·sin(2π/n)·(R²−r²)·h (analytic formula)', () => {
    const n = 64;
    const a = analyseModelFile(new Uint8Array(toBinaryStl(ring(14, 7.6, 22, n), 'ring')));
    expect(a).toMatchObject({ watertight: true, insideOut: false, shells: 1 });
    const expected = (n / 2) * Math.sin((2 * Math.PI) / n) * (14 ** 2 - 7.6 ** 2) * 22;
    expect(a.volumeMm3).toBeCloseTo(expected, 0);
    expect(a.sizeMm[2]).toBeCloseTo(22, 5);
  });

  it('demo meshes · an open clip · closed by its end caps', () => {
    const a = analyseModelFile(new Uint8Array(toBinaryStl(clip(11, 7.6, 10, 70), 'clip')));
    expect(a).toMatchObject({ watertight: true, insideOut: false, shells: 1 });
  });
});
