import { describe, expect, it } from 'vitest';
import { HEAT_EXPOSURES, HEAT_MARGIN_C, MATERIAL_IDS, heatCheck, heatExposureInfo, isMaterialId, materialInfo, recipeWindowWarnings } from '@shared/materials';

describe('material table', () => {
  // Trade reference "Filament and materials": densities from UL Prospector (ISO 1183),
  // designerdata.nl and the polymer databases named there.
  it.each([
    ['PLA', 1.24],
    ['PETG', 1.27],
    ['ABS', 1.04],
    ['ASA', 1.07],
    ['TPU', 1.21],
    ['PA', 1.14],
    ['PC', 1.2],
  ] as const)('material table · %s · density %d g/cm³', (id, density) => {
    expect(materialInfo(id).densityGcm3).toBe(density);
  });

  // Trade reference: temperatures from Fashion and Textiles (2020) Table 2,
  // doi 10.1186/s40691-020-00232-7; ASA, PC and upper bed values secondary.
  it.each([
    ['PLA', [180, 220], [20, 60]],
    ['PETG', [220, 250], [70, 85]],
    ['ABS', [230, 250], [90, 110]],
    ['ASA', [240, 260], [90, 110]],
    ['TPU', [210, 240], [20, 60]],
    ['PA', [250, 280], [70, 100]],
    ['PC', [260, 300], [100, 120]],
  ] as const)('material table · %s · prints at %j hotend, %j bed', (id, [hotMin, hotMax], [bedMin, bedMax]) => {
    const info = materialInfo(id);
    expect(info.hotendC).toEqual({ min: hotMin, max: hotMax });
    expect(info.bedC).toEqual({ min: bedMin, max: bedMax });
  });

  it('material table · softening points · at or below the referenced glass transitions', () => {
    // Trade reference: PLA Tg 55–65 °C (NETZSCH), PETG Tg ≈ 80 °C / HDT ≈ 70 °C at 1.82 MPa,
    // ABS Tg ≈ 105 °C, ASA Tg ≈ 100 °C, PC Tg ≈ 147 °C.
    expect(materialInfo('PLA').softensAtC).toBeLessThanOrEqual(55);
    expect(materialInfo('PETG').softensAtC).toBeLessThanOrEqual(70);
    expect(materialInfo('ABS').softensAtC).toBeLessThan(105);
    expect(materialInfo('ASA').softensAtC).toBeLessThan(100);
    expect(materialInfo('PC').softensAtC).toBeLessThan(147);
  });

  it('material table · windows and fibre-filled grades · every window ordered, every fibre-filled grade marked abrasive', () => {
    for (const id of MATERIAL_IDS) {
      const info = materialInfo(id);
      expect(info.hotendC.min).toBeLessThan(info.hotendC.max);
      expect(info.bedC.min).toBeLessThan(info.bedC.max);
      // Common practice: carbon fibre wears brass nozzles.
      expect(info.abrasive).toBe(id.endsWith('-CF'));
    }
  });

  it('material table · ids · only its own recognised', () => {
    expect(isMaterialId('PETG')).toBe(true);
    expect(isMaterialId('wood')).toBe(false);
  });
});

describe('recipeWindowWarnings', () => {
  it('recipeWindowWarnings · hotend below the usual window · warned', () => {
    // PETG 220–250 °C (trade reference).
    expect(recipeWindowWarnings({ material: 'PETG', hotendC: 190, bedC: 80 })).toEqual(["Hotend 190 °C is below PETG's usual 220–250 °C."]);
  });

  it('recipeWindowWarnings · hotend and bed both outside · warned together', () => {
    // PLA 180–220 / 20–60 °C (trade reference).
    expect(recipeWindowWarnings({ material: 'PLA', hotendC: 240, bedC: 90 })).toEqual([
      "Hotend 240 °C is above PLA's usual 180–220 °C.",
      "Bed 90 °C is above PLA's usual 20–60 °C.",
    ]);
  });

  it('recipeWindowWarnings · inside the window and at its edges · silent', () => {
    expect(recipeWindowWarnings({ material: 'ASA', hotendC: 240, bedC: 110 })).toEqual([]);
    expect(recipeWindowWarnings({ material: 'PLA', hotendC: 220, bedC: 20 })).toEqual([]);
  });

  it('recipeWindowWarnings · a bed at 0 °C · treated as switched off', () => {
    expect(recipeWindowWarnings({ material: 'PLA', hotendC: 205, bedC: 0 })).toEqual([]);
    expect(recipeWindowWarnings({ material: 'ABS', hotendC: 240, bedC: 0 })).toEqual([
      'ABS usually needs a heated bed at 90–110 °C; this recipe has the bed off.',
    ]);
  });
});

describe('heatCheck', () => {
  it('heatCheck · a vehicle in sun · uses the measured car temperatures', () => {
    // Vanos et al., Temperature 2018, doi 10.1080/23328940.2018.1468205: dashboard 69.4 °C,
    // cabin air 46.7 °C after an hour in sun.
    expect(heatExposureInfo('vehicle-sun').temperatureC).toBe(69.4);
    expect(heatExposureInfo('cabin').temperatureC).toBe(46.7);
    for (const id of HEAT_EXPOSURES) expect(heatExposureInfo(id).where).not.toBe('');
  });

  it('heatCheck · PLA on a vehicle in sun · flagged, safer materials named', () => {
    // Trade reference "Heat on set": PLA (Tg ≈ 60 °C) on a dashboard in sun deforms; ASA/ABS/PC hold.
    const check = heatCheck('PLA', 'vehicle-sun');
    expect(check.ok).toBe(false);
    expect(check.marginC).toBeCloseTo(55 - 69.4, 6);
    expect(check.saferMaterials).toEqual(expect.arrayContaining(['ABS', 'ASA', 'PC']));
    expect(check.saferMaterials).not.toContain('TPU');
    expect(check.message).toMatch(/will deform/);
    expect(check.message).toMatch(/Print it in ABS, ASA or PC instead\./);
  });

  it('heatCheck · PETG on a vehicle in sun · marginal', () => {
    // Trade reference: "PETG is marginal" (HDT ≈ 70 °C vs 69.4 °C).
    const check = heatCheck('PETG', 'vehicle-sun');
    expect(check.ok).toBe(false);
    expect(check.marginC).toBeGreaterThanOrEqual(0);
    expect(check.marginC).toBeLessThan(HEAT_MARGIN_C);
    // 0.6 °C of margin, shown to the whole degree
    expect(check.message).toMatch(/only less than 1 °C above the 69 °C of/);
    expect(check.message).not.toMatch(/\d\.\d °C/);
  });

  it('heatCheck · ASA, ABS and PC on a vehicle in sun · pass', () => {
    for (const id of ['ASA', 'ABS', 'PC'] as const) {
      const check = heatCheck(id, 'vehicle-sun');
      expect(check.ok).toBe(true);
      expect(check.saferMaterials).toEqual([]);
      expect(check.message).toMatch(/well above/);
    }
  });

  it('heatCheck · TPU · only flexible alternatives offered', () => {
    const check = heatCheck('TPU', 'vehicle-sun');
    expect(check.ok).toBe(false);
    expect(check.saferMaterials).toEqual([]);
    expect(check.message).toMatch(/keep the part out of the heat/);
  });
});
