import { describe, expect, it } from 'vitest';
import { analyseModelFile, analyseTriangles } from '../../shared/mesh/index';

// Meshes are built here facet by facet, so every expected figure is a hand computation written
// beside the check (box volume a·b·c, polygonal annulus N/2·sin(2π/N)·(R² − r²)·h).

type Point = readonly [number, number, number];

/** Axis-aligned box from `o` with sides a, b, c; 12 facets wound outward (counter-clockwise seen from outside). */
function box(a: number, b: number, c: number, o: Point = [0, 0, 0]): number[] {
  const v = (x: number, y: number, z: number) => [o[0] + x * a, o[1] + y * b, o[2] + z * c];
  const quad = (p: number[], q: number[], r: number[], s: number[]) => [...p, ...q, ...r, ...p, ...r, ...s];
  return [
    ...quad(v(0, 0, 0), v(0, 1, 0), v(1, 1, 0), v(1, 0, 0)), // bottom, facing −z
    ...quad(v(0, 0, 1), v(1, 0, 1), v(1, 1, 1), v(0, 1, 1)), // top, facing +z (facets 2 and 3)
    ...quad(v(0, 0, 0), v(1, 0, 0), v(1, 0, 1), v(0, 0, 1)), // front, facing −y
    ...quad(v(0, 1, 0), v(0, 1, 1), v(1, 1, 1), v(1, 1, 0)), // back, facing +y
    ...quad(v(0, 0, 0), v(0, 0, 1), v(0, 1, 1), v(0, 1, 0)), // left, facing −x
    ...quad(v(1, 0, 0), v(1, 1, 0), v(1, 1, 1), v(1, 0, 1)), // right, facing +x
  ];
}

/** Reverses the winding of the given facets (swaps their second and third corners). */
function flip(positions: number[], ...facets: number[]): number[] {
  const p = [...positions];
  for (const f of facets) {
    for (let k = 0; k < 3; k++) [p[f * 9 + 3 + k], p[f * 9 + 6 + k]] = [p[f * 9 + 6 + k], p[f * 9 + 3 + k]];
  }
  return p;
}

const all = (positions: number[]) => Array.from({ length: positions.length / 9 }, (_, f) => f);

function asciiStl(positions: number[], lineEnd: string): string {
  const lines = ['solid cube'];
  for (let i = 0; i < positions.length; i += 9) {
    lines.push('facet normal 0 0 0', 'outer loop');
    for (let k = 0; k < 9; k += 3) lines.push(`vertex ${positions[i + k]} ${positions[i + k + 1]} ${positions[i + k + 2]}`);
    lines.push('endloop', 'endfacet');
  }
  lines.push('endsolid cube');
  return lines.join(lineEnd) + lineEnd;
}

/**
 * Flat washer: N segments, outer radius R, hole radius r, height h. The ring closes with its own
 * copy of the angle-0 corners, computed as trigonometry gives them: y = −1.5e-15 instead of 0.
 */
function washer(R: number, r: number, h: number, N: number, seamY = -1.5e-15): number[] {
  const at = (radius: number, i: number, z: number) =>
    i === N ? [radius, seamY, z] : [radius * Math.cos((2 * Math.PI * i) / N), radius * Math.sin((2 * Math.PI * i) / N), z];
  const quad = (p: number[], q: number[], s: number[], t: number[]) => [...p, ...q, ...s, ...p, ...s, ...t];
  const out: number[] = [];
  for (let i = 0; i < N; i++) {
    const j = i + 1;
    out.push(...quad(at(R, i, 0), at(R, j, 0), at(R, j, h), at(R, i, h))); // outer wall, facing out
    out.push(...quad(at(r, i, 0), at(r, i, h), at(r, j, h), at(r, j, 0))); // hole wall, facing the axis
    out.push(...quad(at(r, i, h), at(R, i, h), at(R, j, h), at(r, j, h))); // top, facing +z
    out.push(...quad(at(r, i, 0), at(r, j, 0), at(R, j, 0), at(R, i, 0))); // bottom, facing −z
  }
  return out;
}

describe('mesh soundness · winding', () => {
  it('mesh soundness · cube with one top facet wound backwards · warned, repaired volume a³ = 20³ = 8,000 mm³', () => {
    const r = analyseTriangles(new Float64Array(flip(box(20, 20, 20), 2)));
    expect(r.windingConsistent).toBe(false);
    expect(r.reversedFacets).toBe(1);
    expect(r.misorientedEdges).toBe(3); // the flipped triangle's three edges
    expect(r.watertight).toBe(true);
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.volumeRepaired).toBe(true);
    // As wound, the flipped facet counts negative: a facet in the plane z = 20 adds z·area/3 = 20·200/3,
    // so the sum is 8000 − 2·(20·200/3) = 16000/3 ≈ 5,333 mm³, the audit's figure.
    expect(r.signedVolumeMm3).toBeCloseTo(16000 / 3, 6);
    expect(r.warnings[0]).toMatch(
      /^1 facet is wound backwards .* \(8,000 mm³\) is that of the mesh with it flipped; summed as wound in the file it reads 5,333 mm³/,
    );
    expect(r.insideOut).toBe(false);
  });

  it('mesh soundness · the same cube placed 100 mm up · still 8,000 mm³ and no inside-out hint', () => {
    const r = analyseTriangles(new Float64Array(flip(box(20, 20, 20, [0, 0, 100]), 2)));
    expect(r.volumeMm3).toBeCloseTo(8000, 6); // a³, whatever the placement
    expect(r.reversedFacets).toBe(1);
    expect(r.insideOut).toBe(false);
    expect(r.warnings.some((w) => w.includes('inside out'))).toBe(false);
  });

  it('mesh soundness · three facets wound backwards · counted as three', () => {
    const r = analyseTriangles(new Float64Array(flip(box(20, 20, 20), 2, 5, 9)));
    expect(r.reversedFacets).toBe(3);
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.warnings[0]).toMatch(/^3 facets are wound backwards/);
  });

  it('mesh soundness · a cube and a separate inside-out cube · warned, repaired volume 20³ + 10³ = 9,000 mm³', () => {
    const inverted = flip(box(10, 10, 10, [50, 0, 0]), ...all(box(10, 10, 10)));
    const r = analyseTriangles(new Float64Array([...box(20, 20, 20), ...inverted]));
    expect(r.shells).toBe(2);
    expect(r.windingConsistent).toBe(true); // each shell is consistent in itself
    expect(r.insideOutShells).toBe(1);
    expect(r.insideOut).toBe(true);
    expect(r.signedVolumeMm3).toBeCloseTo(7000, 9); // 20³ − 10³ as wound
    expect(r.volumeMm3).toBeCloseTo(9000, 9);
    expect(r.volumeRepaired).toBe(true);
    expect(r.warnings[0]).toMatch(
      /^1 of the 2 shells is wound inside out\. The volume shown \(9,000 mm³\) counts it as solid; summed as wound in the file it reads 7,000 mm³/,
    );
  });

  it('mesh soundness · a cube with an inward-wound cube inside it · a cavity, 20³ − 10³ = 7,000 mm³, not inside out', () => {
    const cavity = flip(box(10, 10, 10, [5, 5, 5]), ...all(box(10, 10, 10)));
    const r = analyseTriangles(new Float64Array([...box(20, 20, 20), ...cavity]));
    expect(r.insideOut).toBe(false);
    expect(r.volumeMm3).toBeCloseTo(7000, 9);
    expect(r.volumeRepaired).toBe(false);
  });

  it('mesh soundness · a wholly inside-out cube · inside out, volume 8,000 mm³ and the flip-the-normals hint', () => {
    const r = analyseTriangles(new Float64Array(flip(box(20, 20, 20), ...all(box(20, 20, 20)))));
    expect(r).toMatchObject({ insideOut: true, insideOutShells: 1, reversedFacets: 0, windingConsistent: true, volumeRepaired: false });
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.warnings).toContain('The facets are wound inside out (the enclosed volume comes out negative); flip the normals before exporting.');
  });

  it('mesh soundness · a sound cube · consistent, nothing repaired, nothing welded', () => {
    const r = analyseTriangles(new Float64Array(box(20, 20, 20)));
    expect(r).toMatchObject({
      windingConsistent: true,
      reversedFacets: 0,
      misorientedEdges: 0,
      insideOutShells: 0,
      volumeRepaired: false,
      weldedVertices: 0,
      vertices: 8,
      warnings: [],
    });
  });
});

describe('mesh soundness · welding', () => {
  // Polygonal annulus: N/2·sin(2π/N)·(R² − r²)·h (analytic formula for a regular N-gon ring).
  const R = 12,
    r = 6.5,
    h = 3,
    N = 48;
  const annulus = (N / 2) * Math.sin((2 * Math.PI) / N) * (R * R - r * r) * h;

  it('mesh soundness · washer whose ring closes at y = −1.5e-15 · watertight after welding, 4 vertices merged', () => {
    const a = analyseTriangles(new Float64Array(washer(R, r, h, N)));
    expect(a.watertight).toBe(true);
    expect(a.weldedVertices).toBe(4); // the seam's outer and inner corners, top and bottom
    expect(a.vertices).toBe(4 * N);
    expect(a.openEdges).toBe(0);
    expect(a.weldToleranceMm).toBeCloseTo(1e-6 * Math.hypot(2 * R, 2 * R, h), 15); // a millionth of the diagonal
    expect(a.volumeMm3 / annulus).toBeCloseTo(1, 9);
    expect(a.warnings.some((w) => w.includes('not watertight'))).toBe(false);
  });

  it('mesh soundness · the same washer written as binary STL (float32) · watertight after welding', () => {
    const p = washer(R, r, h, N);
    const facets = p.length / 9;
    const bytes = new Uint8Array(84 + 50 * facets);
    const view = new DataView(bytes.buffer);
    view.setUint32(80, facets, true);
    for (let f = 0; f < facets; f++) for (let k = 0; k < 9; k++) view.setFloat32(84 + 50 * f + 12 + 4 * k, p[f * 9 + k], true);
    const a = analyseModelFile(bytes);
    expect(a).toMatchObject({ watertight: true, weldedVertices: 4 });
  });

  it('mesh soundness · a real gap of 0.01 mm · stays open, far above the tolerance', () => {
    const a = analyseTriangles(new Float64Array(washer(R, r, h, N, -0.01)));
    expect(a.watertight).toBe(false);
    expect(a.openEdges).toBeGreaterThan(0);
    expect(a.weldedVertices).toBe(0);
  });
});

describe('mesh soundness · ASCII STL line endings', () => {
  const cube = box(20, 20, 20, [-10, -10, -10]);
  it.each([
    ['LF', '\n'],
    ['CR LF', '\r\n'],
    ['CR only', '\r'],
    ['one line (spaces only)', ' '],
    ['tabs and blank lines', '\t\n\n\t'],
  ])('%s · 12 facets, 20³ = 8,000 mm³', (_name, lineEnd) => {
    const r = analyseModelFile(new TextEncoder().encode(asciiStl(cube, lineEnd)));
    expect(r.format).toBe('stl-ascii');
    expect(r.facets).toBe(12);
    expect(r.volumeMm3).toBeCloseTo(8000, 9);
    expect(r.watertight).toBe(true);
  });

  it('mesh soundness · one line, several solids with names · every facet read', () => {
    const one = asciiStl(cube, ' ');
    const text = `${one}${one.replace('solid cube', 'solid second part').replace('endsolid cube', 'endsolid second part')}`;
    expect(analyseModelFile(new TextEncoder().encode(text)).facets).toBe(24);
  });

  it('mesh soundness · CR-only syntax error · names the right line', () => {
    const text = asciiStl(cube, '\r').replace('outer loop\rvertex', 'outer loop\rvortex');
    expect(() => analyseModelFile(new TextEncoder().encode(text))).toThrow(/ASCII STL line 4: expected "vertex x y z" but found "vortex"/);
  });
});
