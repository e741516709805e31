import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { analyseTriangles } from '../../shared/mesh/index';
import { CLEARANCE_HOLE_MM, circleSides, washer } from '../../shared/make/index';

/** Smallest distance of any vertex from the z axis. */
function minRadius(positions: Float32Array): number {
  let r = Infinity;
  for (let i = 0; i < positions.length; i += 3) r = Math.min(r, Math.hypot(positions[i], positions[i + 1]));
  return r;
}

describe('washer · clearance holes', () => {
  it("washer · 1/4-20 normal fit · 0.281 in = 7.1374 mm (ASME B18.2.8, Machinery's Handbook 31st ed. Table 1a)", () => {
    expect(CLEARANCE_HOLE_MM['1/4-20'].normal).toBeCloseTo(0.281 * 25.4, 10);
    expect(CLEARANCE_HOLE_MM['3/8-16'].normal).toBeCloseTo(0.406 * 25.4, 10);
  });

  it('washer · M6 medium · 6.6 mm; M3 fine 3.2, M5 coarse 5.8 (ISO 273, secondary charts)', () => {
    expect(CLEARANCE_HOLE_MM.M6.normal).toBe(6.6);
    expect(CLEARANCE_HOLE_MM.M3.close).toBe(3.2);
    expect(CLEARANCE_HOLE_MM.M5.loose).toBe(5.8);
  });

  it('washer · generated hole · flats of the drawn polygon sit on the table diameter, so the hole is never smaller', () => {
    const part = washer.generate({ screw: 'M6', clearance: 'normal', outerDiameterMm: 14, thicknessMm: 2 });
    const n = circleSides(6.6, 'default');
    // Inradius of a regular n-gon = circumradius · cos(π/n) (elementary geometry).
    expect(2 * minRadius(part.mesh.positions) * Math.cos(Math.PI / n)).toBeCloseTo(6.6, 4);
    expect(part.drawn.notes.join(' ')).toContain('ISO 273');
  });
});

describe('washer · volume', () => {
  for (const resolution of ['default', 'fine'] as const) {
    it(`washer · 1/4-20 normal, 12 × 2 mm, ${resolution} · mesh volume = exact polygon area × t (1e-6) and within 0.5 % of π/4·(D² − d²)·t`, () => {
      const D = 12;
      const d = CLEARANCE_HOLE_MM['1/4-20'].normal;
      const t = 2;
      const part = washer.generate({ screw: '1/4-20', clearance: 'normal', outerDiameterMm: D, thicknessMm: t, resolution });
      const a = analyseTriangles(part.mesh.positions);
      expect(a.watertight).toBe(true);
      expect(a.windingConsistent).toBe(true);
      const nOuter = circleSides(D, resolution);
      const nHole = circleSides(d, resolution);
      // Regular n-gon areas: circumradius R → (n/2)·R²·sin(2π/n); inradius r → n·r²·tan(π/n).
      const outerArea = (nOuter / 2) * (D / 2) ** 2 * Math.sin((2 * Math.PI) / nOuter);
      const holeArea = nHole * (d / 2) ** 2 * Math.tan(Math.PI / nHole);
      expect(Math.abs(a.volumeMm3 - (outerArea - holeArea) * t) / a.volumeMm3).toBeLessThan(1e-6);
      const round = (Math.PI / 4) * (D * D - d * d) * t;
      expect(Math.abs(a.volumeMm3 - round) / round).toBeLessThan(0.005);
    });
  }

  it('washer · counterbore and nut pocket · watertight, one shell, less volume than the plain washer', () => {
    const plain = analyseTriangles(washer.generate({ screw: 'M4', outerDiameterMm: 16, thicknessMm: 5 }).mesh.positions);
    for (const recess of ['counterbore', 'hex'] as const) {
      const a = analyseTriangles(washer.generate({ screw: 'M4', outerDiameterMm: 16, thicknessMm: 5, recess, recessDepthMm: 3 }).mesh.positions);
      expect(a.watertight && a.windingConsistent).toBe(true);
      expect(a.shells).toBe(1);
      expect(a.volumeMm3).toBeLessThan(plain.volumeMm3);
    }
  });
});

describe('washer · parameters', () => {
  it('washer · inches typed as text · "1/2 in" outside diameter is drawn at 12.7 mm (1 in = 25.4 mm exactly)', () => {
    const part = washer.generate({ outerDiameterMm: '1/2 in' });
    expect(part.drawn.parameters.outerDiameterMm).toBe(12.7);
    expect(analyseTriangles(part.mesh.positions).sizeMm[0]).toBeCloseTo(12.7, 3);
  });

  it('washer · outside diameter too small for the hole · per-field message naming the least size', () => {
    try {
      washer.generate({ screw: 'M6', outerDiameterMm: 7 });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ZodError);
      const issue = (error as ZodError).issues[0];
      expect(issue.path).toEqual(['outerDiameterMm']);
      expect(issue.message).toMatch(/at least 8\.6 mm/);
    }
  });

  it('washer · thickness out of range · message with the limit', () => {
    const result = washer.schema.safeParse({ thicknessMm: 100 });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].message).toBe('Thickness can be at most 60 mm.');
  });

  it('washer · calibration · holeMm 0.25 draws the hole 0.25 mm larger and says so', () => {
    const part = washer.generate({ screw: '1/4-20' }, { holeMm: 0.25 });
    const hole = part.drawn.sizes.find((s) => s.label === 'Hole')!;
    expect(hole.drawnMm - hole.nominalMm).toBeCloseTo(0.25, 3);
    const n = circleSides(hole.drawnMm, 'default');
    expect(2 * minRadius(part.mesh.positions) * Math.cos(Math.PI / n)).toBeCloseTo(CLEARANCE_HOLE_MM['1/4-20'].normal + 0.25, 4);
    expect(part.drawn.notes[0]).toBe('Hole drawn at 7.39 mm so it prints at 7.14 mm on your printer.');
  });
});
