import { unzipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { analyseModelFile, analyseTriangles } from '../../shared/mesh/index';
import {
  correctionFromGauge,
  correctionsSchema,
  GENERATOR_KINDS,
  GENERATORS,
  gaugeSteps,
  rodClamp,
  to3mf,
  toStl,
  type GeneratorKind,
} from '../../shared/make/index';

// Soundness is judged by shared/mesh (edge-sharing watertightness, orientable winding, shells), and the
// file outputs by reading them back through the same analysis: JSCAD's own STL and 3MF serializers
// write them, so a mistake in our triangles shows up as a difference.

/** mulberry32: a small seeded generator, so every run draws the same parameter sets. */
function seeded(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Rng = () => number;
const pick = <T>(rng: Rng, items: readonly T[]): T => items[Math.floor(rng() * items.length)];
const between = (rng: Rng, lo: number, hi: number, step = 0.1) => Math.round((lo + rng() * (hi - lo)) / step) * step;

const SAMPLERS: Record<GeneratorKind, (rng: Rng) => Record<string, unknown>> = {
  washer: (rng) => ({
    screw: pick(rng, ['1/4-20', '3/8-16', 'M3', 'M4', 'M5', 'M6']),
    clearance: pick(rng, ['close', 'normal', 'loose']),
    outerDiameterMm: between(rng, 6, 40),
    thicknessMm: between(rng, 0.5, 12),
    recess: pick(rng, ['none', 'none', 'counterbore', 'hex']),
    recessDepthMm: between(rng, 0.4, 6),
  }),
  'gear-ring': (rng) => ({
    module: pick(rng, [0.5, 0.6, 0.8, 1.0]),
    // Barrels up to 45 mm keep this run quick; large barrels are measured in make-gear-ring.test.ts.
    barrelDiameterMm: between(rng, 20, 45),
    widthMm: between(rng, 3, 14),
    wallMm: between(rng, 0.8, 4),
    fit: pick(rng, ['press', 'press', 'clamp']),
    interferenceMm: between(rng, 0, 0.6, 0.05),
  }),
  'rod-clamp': (rng) => ({
    rodMm: pick(rng, [15, 19]),
    layout: pick(rng, ['single', 'pair']),
    centresMm: pick(rng, [60, 100, 104]),
    clearanceMm: between(rng, 0, 0.8, 0.05),
    mount: pick(rng, ['1/4-20', '3/8-16']),
    lengthMm: between(rng, 15, 40, 1),
    wallMm: between(rng, 3, 8, 0.5),
  }),
  'cable-clip': (rng) => ({
    cableMm: between(rng, 2, 16),
    secondCableMm: rng() < 0.5 ? 0 : between(rng, 2, 16),
    mount: pick(rng, ['rod15', 'rod19', 'screw']),
    widthMm: between(rng, 11, 25),
    wallMm: between(rng, 1.2, 3),
  }),
  'shoe-foot': (rng) => ({
    mount: pick(rng, ['1/4-20', '3/8-16', 'rod15', 'rod19']),
    playMm: between(rng, 0, 0.6, 0.05),
    baseSizeMm: between(rng, 20, 40, 1),
    baseHeightMm: between(rng, 4, 14, 0.5),
  }),
  'fit-gauge': (rng) => ({
    mode: pick(rng, ['bores', 'pegs']),
    nominalMm: between(rng, 3, 20),
    stepMm: pick(rng, [0.05, 0.1, 0.2]),
    stepsBelow: Math.floor(rng() * 4),
    stepsAbove: 1 + Math.floor(rng() * 6),
    thicknessMm: between(rng, 2, 5, 0.5),
    pegHeightMm: between(rng, 3, 8, 0.5),
  }),
};

/** 50 parameter sets the schema accepts, drawn from a fixed seed (redraws any the schema refuses). */
function validSets(kind: GeneratorKind, count = 50): Record<string, unknown>[] {
  const rng = seeded(0x5eed + GENERATOR_KINDS.indexOf(kind));
  const sets: Record<string, unknown>[] = [];
  for (let tries = 0; sets.length < count && tries < count * 20; tries++) {
    const params = { ...SAMPLERS[kind](rng), resolution: 'default' };
    if (GENERATORS[kind].schema.safeParse(params).success) sets.push(params);
  }
  return sets;
}

describe('generators · registry', () => {
  it('generators · six kinds · each with title, summary, zod schema, defaults the schema accepts and form hints for every key', () => {
    expect(Object.keys(GENERATORS).sort()).toEqual([...GENERATOR_KINDS].sort());
    for (const kind of GENERATOR_KINDS) {
      const g = GENERATORS[kind];
      expect(g.kind).toBe(kind);
      expect(g.title.length).toBeGreaterThan(3);
      const parsed = g.schema.parse(g.defaults) as Record<string, unknown>;
      expect(g.schema.parse({})).toEqual(parsed);
      expect(g.fields.map((f) => f.key).sort()).toEqual(Object.keys(parsed).sort());
    }
  });

  it('generators · same parameters twice · the same triangles and the same file bytes (deterministic)', { timeout: 120_000 }, () => {
    for (const kind of GENERATOR_KINDS) {
      const a = GENERATORS[kind].generate(GENERATORS[kind].defaults);
      const b = GENERATORS[kind].generate(GENERATORS[kind].defaults);
      expect(Buffer.from(a.mesh.positions.buffer).equals(Buffer.from(b.mesh.positions.buffer))).toBe(true);
      expect(Buffer.from(toStl(a.mesh)).equals(Buffer.from(toStl(b.mesh)))).toBe(true);
      expect(Buffer.from(to3mf(a.mesh)).equals(Buffer.from(to3mf(b.mesh)))).toBe(true);
    }
  });
});

describe.each(GENERATOR_KINDS)('generators · %s · 50 seeded random parameter sets', (kind) => {
  it(
    'generators · every registered generator · watertight, consistent winding, intended shells, positive volume, within bounds; STL and 3MF read back the same',
    { timeout: 600_000 },
    () => {
      const sets = validSets(kind);
      expect(sets).toHaveLength(50);
      for (const params of sets) {
        const part = GENERATORS[kind].generate(params);
        const a = analyseTriangles(part.mesh.positions);
        const where = `${kind} ${JSON.stringify(params)}`;
        expect(a.watertight, where).toBe(true);
        expect(a.windingConsistent, where).toBe(true);
        expect(a.insideOut, where).toBe(false);
        expect(a.shells, where).toBe(part.shells);
        expect(a.degenerateFacets + a.zeroAreaFacets, where).toBe(0);
        expect(a.volumeMm3, where).toBeGreaterThan(0);
        expect(a.signedVolumeMm3, where).toBeCloseTo(a.volumeMm3, 6);
        a.sizeMm.forEach((s, i) => expect(s, where).toBeLessThanOrEqual(part.boundsMm[i] + 1e-3));
        const stl = analyseModelFile(toStl(part.mesh));
        const threeMfBytes = to3mf(part.mesh);
        const threeMf = analyseModelFile(threeMfBytes);
        expect(threeMf.format).toBe('3mf');
        expect(new TextDecoder().decode(unzipSync(threeMfBytes)['3D/3dmodel.model'])).toMatch(/<model[^>]*unit="millimeter"/);
        expect(threeMf.unitScale).toBe(1);
        for (const file of [stl, threeMf]) {
          expect(file.watertight, where).toBe(true);
          expect(file.windingConsistent, where).toBe(true);
          expect(file.shells, where).toBe(a.shells);
          // Both serializers snap corners to a grid of about 1e-5 of the part's size before writing.
          expect(Math.abs(file.volumeMm3 - a.volumeMm3) / a.volumeMm3, where).toBeLessThan(1e-4);
          file.sizeMm.forEach((s, i) => expect(Math.abs(s - a.sizeMm[i]), where).toBeLessThan(1e-2));
        }
        // The two files carry the same snapped triangles: the same figures.
        expect(threeMf.facets, where).toBe(stl.facets);
        expect(Math.abs(threeMf.volumeMm3 - stl.volumeMm3) / stl.volumeMm3, where).toBeLessThan(1e-6);
        threeMf.sizeMm.forEach((s, i) => expect(Math.abs(s - stl.sizeMm[i]), where).toBeLessThan(1e-4));
      }
    },
  );
});

describe('calibration · a recorded gauge step', () => {
  it('calibration · bores gauge round 15 mm · step 4 (15.2 mm) fits a 15 mm rod → holes +0.2 mm → rod clamp bore drawn 0.2 mm larger', () => {
    const gauge = { mode: 'bores', nominalMm: 15, stepMm: 0.1, stepsBelow: 2, stepsAbove: 6 } as const;
    expect(gaugeSteps(gauge).map((s) => s.diameterMm)).toEqual([14.8, 14.9, 15, 15.1, 15.2, 15.3, 15.4, 15.5, 15.6]);
    const correction = correctionFromGauge(gauge, 4);
    expect(correction).toEqual({ holeMm: 0.2 });
    const plain = rodClamp.generate({ rodMm: 15, clearanceMm: 0.2 });
    const corrected = rodClamp.generate({ rodMm: 15, clearanceMm: 0.2 }, correction);
    expect((corrected.drawn.parameters.boreMm as number) - (plain.drawn.parameters.boreMm as number)).toBeCloseTo(0.2, 9);
    expect(corrected.drawn.notes).toContain('Rod bore drawn at 15.4 mm so it prints at 15.2 mm on your printer.');
  });

  it('calibration · pegs gauge · the fitting peg gives an outer-size correction, and the gauge itself ignores corrections', () => {
    expect(correctionFromGauge({ mode: 'pegs', nominalMm: 10, stepsBelow: 3, stepsAbove: 3 }, 1)).toEqual({ outerMm: -0.2 });
    const a = GENERATORS['fit-gauge'].generate({});
    const b = GENERATORS['fit-gauge'].generate({}, { holeMm: 0.3 });
    expect(Buffer.from(a.mesh.positions.buffer).equals(Buffer.from(b.mesh.positions.buffer))).toBe(true);
    expect(() => correctionFromGauge({}, 9)).toThrow(/not on this gauge/);
  });

  it('calibration · corrections schema · accepts ±1 mm, refuses more with a message', () => {
    expect(correctionsSchema.parse({ holeMm: 0.25 })).toEqual({ holeMm: 0.25 });
    expect(correctionsSchema.safeParse({ outerMm: -1.5 }).error?.issues[0].message).toBe('Outer-size correction must be between -1 and 1 mm.');
  });
});
