import { describe, expect, it } from 'vitest';
import {
  DEFAULT_ACCELERATION_MM_S2,
  LINE_WIDTH_PER_NOZZLE,
  estimatePrint,
  trapezoidTimeS,
  filamentLengthM,
  fitOnBed,
  statedPose,
  spoolsNeeded,
  type PartGeometry,
  type PrintSettings,
  type Size3,
} from '@shared/estimate';
import { MM_PER_INCH, inchesToMm } from '@shared/units';

const cube20: PartGeometry = { volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20] };
const pla: PrintSettings = { material: 'PLA', nozzleMm: 0.4, layerMm: 0.2, walls: 2, topBottomLayers: 4, infillPct: 20 };

describe('estimatePrint', () => {
  it('estimatePrint · a solid 20 mm PLA cube · weighs 9.92 g', () => {
    // Trade reference: PLA 1.24 g/cm³ (UL Prospector, ISO 1183); 8 cm³ × 1.24 g/cm³ = 9.92 g.
    const estimate = estimatePrint(cube20, { ...pla, infillPct: 100 });
    expect(estimate.volumeMm3).toBeCloseTo(8000, 9);
    expect(estimate.massG).toBeCloseTo(9.92, 9);
  });

  it('estimatePrint · a kg of PLA · about 335.3 m of 1.75 mm and 126.4 m of 2.85 mm filament', () => {
    // Trade reference: L = m / (ρ·π·(d/2)²) with ρ = 1.24 g/cm³; the ~330 m spool is common practice.
    expect(filamentLengthM(1000, 1.75, 1.24)).toBeCloseTo(335.3, 1);
    expect(filamentLengthM(1000, 2.85, 1.24)).toBeCloseTo(126.4, 1);
    const kilo: PartGeometry = { volumeMm3: 1_000_000 / 1.24, areaMm2: 60_000, sizeMm: [100, 100, 80.645] };
    const estimate = estimatePrint(kilo, { ...pla, infillPct: 100 });
    expect(estimate.massG).toBeCloseTo(1000, 6);
    expect(estimate.lengthM['1.75']).toBeCloseTo(335.3, 1);
    expect(estimate.lengthM['2.85']).toBeCloseTo(126.4, 1);
  });

  it('quick estimate · 20 mm cube, 2 walls, 4 top/bottom, 20 % · walls, skins and infill worked by hand', () => {
    // Line width 0.4 × 1.125 = 0.45 mm (common practice); d = 2 × 0.45 = 0.9 mm.
    // Prism of the mean cross-section 8000 / 20 = 400 mm², outline (2400 − 2·400) / 20 = 80 mm.
    // Inset area 400 − 80·0.9 + 4·0.9² = 331.24 mm² (= 18.2², a square inset by 0.9 on each side).
    // Walls (400 − 331.24) × 0.2 × 100 layers = 1375.2 mm³; skins 331.24 × 0.2 × 8 layers = 529.984 mm³;
    // infill 0.2 × 331.24 × 0.2 × 92 layers = 1218.9632 mm³; total 3124.1472 mm³ → × 1.24 g/cm³ = 3.874 g.
    expect(LINE_WIDTH_PER_NOZZLE).toBe(1.125);
    const estimate = estimatePrint(cube20, pla);
    expect(estimate.partsMm3.walls).toBeCloseTo(1375.2, 6);
    expect(estimate.partsMm3.skins).toBeCloseTo(529.984, 6);
    expect(estimate.partsMm3.infill).toBeCloseTo(1218.9632, 6);
    expect(estimate.massG).toBeCloseTo(3.1241472 * 1.24, 9);
    expect(estimate.cost).toBeCloseTo((estimate.massG / 1000) * 20, 9); // default 20 per kg
    expect(estimate.method).toBe('figures');
    expect(estimate.assumptions.join(' ')).toMatch(/nozzle × 1\.125 \(common practice\)/);
    expect(estimate.assumptions.join(' ')).toMatch(/trapezoidal profile/);
    expect(estimate.assumptions.join(' ')).toMatch(/Electricity not included/);
  });

  it('estimatePrint · watts and a price per kWh given · electricity added', () => {
    const plain = estimatePrint(cube20, pla);
    const estimate = estimatePrint(cube20, { ...pla, printerWatts: 120, pricePerKwh: 0.3 });
    // kWh = W × h / 1000.
    expect(estimate.cost).toBeCloseTo(plain.cost + ((120 * (plain.timeMin / 60)) / 1000) * 0.3, 9);
    expect(estimate.assumptions.at(-1)).toMatch(/^Electricity: 120 W/);
  });

  it('quick estimate · flat plate 100 × 40 × 3 mm, 2 walls, 4 top/bottom, 0 % infill · about 9 g, not the solid 14.9 g', () => {
    // Inset (100 − 1.8)(40 − 1.8) = 3751.24 mm²; walls (4000 − 3751.24) × 3 = 746.28 mm³;
    // skins 3751.24 × 0.2 × 8 = 6001.98 mm³; no infill → 6748.26 mm³ × 1.24 = 8.368 g
    // (the audit's "about 9 g"; solid would be 12,000 mm³ = 14.88 g).
    const plate: PartGeometry = { volumeMm3: 12_000, areaMm2: 2 * (4000 + 300 + 120), sizeMm: [100, 40, 3] };
    const estimate = estimatePrint(plate, { ...pla, infillPct: 0 });
    expect(estimate.massG).toBeCloseTo(6.74826 * 1.24, 4);
    expect(estimate.massG).toBeGreaterThan(8);
    expect(estimate.massG).toBeLessThan(10);
    // Infill now matters on a thin plate: 15 layers − 8 skin layers leave 7 sparse ones.
    expect(estimatePrint(plate, { ...pla, infillPct: 50 }).massG).toBeGreaterThan(estimate.massG + 1);
  });

  it('trapezoidTimeS · long and short moves · s/v + v/a, or 2√(s/a) when v is never reached (constant-acceleration kinematics)', () => {
    // v = 50 mm/s, a = 1000 mm/s²: full speed needs v²/a = 2.5 mm.
    expect(trapezoidTimeS(20, 50, 1000)).toBeCloseTo(20 / 50 + 50 / 1000, 12);
    expect(trapezoidTimeS(1, 50, 1000)).toBeCloseTo(2 * Math.sqrt(1 / 1000), 12);
    expect(trapezoidTimeS(2.5, 50, 1000)).toBeCloseTo(0.1, 12); // both formulas meet at s = v²/a
    expect(trapezoidTimeS(0, 50, 1000)).toBe(0);
    expect(DEFAULT_ACCELERATION_MM_S2).toBe(1000);
  });

  it('estimatePrint · the hollow tube · never charged more than its solid ring', () => {
    // Tube 20 mm outside, 16 mm inside, 100 mm tall: cross-section π(10² − 8²) = 113.097 mm².
    const annulus = Math.PI * (100 - 64);
    const area = 2 * Math.PI * 10 * 100 + 2 * Math.PI * 8 * 100 + 2 * annulus;
    const tube: PartGeometry = { volumeMm3: annulus * 100, areaMm2: area, sizeMm: [20, 20, 100] };
    const estimate = estimatePrint(tube, { ...pla, walls: 1, infillPct: 0 });
    expect(estimate.volumeMm3).toBeLessThanOrEqual(annulus * 100);
  });

  it('estimatePrint · any settings · never above the solid volume', () => {
    const thinPlate: PartGeometry = { volumeMm3: 100 * 100 * 1, areaMm2: 2 * 100 * 100 + 400, sizeMm: [100, 100, 1] };
    expect(estimatePrint(thinPlate, { ...pla, walls: 4, topBottomLayers: 5 }).volumeMm3).toBe(10_000);
  });

  const shapes: PartGeometry[] = [
    cube20,
    { volumeMm3: 100 * 40 * 3, areaMm2: 2 * (100 * 40 + 100 * 3 + 40 * 3), sizeMm: [100, 40, 3] },
    { volumeMm3: 11_309.7, areaMm2: 11_535.2, sizeMm: [20, 20, 100] },
  ];

  it('estimatePrint · more infill · never lighter', () => {
    for (const shape of shapes) {
      let previous = -Infinity;
      for (let infillPct = 0; infillPct <= 100; infillPct += 5) {
        const { massG } = estimatePrint(shape, { ...pla, infillPct });
        expect(massG).toBeGreaterThanOrEqual(previous);
        previous = massG;
      }
    }
  });

  it('estimatePrint · more walls or top and bottom layers; faster speeds · never lighter; never slower', () => {
    for (const shape of shapes) {
      let previous = -Infinity;
      for (let walls = 0; walls <= 6; walls++) {
        const { massG } = estimatePrint(shape, { ...pla, walls });
        expect(massG).toBeGreaterThanOrEqual(previous - 1e-9);
        previous = massG;
      }
      previous = -Infinity;
      for (let topBottomLayers = 0; topBottomLayers <= 10; topBottomLayers++) {
        const { massG } = estimatePrint(shape, { ...pla, topBottomLayers });
        expect(massG).toBeGreaterThanOrEqual(previous - 1e-9);
        previous = massG;
      }
      let slowest = Infinity;
      for (const speedMmS of [20, 40, 60, 100, 200, 400]) {
        const { timeMin } = estimatePrint(shape, { ...pla, speedMmS });
        expect(timeMin).toBeLessThanOrEqual(slowest + 1e-9);
        slowest = timeMin;
      }
    }
  });

  it('estimatePrint · a bigger nozzle at equal speed and layer height · never slower', () => {
    for (const shape of shapes) {
      for (const infillPct of [0, 15, 40, 100]) {
        let previous = Infinity;
        for (const nozzleMm of [0.25, 0.3, 0.4, 0.5, 0.6, 0.8, 1.0]) {
          const { timeMin } = estimatePrint(shape, { ...pla, infillPct, nozzleMm, layerMm: 0.2 });
          expect(timeMin).toBeLessThanOrEqual(previous + 1e-9);
          previous = timeMin;
        }
      }
    }
  });

  it('estimatePrint · impossible settings · rejected', () => {
    expect(() => estimatePrint(cube20, { ...pla, layerMm: 0 })).toThrow(RangeError);
    expect(() => estimatePrint(cube20, { ...pla, infillPct: 120 })).toThrow(RangeError);
    expect(() => estimatePrint({ ...cube20, volumeMm3: -1 }, pla)).toThrow(RangeError);
  });
});

describe('spoolsNeeded', () => {
  it('spoolsNeeded · part of a spool · rounded up to whole spools', () => {
    expect(spoolsNeeded(0)).toBe(0);
    expect(spoolsNeeded(1)).toBe(1);
    expect(spoolsNeeded(1000)).toBe(1);
    expect(spoolsNeeded(1000.5)).toBe(2);
    expect(spoolsNeeded(2500, 750)).toBe(4);
    expect(() => spoolsNeeded(10, 0)).toThrow(RangeError);
  });

  it('spoolsNeeded · a sum of decimals a hair over a whole spool · one spool, like print days', () => {
    const grams = ((0.1 + 0.2) * 1000) / 0.3; // 1000 exactly on paper, 1000.0000000000002 in binary
    expect(grams).toBeGreaterThan(1000);
    expect(spoolsNeeded(grams)).toBe(1);
    expect(spoolsNeeded(1000.001)).toBe(2);
  });
});

/** Brute force: does a p × q rectangle fit an a × b one at some angle? Returns the best slack in mm. */
function sweepSlack(p: number, q: number, a: number, b: number, steps = 100_000): number {
  let best = -Infinity;
  for (let i = 0; i <= steps; i++) {
    const angle = (i / steps) * (Math.PI / 2);
    const width = p * Math.cos(angle) + q * Math.sin(angle);
    const depth = p * Math.sin(angle) + q * Math.cos(angle);
    best = Math.max(best, Math.min(a - width, b - depth));
  }
  return best;
}

/** Footprint extents along bed x and y when the long side is turned angleDeg from x. */
function extentsAt(p: number, q: number, angleDeg: number): [number, number] {
  const angle = (angleDeg * Math.PI) / 180;
  return [p * Math.cos(angle) + q * Math.sin(angle), p * Math.sin(angle) + q * Math.cos(angle)];
}

describe('fitOnBed', () => {
  // The geometry checks below use no margin, so the bed is exactly the given rectangle.
  const fitBare = (part: Size3, bedMm: Size3) => fitOnBed(part, bedMm, { marginMm: 0 });

  it('fitOnBed · a part exactly the bed size · refused with the default 5 mm brim margin, fits with none', () => {
    const fit = fitOnBed([250, 210, 60], [250, 210, 60]);
    expect(fit.fits).toBe('no');
    expect(fit.message).toMatch(/keeping 5 mm round the edge for a brim or skirt/);
    expect(fitOnBed([240, 200, 60], [250, 210, 60]).fits).toBe('as-is'); // 250 − 2·5 = 240, 210 − 2·5 = 200
    expect(fitOnBed([240.1, 200, 60], [250, 210, 60]).fits).not.toBe('as-is');
    expect(fitOnBed([250, 210, 60], [250, 210, 60], { marginMm: 0 }).fits).toBe('as-is');
  });

  const bed: Size3 = [250, 210, 60];

  it('fitOnBed · a part that fits as modelled · fits', () => {
    expect(fitBare([240, 200, 50], bed)).toMatchObject({ fits: 'as-is', orientation: [240, 200, 50] });
  });

  it.each([
    [200, 240, 50],
    [240, 50, 200],
    [50, 240, 200],
    [200, 50, 240],
    [50, 200, 240],
  ] as const)('fitOnBed · %d × %d × %d · turned to 240 × 200 × 50', (...part) => {
    const fit = fitBare(part, bed);
    expect(fit.fits).toBe('rotated');
    expect(fit.orientation).toEqual([240, 200, 50]);
    expect(fit.message).toBe('Fits if turned to 240 × 200 × 50 mm (x × y × z).');
  });

  it('fitOnBed · a part exactly the size of the bed · fits', () => {
    expect(fitBare([250, 210, 60], bed).fits).toBe('as-is');
  });

  it('fitOnBed · a long part that fits only diagonally · laid diagonally', () => {
    // At 45° a 290 × 20 footprint spans (290 + 20)/√2 = 219.2 mm ≤ 220 mm.
    expect(sweepSlack(290, 20, 220, 220)).toBeGreaterThan(0);
    const fit = fitBare([290, 20, 10], [220, 220, 250]);
    expect(fit.fits).toBe('diagonal');
    expect(fit.orientation).toEqual([290, 20, 10]);
    const [x, y] = extentsAt(290, 20, fit.angleDeg!);
    expect(x).toBeLessThanOrEqual(220 + 1e-6);
    expect(y).toBeLessThanOrEqual(220 + 1e-6);
    expect(fit.message).toMatch(/^Fits only diagonally/);
  });

  it('fitOnBed · a 300 × 20 × 10 mm part · stood on its edge to fit diagonally', () => {
    // Lying flat, 300 × 20 spans 320/√2 = 226.3 mm at 45°; on its 300 × 10 edge, 310/√2 = 219.2 mm.
    expect(sweepSlack(300, 20, 220, 220)).toBeLessThan(0);
    expect(sweepSlack(300, 10, 220, 220)).toBeGreaterThan(0);
    expect(fitBare([300, 20, 10], [220, 220, 250])).toMatchObject({ fits: 'diagonal', orientation: [300, 10, 20] });
  });

  it('fitOnBed · a 300 × 20 × 20 mm part on a 220 × 220 × 250 mm bed · refused', () => {
    // Every face is 300 × 20 (no angle fits, as above) and 300 mm is taller than the bed.
    const fit = fitBare([300, 20, 20], [220, 220, 250]);
    expect(fit.fits).toBe('no');
    expect(fit.message).toMatch(/Too big for the 220 × 220 × 250 mm bed/);
  });

  it('fitOnBed · a part that fits no other way · stood up', () => {
    expect(fitBare([300, 20, 10], [220, 220, 320])).toMatchObject({ fits: 'rotated', orientation: [20, 10, 300] });
  });

  it('fitOnBed · random footprints · agrees with a brute-force angle sweep (Carver 1956, from memory)', () => {
    let seed = 12345;
    const random = () => {
      seed = (seed * 1103515245 + 12345) % 2 ** 31; // ANSI C linear congruential generator
      return seed / 2 ** 31;
    };
    let diagonalCases = 0;
    for (let trial = 0; trial < 400; trial++) {
      const bedX = 100 + random() * 250;
      const bedY = 100 + random() * 250;
      const long = Math.max(bedX, bedY) * (0.9 + random() * 0.45);
      const short = 7 + random() * 60; // taller than the bed, so the part can only lie flat
      const slack = sweepSlack(long, short, Math.max(bedX, bedY), Math.min(bedX, bedY), 20_000);
      if (Math.abs(slack) < 0.05) continue; // too close to call at this sweep resolution
      const fit = fitBare([long, short, 5], [bedX, bedY, 6]);
      expect(fit.fits === 'no', `${long} × ${short} on ${bedX} × ${bedY}`).toBe(slack < 0);
      if (fit.fits === 'diagonal') {
        diagonalCases++;
        const [x, y] = extentsAt(long, short, fit.angleDeg!);
        expect(x).toBeLessThanOrEqual(bedX + 1e-6);
        expect(y).toBeLessThanOrEqual(bedY + 1e-6);
      }
    }
    expect(diagonalCases).toBeGreaterThan(10);
  });

  it('fitOnBed · an inch-sized part · read as 1 in = 25.4 mm exactly (NIST SP 811)', () => {
    expect(MM_PER_INCH).toBe(25.4);
    const part: Size3 = [inchesToMm(9), inchesToMm(8), inchesToMm(2)]; // 228.6 × 203.2 × 50.8 mm
    expect(fitBare(part, bed).fits).toBe('as-is');
  });
});

describe('fitOnBed · the recipe says how to lay it', () => {
  const flat = 'Flat face on the bed';

  it('statedPose · notes crews write · read as flat, on edge, upright or nothing', () => {
    expect(statedPose('Flat face on the bed')).toBe('flat');
    // the earliest words name the part's pose; later ones describe a feature
    expect(statedPose('Flat side down, rod bore upright')).toBe('flat');
    expect(statedPose('Stand it on its end, bore horizontal')).toBe('upright');
    expect(statedPose('On its long edge so the layers run along the arm')).toBe('edge');
    expect(statedPose('Enclosure closed, no fan for the first layers')).toBeNull();
    expect(statedPose(undefined)).toBeNull();
  });

  it('fitOnBed · a 300 × 20 × 10 mm bar, recipe flat, a 220 × 220 × 250 mm bed · says it must lie on its edge instead', () => {
    // Lying flat (300 × 20 down) it needs 320/√2 = 226.3 mm across the bed at 45° (more than 220);
    // on its 300 × 10 edge it needs 310/√2 = 219.2 mm: the same sums as the test above.
    const fit = fitOnBed([300, 20, 10], [220, 220, 250], { marginMm: 0, orientationNote: flat });
    expect(fit).toMatchObject({ fits: 'diagonal', orientation: [300, 10, 20], recipe: { words: flat, followed: false } });
    expect(fit.message).toMatch(/^Laid as the recipe says \(“Flat face on the bed”\), it needs 300 × 20 mm of bed and 10 mm of height/);
    expect(fit.message).toMatch(/another way than the recipe says: diagonally: lay it with its 300 × 10 mm side down/);
  });

  it('fitOnBed · a 100 × 70 × 6 mm plate modelled standing, recipe flat · is laid flat, not left standing', () => {
    // modelled as 6 × 70 × 100 (standing); flat means the 6 mm side up: 100 × 70 (or 70 × 100) on the bed
    const fit = fitOnBed([6, 70, 100], [220, 220, 250], { orientationNote: flat });
    expect(fit).toMatchObject({ fits: 'rotated', orientation: [70, 100, 6], recipe: { followed: true } });
    expect(fit.message).toMatch(/laid as the recipe says/);
    // without a note, the modelled pose is kept as today
    expect(fitOnBed([6, 70, 100], [220, 220, 250]).fits).toBe('as-is');
  });

  it('fitOnBed · a plate the recipe lays flat that fits flat · follows the recipe even where standing would fit too', () => {
    // usable bed 90 × 90 × 100 (100 mm bed less 5 mm round the edge): 100 × 70 flat does not fit, so it
    // must stand; 80 × 70 flat does
    const small = fitOnBed([100, 70, 6], [100, 100, 100], { orientationNote: flat });
    expect(small.recipe).toEqual({ words: flat, followed: false });
    expect(small.orientation).toEqual([70, 6, 100]);
    expect(fitOnBed([80, 70, 6], [100, 100, 100], { orientationNote: flat })).toMatchObject({
      fits: 'as-is',
      orientation: [80, 70, 6],
      recipe: { followed: true },
    });
  });

  it('fitOnBed · too big every way with a stated pose · says what the recipe pose needs and that nothing fits', () => {
    const fit = fitOnBed([300, 20, 20], [220, 220, 250], { marginMm: 0, orientationNote: flat });
    expect(fit.fits).toBe('no');
    expect(fit.message).toMatch(/needs 300 × 20 mm of bed and 20 mm of height; too big for the 220 × 220 × 250 mm bed/);
  });
});
