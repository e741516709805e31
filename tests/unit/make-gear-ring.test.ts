import { describe, expect, it } from 'vitest';
import { analyseTriangles } from '../../shared/mesh/index';
import { circleSides, gearDiameters, gearRing, toothCountFor } from '../../shared/make/index';

// Relations checked (ISO 53 basic rack; ISO 21771 / any gear handbook for an unshifted spur gear):
// pitch diameter d = m·z, tip diameter da = m·(z + 2) (addendum 1.0·m), root diameter df = m·(z − 2.5)
// (dedendum 1.25·m), tooth thickness on the pitch circle s = π·m/2, so a tooth spans π/(2z) either side
// of its centre line there.

/** Vertices of the top face (z = top) as [radius, angle]. */
function topVertices(positions: Float32Array, top: number): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < positions.length; i += 3) {
    if (Math.abs(positions[i + 2] - top) < 1e-4) out.push([Math.hypot(positions[i], positions[i + 1]), Math.atan2(positions[i + 1], positions[i])]);
  }
  return out;
}

/** Radius where the first tooth (centred at half a pitch) is exactly π/(2z) wide each side: the pitch circle. */
function measuredPitchRadius(vertices: [number, number][], teeth: number, rootR: number, tipR: number): number {
  const centre = Math.PI / teeth;
  const flank = vertices
    .filter(([r, a]) => r > rootR + 1e-3 && r < tipR - 1e-3 && a < centre && a > centre - Math.PI / teeth)
    .map(([r, a]) => [r, centre - a] as [number, number])
    .sort((p, q) => p[0] - q[0]);
  const target = Math.PI / (2 * teeth);
  for (let i = 0; i + 1 < flank.length; i++) {
    const [r0, h0] = flank[i];
    const [r1, h1] = flank[i + 1];
    if ((h0 - target) * (h1 - target) <= 0) return r0 + ((target - h0) / (h1 - h0)) * (r1 - r0);
  }
  throw new Error('pitch circle not crossed by the flank');
}

describe('gear ring · tooth count', () => {
  it('gear ring · module 0.8, 1.5 mm wall · 80 mm barrel → 107 teeth, 82 mm → 109 (root m·(z − 2.5) ≥ barrel + 2·wall, fewest teeth)', () => {
    // By hand: (80 + 3)/0.8 + 2.5 = 106.25 → 107; (82 + 3)/0.8 + 2.5 = 108.75 → 109.
    expect(toothCountFor(0.8, 80, 1.5)).toBe(107);
    expect(toothCountFor(0.8, 82, 1.5)).toBe(109);
    for (const [m, barrel, wall] of [
      [0.8, 80, 1.5],
      [0.8, 82, 1.5],
      [0.5, 25, 1],
      [1, 120, 2],
      [0.6, 63.3, 0.8],
    ] as const) {
      const z = toothCountFor(m, barrel, wall);
      expect(m * (z - 2.5)).toBeGreaterThanOrEqual(barrel + 2 * wall - 1e-9);
      expect(m * (z - 1 - 2.5)).toBeLessThan(barrel + 2 * wall);
    }
  });

  it('gear ring · generated ring · echoes the tooth count and the three diameters', () => {
    const part = gearRing.generate({ barrelDiameterMm: 82 });
    expect(part.drawn.parameters).toMatchObject({ teeth: 109, pitchDiameterMm: 87.2, outsideDiameterMm: 88.8, rootDiameterMm: 85.2 });
    expect(part.loadBearing).toBe(false);
  });
});

describe('gear ring · diameters measured from the mesh', () => {
  for (const [m, barrel, resolution] of [
    [0.8, 82, 'default'],
    [0.8, 80, 'fine'],
    [0.5, 30, 'default'],
    [1.0, 20, 'default'],
  ] as const) {
    it(`gear ring · module ${m}, ${barrel} mm barrel, ${resolution} · pitch, outside and root diameters within the facet tolerance`, () => {
      const part = gearRing.generate({ module: m, barrelDiameterMm: barrel, widthMm: 6, resolution });
      const z = part.drawn.parameters.teeth as number;
      const expected = gearDiameters(m, z);
      expect(expected.pitchMm).toBeCloseTo(m * z, 10);
      const a = analyseTriangles(part.mesh.positions);
      expect(a.watertight && a.windingConsistent).toBe(true);
      const vertices = topVertices(part.mesh.positions, 6);
      const boreR = (part.drawn.parameters.boreMm as number) / 2 / Math.cos(Math.PI / circleSides(part.drawn.parameters.boreMm as number, resolution));
      const outer = vertices.filter(([r]) => r > boreR + 1e-3).map(([r]) => r);
      // Facet tolerance: tips and roots are vertices on their circles; the involute between its
      // sample points is a chord, which strays well under the 0.02 mm chord error of the resolution.
      const tol = 0.02;
      expect(Math.abs(2 * Math.max(...outer) - m * (z + 2))).toBeLessThan(tol);
      expect(Math.abs(2 * Math.min(...outer) - m * (z - 2.5))).toBeLessThan(tol);
      const pitchR = measuredPitchRadius(vertices, z, (m * (z - 2.5)) / 2, (m * (z + 2)) / 2);
      expect(Math.abs(2 * pitchR - m * z)).toBeLessThan(tol);
    });
  }
});

describe('gear ring · fit', () => {
  it('gear ring · press fit · bore drawn 0.2 mm under the barrel; with a 0.15 mm hole correction 0.05 mm under', () => {
    const plain = gearRing.generate({ barrelDiameterMm: 82, interferenceMm: 0.2 });
    expect(plain.drawn.parameters.boreMm).toBeCloseTo(81.8, 6);
    const corrected = gearRing.generate({ barrelDiameterMm: 82, interferenceMm: 0.2 }, { holeMm: 0.15 });
    expect(corrected.drawn.parameters.boreMm).toBeCloseTo(81.95, 6);
    expect(corrected.drawn.notes).toContain('Bore drawn at 81.95 mm so it prints at 81.8 mm on your printer.');
    // Bore measured from the mesh: inradius of its polygon = vertex radius · cos(π/n).
    const n = circleSides(81.95, 'default');
    let minR = Infinity;
    const p = corrected.mesh.positions;
    for (let i = 0; i < p.length; i += 3) minR = Math.min(minR, Math.hypot(p[i], p[i + 1]));
    expect(2 * minR * Math.cos(Math.PI / n)).toBeCloseTo(81.95, 3);
  });

  it('gear ring · M3 clamp · watertight single shell with collar and lugs, within its stated bounds', () => {
    const part = gearRing.generate({ barrelDiameterMm: 82, fit: 'clamp' });
    const a = analyseTriangles(part.mesh.positions);
    expect(a.watertight && a.windingConsistent && !a.insideOut).toBe(true);
    expect(a.shells).toBe(1);
    a.sizeMm.forEach((s, i) => expect(s).toBeLessThanOrEqual(part.boundsMm[i] + 1e-3));
    expect(part.drawn.notes.join(' ')).toMatch(/M3 screw/);
  });

  it('gear ring · module outside the list · clear message', () => {
    const result = gearRing.schema.safeParse({ module: 0.7 });
    expect(result.error?.issues[0].message).toBe('Module: choose 0.5, 0.6, 0.8 or 1.0.');
  });
});
