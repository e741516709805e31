import jscad from '@jscad/modeling';
import stlSerializer from '@jscad/stl-serializer';
import { Triangle, Vector3 } from 'three';
import { STLLoader } from 'three/examples/jsm/loaders/STLLoader.js';
import { describe, expect, it } from 'vitest';
import { analyseModelFile, analyseTriangles, type ModelFileAnalysis, parseStl } from '../../shared/mesh/index';

// Meshes come from @jscad/modeling (an independent mesher) and are written by @jscad/stl-serializer;
// the expected figures come from analytic formulas and from three.js's STLLoader.

const { primitives, booleans, extrusions } = jscad;
type Geometry = ReturnType<typeof primitives.cube>;

function stl(binary: boolean, ...geometries: Geometry[]): Uint8Array {
  const parts: (ArrayBuffer | string)[] = stlSerializer.serialize({ binary }, ...geometries);
  const chunks = parts.map((p) => (typeof p === 'string' ? new TextEncoder().encode(p) : new Uint8Array(p)));
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let offset = 0;
  for (const chunk of chunks) {
    out.set(chunk, offset);
    offset += chunk.length;
  }
  return out;
}

function threePositions(bytes: Uint8Array): Float32Array {
  const exact = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  return new STLLoader().parse(exact).getAttribute('position').array as Float32Array;
}

/** Volume and area from three's positions using three's own vector maths. */
function threeFigures(positions: Float32Array) {
  const a = new Vector3(),
    b = new Vector3(),
    c = new Vector3();
  let volume = 0;
  let area = 0;
  for (let i = 0; i < positions.length; i += 9) {
    a.fromArray(positions, i);
    b.fromArray(positions, i + 3);
    c.fromArray(positions, i + 6);
    volume += a.dot(new Vector3().crossVectors(b, c)) / 6; // Σ v1·(v2×v3)/6, divergence theorem
    area += new Triangle(a, b, c).getArea();
  }
  const min = [0, 1, 2].map((axis) => Math.min(...positions.filter((_, i) => i % 3 === axis)));
  const max = [0, 1, 2].map((axis) => Math.max(...positions.filter((_, i) => i % 3 === axis)));
  return { facets: positions.length / 9, volume, area, min, max };
}

/** Regular n-gon prism of circumradius r: base area (n/2)·r²·sin(2π/n), side n·2r·sin(π/n)·h (analytic formula). */
function polygonalPrism(r: number, h: number, n: number) {
  const base = (n / 2) * r * r * Math.sin((2 * Math.PI) / n);
  return { volume: base * h, area: 2 * base + n * 2 * r * Math.sin(Math.PI / n) * h };
}

const washerSolid = () =>
  booleans.subtract(primitives.cylinder({ radius: 6, height: 2, segments: 32 }), primitives.cylinder({ radius: 3.3, height: 2, segments: 32 }));

const washerExtruded = () =>
  extrusions.extrudeLinear({ height: 2 }, booleans.subtract(primitives.circle({ radius: 6, segments: 32 }), primitives.circle({ radius: 3.3, segments: 32 })));

const fixtures: Record<string, () => Geometry[]> = {
  cube: () => [primitives.cube({ size: 20 })],
  cylinder: () => [primitives.cylinder({ radius: 5, height: 10, segments: 32 })],
  'washer (3D subtract)': () => [washerSolid()],
  'washer (extruded ring)': () => [washerExtruded()],
  'two cubes': () => [primitives.cube({ size: 10 }), primitives.cube({ size: 10, center: [30, 0, 0] })],
};

describe.each([true, false])('jscad meshes, binary=%s', (binary) => {
  const analyse = (name: string): ModelFileAnalysis => analyseModelFile(stl(binary, ...fixtures[name]()));

  it('analyseStl · binary and ASCII · reads the format it was given', () => {
    expect(analyse('cube').format).toBe(binary ? 'stl-binary' : 'stl-ascii');
  });

  it('analyseStl · a cube of side 20 · size 20³, volume a³ = 8000, area 6a² = 2400 (analytic formula)', () => {
    const r = analyse('cube');
    expect(r.sizeMm).toEqual([20, 20, 20]);
    expect(r.min).toEqual([-10, -10, -10]);
    expect(r.max).toEqual([10, 10, 10]);
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.areaMm2).toBeCloseTo(2400, 9);
    expect(r).toMatchObject({ facets: 12, watertight: true, shells: 1, insideOut: false, degenerateFacets: 0, warnings: [] });
  });

  it('analyseStl · a cylinder r=5 h=10 with 32 segments · matches the polygonal prism formula (analytic formula)', () => {
    const r = analyse('cylinder');
    const prism = polygonalPrism(5, 10, 32);
    // jscad's serializer snaps coordinates to its epsilon, which moves the figures by ~6e-6.
    expect(Math.abs(r.volumeMm3 / prism.volume - 1)).toBeLessThan(1e-4);
    expect(Math.abs(r.areaMm2 / prism.area - 1)).toBeLessThan(1e-4);
    // The 32-gon holds n·sin(2π/n)/(2π) ≈ 0.9936 of the circle's area, so within 1 % of πr²h (analytic formula).
    expect(Math.abs(r.volumeMm3 / (Math.PI * 25 * 10) - 1)).toBeLessThan(0.01);
    expect(r.sizeMm[2]).toBeCloseTo(10, 5);
    expect(r).toMatchObject({ watertight: true, shells: 1, insideOut: false });
  });

  it.each(['washer (3D subtract)', 'washer (extruded ring)'])('%s r=6/3.3 h=2 matches the polygonal annulus formula (analytic formula)', (name) => {
    const r = analyse(name);
    const outer = polygonalPrism(6, 2, 32);
    const inner = polygonalPrism(3.3, 2, 32);
    // Both walls count towards the area, and each cap loses the inner polygon: 2 caps × 2 prisms.
    const innerBase = inner.volume / 2; // h = 2
    const capsAndWalls = outer.area + inner.area - 4 * innerBase;
    // jscad nudges coordinates by its epsilon (~1e-4 mm here) while snapping, hence the looser tolerance.
    expect(Math.abs(r.volumeMm3 / (outer.volume - inner.volume) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(r.areaMm2 / capsAndWalls - 1)).toBeLessThan(1e-3);
    expect(r).toMatchObject({ shells: 1, insideOut: false, degenerateFacets: 0 });
  });

  it('analyseStl · the extruded washer · watertight', () => {
    expect(analyse('washer (extruded ring)').watertight).toBe(true);
  });

  it('analyseStl · the 3D-subtracted washer · not watertight: jscad leaves hairline cracks where it snaps split faces', () => {
    // Cap and wall copies of the rim differ by ~4e-5 mm, so exact welding keeps them apart;
    // the string-keyed reference weld of three's geometry below reaches the same verdict.
    const r = analyse('washer (3D subtract)');
    expect(r.watertight).toBe(false);
    expect(r.openEdges).toBeGreaterThan(0);
    expect(r.warnings.some((w) => w.includes('not watertight'))).toBe(true);
  });

  it('analyseStl · two separate cubes · two shells with twice the volume (analytic formula)', () => {
    const r = analyse('two cubes');
    expect(r.shells).toBe(2);
    expect(r.volumeMm3).toBeCloseTo(2000, 9);
    expect(r.sizeMm).toEqual([40, 10, 10]);
    expect(r.watertight).toBe(true);
    expect(r.warnings.some((w) => w.includes('2 separate shells'))).toBe(true);
  });
});

describe('agreement with three.js STLLoader on the same files', () => {
  describe.each(Object.keys(fixtures))('%s', (name) => {
    it.each([true, false])('agreement with STLLoader · binary=%s · same facet count, bounding box, volume and area', (binary) => {
      const bytes = stl(binary, ...fixtures[name]());
      const ours = analyseModelFile(bytes);
      const three = threeFigures(threePositions(bytes));
      expect(ours.facets).toBe(three.facets);
      // three stores float32; our ASCII path keeps the decimal text in float64.
      const digits = binary ? 12 : 5;
      ours.min.forEach((v, i) => expect(v).toBeCloseTo(three.min[i], digits));
      ours.max.forEach((v, i) => expect(v).toBeCloseTo(three.max[i], digits));
      expect(ours.signedVolumeMm3 / three.volume).toBeCloseTo(1, binary ? 9 : 5);
      expect(ours.areaMm2 / three.area).toBeCloseTo(1, binary ? 9 : 5);
    });
  });

  it('agreement with STLLoader · a string-keyed weld of three’s geometry · agrees on watertightness and shells', () => {
    for (const name of Object.keys(fixtures)) {
      const bytes = stl(true, ...fixtures[name]());
      const positions = threePositions(bytes);
      const ids = new Map<string, number>();
      const vertex = (i: number) => {
        const key = `${positions[i]},${positions[i + 1]},${positions[i + 2]}`;
        if (!ids.has(key)) ids.set(key, ids.size);
        return ids.get(key)!;
      };
      const edges = new Map<string, number>();
      for (let i = 0; i < positions.length; i += 9) {
        const v = [vertex(i), vertex(i + 3), vertex(i + 6)];
        for (let k = 0; k < 3; k++) {
          const [a, b] = [v[k], v[(k + 1) % 3]].sort((x, y) => x - y);
          edges.set(`${a}-${b}`, (edges.get(`${a}-${b}`) ?? 0) + 1);
        }
      }
      const watertight = [...edges.values()].every((n) => n === 2);
      expect(analyseModelFile(bytes).watertight, name).toBe(watertight);
    }
  });
});

describe('orientation, holes, units and headers', () => {
  const cube = () => parseStl(stl(true, primitives.cube({ size: 20 }))).positions;

  it('mesh orientation · reversed winding · reported inside out, the volume still positive', () => {
    const p = cube().slice();
    for (let i = 0; i < p.length; i += 9) {
      for (let k = 0; k < 3; k++) [p[i + 3 + k], p[i + 6 + k]] = [p[i + 6 + k], p[i + 3 + k]];
    }
    const r = analyseTriangles(p);
    expect(r.insideOut).toBe(true);
    expect(r.signedVolumeMm3).toBeCloseTo(-8000, 9); // a³ for a = 20 (analytic formula)
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.watertight).toBe(true);
    expect(r.warnings.some((w) => w.includes('inside out'))).toBe(true);
  });

  it('mesh holes · a cube with one facet removed · not watertight: three edges border a single facet', () => {
    const r = analyseTriangles(cube().subarray(9));
    expect(r.facets).toBe(11);
    expect(r.watertight).toBe(false);
    expect(r.openEdges).toBe(3);
    expect(r.nonManifoldEdges).toBe(0);
    expect(r.warnings[0]).toMatch(/not watertight: 3 edges border only one facet/);
  });

  it('mesh edges · a facet repeated three times · its edges non-manifold', () => {
    const p = cube();
    const extra = new Float32Array(p.length + 18);
    extra.set(p);
    extra.set(p.subarray(0, 9), p.length);
    extra.set(p.subarray(0, 9), p.length + 9);
    const r = analyseTriangles(extra);
    expect(r.watertight).toBe(false);
    expect(r.nonManifoldEdges).toBe(3);
  });

  it('mesh facets · zero-area facets · counted, watertightness kept', () => {
    const p = cube();
    const withSliver = new Float32Array(p.length + 18);
    withSliver.set(p);
    // one facet with a repeated corner, one with three collinear corners along an existing edge
    withSliver.set([10, 10, 10, 10, 10, 10, -10, 10, 10], p.length);
    withSliver.set([-10, -10, -10, 0, -10, -10, 10, -10, -10], p.length + 9);
    const r = analyseTriangles(withSliver);
    expect(r.degenerateFacets).toBe(1);
    expect(r.zeroAreaFacets).toBe(1);
    expect(r.watertight).toBe(true);
    expect(r.shells).toBe(1);
    expect(r.warnings.some((w) => w.includes('1 facet has a repeated corner and 1 facet has three corners in a line, so zero area'))).toBe(true);
  });

  it('mesh units · drawnInInches on a 1 × 1 × 1 cube · exactly 25.4 mm sides (1 in = 25.4 mm exactly, NIST SP 811 Appendix B)', () => {
    const bytes = stl(true, primitives.cube({ size: 1 }));
    const plain = analyseModelFile(bytes);
    expect(plain.unitScale).toBe(1);
    expect(plain.warnings.some((w) => w.includes('inches'))).toBe(true);
    const r = analyseModelFile(bytes, { drawnInInches: true });
    expect(r.unitScale).toBe(25.4);
    expect(r.sizeMm).toEqual([25.4, 25.4, 25.4]);
    expect(r.volumeMm3).toBeCloseTo(25.4 ** 3, 9); // 16 387.064 mm³ per cubic inch (same NIST factor, cubed)
    expect(r.areaMm2).toBeCloseTo(6 * 25.4 ** 2, 9);
    expect(r.warnings).toEqual([]);
  });

  it('STL headers · a binary STL whose 80-byte header begins with "solid" · still read as binary (size rule)', () => {
    const bytes = stl(true, primitives.cube({ size: 20 }));
    bytes.set(new TextEncoder().encode('solid this header lies about being text'.padEnd(80, ' ')));
    const r = analyseModelFile(bytes);
    expect(r.format).toBe('stl-binary');
    expect(r.facets).toBe(12);
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
  });

  it('STL headers · ASCII with several solids, odd spacing, upper case and scientific notation · read', () => {
    const facet = (z: string) => `  FACET NORMAL 0 0 1\n\touter   loop\n vertex 0 0 ${z}\nvertex 1E1 0 ${z}\n  vertex 0 1.0e+1 ${z}\n endloop\nendfacet\n`;
    const text = `solid one\n${facet('0')}endsolid one\n\n  solid two\n${facet('2.5e0')}endsolid\n`;
    const r = analyseModelFile(new TextEncoder().encode(text));
    expect(r.format).toBe('stl-ascii');
    expect(r.facets).toBe(2);
    expect(r.sizeMm).toEqual([10, 10, 2.5]);
    expect(r.areaMm2).toBeCloseTo(100, 12); // two right triangles with legs 10: 2 × 10·10/2 (analytic formula)
  });

  it('mesh welding · vertices equal as float32, −0 and +0 · welded', () => {
    const p = new Float64Array(cube());
    let zeros = 0;
    for (let i = 0; i < p.length; i++) {
      if (p[i] === 10 && i % 2 === 0) p[i] = 10 + 1e-12; // rounds to the same float32 as 10
      if (i % 3 === 0) p[i] += 10; // x now runs 0…20
      if (p[i] === 0 && zeros++ % 2 === 0) p[i] = -0;
    }
    const r = analyseTriangles(p);
    expect(zeros).toBeGreaterThan(2);
    expect(r.watertight).toBe(true);
    expect(r.shells).toBe(1);
  });
});
