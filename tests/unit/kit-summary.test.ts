import { describe, expect, it } from 'vitest';
import { DEFAULT_PRICE_PER_KG, type PartGeometry } from '@shared/estimate';
import { kitsToPayBack, printingDays, summariseKit, type KitPlan, type KitPlanItem, type KitPrinterRef } from '@shared/kit-summary';
import { HEAT_MARGIN_C, heatExposureInfo, materialInfo } from '@shared/materials';
import { inchesToMm, MM_PER_INCH } from '@shared/units';

const noFlags = { carriesLoad: false, overhead: false, vehicle: false, heat: false };
const solidPla = { material: 'PLA', nozzleMm: 0.4, layerMm: 0.2, walls: 2, topBottomLayers: 4, infillPct: 100 } as const;
const cube = (side: number): PartGeometry => ({ volumeMm3: side ** 3, areaMm2: 6 * side * side, sizeMm: [side, side, side] });
/** A block holding exactly 1 kg of PLA at 1.24 g/cm³ (as in tests/unit/estimate.test.ts). */
const kiloBlock: PartGeometry = { volumeMm3: 1_000_000 / 1.24, areaMm2: 60_000, sizeMm: [100, 100, 80.645] };

const cart: KitPrinterRef = { id: 1, name: 'Cart printer', bedMm: [220, 220, 250], nozzleMm: 0.4, watts: 120 };
const bigBox: KitPrinterRef = { id: 2, name: 'Big box', bedMm: [300, 300, 300], nozzleMm: 0.4, watts: null };

function item(overrides: Partial<KitPlanItem> = {}): KitPlanItem {
  return {
    id: 1,
    title: 'Test piece',
    quantity: 1,
    geometry: cube(20),
    settings: { ...solidPla },
    printer: null,
    safety: noFlags,
    testedLoadKg: null,
    evidenceWarnings: [],
    boughtPriceEach: null,
    servicePriceEach: null,
    serviceShipping: null,
    ...overrides,
  };
}

function plan(items: KitPlanItem[], overrides: Partial<KitPlan> = {}): KitPlan {
  return { heatExposure: null, printHoursPerDay: 8, printerPrice: null, pricesPerKg: { ...DEFAULT_PRICE_PER_KG }, pricePerKwh: null, items, ...overrides };
}

/** Trade reference: L = m / (ρ·π·(d/2)²), here in metres for grams and g/cm³. */
function metres(grams: number, diameterMm: number, density = 1.24): number {
  return ((grams / density) * 1000) / (Math.PI * (diameterMm / 2) ** 2) / 1000;
}

describe('kit summary · totals', () => {
  it('kit summary · a solid 20 mm cube and a solid 1-inch cube in PLA · grams and metres add up per material', () => {
    // Trade reference: PLA 1.24 g/cm³ (UL Prospector, ISO 1183); 8 cm³ × 1.24 = 9.92 g per 20 mm cube.
    // 1 in = 25.4 mm exactly (1959 agreement), so a 1-inch cube is 16.387064 cm³ → 20.31995936 g.
    expect(MM_PER_INCH).toBe(25.4);
    const summary = summariseKit(plan([item({ id: 1, quantity: 3, geometry: cube(20) }), item({ id: 2, quantity: 10, geometry: cube(inchesToMm(1)) })]));
    expect(summary.items[0].each!.massG).toBeCloseTo(9.92, 9);
    expect(summary.items[0].total!.massG).toBeCloseTo(29.76, 9);
    expect(summary.items[1].each!.massG).toBeCloseTo(16.387064 * 1.24, 9);
    const grams = 29.76 + 203.1995936;
    const [pla] = summary.totals.byMaterial;
    expect(summary.totals.byMaterial).toHaveLength(1);
    expect(pla).toMatchObject({ material: 'PLA', pieces: 13, spools: 1 });
    expect(pla.grams).toBeCloseTo(grams, 9);
    expect(pla.lengthM['1.75']).toBeCloseTo(metres(grams, 1.75), 9);
    expect(pla.lengthM['2.85']).toBeCloseTo(metres(grams, 2.85), 9);
    // Trade reference: 1 kg of 1.75 mm PLA is about 335.3 m, so 232.96 g is about 78.1 m.
    expect(pla.lengthM['1.75']).toBeCloseTo(335.3 * (grams / 1000), 1);
    expect(summary.totals.grams).toBeCloseTo(grams, 9);
    // at the default PLA price of 20 per kg (from memory, shared/estimate.ts)
    expect(summary.totals.filamentCost).toBeCloseTo((grams / 1000) * DEFAULT_PRICE_PER_KG.PLA, 9);
    expect(summary.totals.energyIncluded).toBe('none');
    expect(summary.totals.printCost).toBeCloseTo(summary.totals.filamentCost, 12);
  });

  it('kit summary · materials priced by the member · uses their price per kg', () => {
    const summary = summariseKit(plan([item({ quantity: 3 })], { pricesPerKg: { ...DEFAULT_PRICE_PER_KG, PLA: 25 } }));
    expect(summary.totals.filamentCost).toBeCloseTo(0.02976 * 25, 9);
  });

  it('kit summary · whole spools · 2 kg exactly is 2 spools, 9.92 g more makes 3', () => {
    const exactly = summariseKit(plan([item({ quantity: 2, geometry: kiloBlock })]));
    expect(exactly.totals.byMaterial[0].grams).toBeCloseTo(2000, 6);
    expect(exactly.totals.byMaterial[0].spools).toBe(2);
    const more = summariseKit(plan([item({ id: 1, quantity: 2, geometry: kiloBlock }), item({ id: 2, geometry: cube(20) })]));
    expect(more.totals.byMaterial[0].spools).toBe(3);
  });

  it('kit summary · two materials · one total row each, in the list order of materials', () => {
    const summary = summariseKit(
      plan([item({ id: 1, settings: { ...solidPla, material: 'ASA' } }), item({ id: 2 }), item({ id: 3, settings: { ...solidPla, material: 'PETG' } })]),
    );
    expect(summary.totals.byMaterial.map((m) => m.material)).toEqual(['PLA', 'PETG', 'ASA']);
    // Trade reference densities: PETG 1.27, ASA 1.07 g/cm³.
    expect(summary.totals.byMaterial[1].grams).toBeCloseTo(8 * 1.27, 9);
    expect(summary.totals.byMaterial[2].grams).toBeCloseTo(8 * 1.07, 9);
    expect(summary.totals.byMaterial[2].lengthM['1.75']).toBeCloseTo(metres(8 * 1.07, 1.75, 1.07), 9);
  });

  it('kit summary · printer with watts and a price per kWh · adds electricity as W × h ÷ 1000 × price', () => {
    const summary = summariseKit(plan([item({ quantity: 4, printer: cart })], { pricePerKwh: 0.3 }));
    const total = summary.items[0].total!;
    expect(total.energyKwh).toBeCloseTo((120 * total.hours) / 1000, 12);
    expect(total.energyCost).toBeCloseTo(((120 * total.hours) / 1000) * 0.3, 12);
    expect(total.printCost).toBeCloseTo(total.filamentCost + total.energyCost!, 12);
    expect(summary.totals.energyIncluded).toBe('all');
    const mixed = summariseKit(plan([item({ id: 1, printer: cart }), item({ id: 2, printer: bigBox })], { pricePerKwh: 0.3 }));
    expect(mixed.totals.energyIncluded).toBe('some');
    expect(mixed.items[1].total!.energyCost).toBeNull();
  });

  it('kit summary · an item without a model · is listed but left out of the totals', () => {
    const summary = summariseKit(plan([item({ id: 1 }), item({ id: 7, geometry: null, printer: cart })]));
    expect(summary.totals.unestimated).toEqual([7]);
    expect(summary.items[1]).toMatchObject({ each: null, total: null, fit: null });
    expect(summary.items[1].notes.join(' ')).toMatch(/left out of the totals/);
    expect(summary.totals.pieces).toBe(1);
    expect(summary.totals.grams).toBeCloseTo(9.92, 9);
  });
});

describe('kit summary · days of printing', () => {
  it('printingDays · whole and part days · rounds up, but not for binary rounding noise', () => {
    expect(printingDays(16, 8)).toBe(2);
    expect(printingDays(16.5, 8)).toBe(3);
    expect(printingDays(0, 8)).toBe(0);
    // 8 × (0.1 + 0.2) / 0.3 is 8.000000000000002 in binary floating point: still one day
    expect(printingDays((8 * (0.1 + 0.2)) / 0.3, 8)).toBe(1);
    expect(() => printingDays(5, 0)).toThrow(RangeError);
  });

  it('kit summary · two printers side by side · each has its hours and days, the busiest sets the kit', () => {
    const summary = summariseKit(
      plan(
        [
          item({ id: 1, quantity: 30, printer: cart }),
          item({ id: 2, quantity: 5, printer: bigBox }),
          item({ id: 3, quantity: 10, printer: cart }),
          item({ id: 4, quantity: 2 }),
        ],
        { printHoursPerDay: 6 },
      ),
    );
    const [onCart, onBigBox, unassigned] = summary.totals.byPrinter;
    expect(onCart.printer).toEqual({ id: 1, name: 'Cart printer' });
    expect(onCart.pieces).toBe(40);
    expect(onCart.hours).toBeCloseTo(summary.items[0].total!.hours + summary.items[2].total!.hours, 12);
    expect(onCart.days).toBe(Math.ceil(onCart.hours / 6));
    expect(onBigBox).toMatchObject({ printer: { id: 2, name: 'Big box' }, pieces: 5 });
    expect(unassigned).toMatchObject({ printer: null, pieces: 2 });
    expect(summary.totals.daysOfPrinting).toBe(Math.max(onCart.days, onBigBox.days, unassigned.days));
    expect(summary.totals.daysOfPrinting).toBe(onCart.days);
    expect(summary.totals.hours).toBeCloseTo(onCart.hours + onBigBox.hours + unassigned.hours, 12);
  });
});

describe('kit summary · buy or print', () => {
  it('kitsToPayBack · printer price over savings per kit · rounds up, null when printing saves nothing', () => {
    expect(kitsToPayBack(450, 45)).toBe(10);
    expect(kitsToPayBack(450, 44)).toBe(11);
    // 0.30000000000000004 / 0.1 is 3.0000000000000004 in floating point: three kits, not four
    expect(kitsToPayBack(0.1 + 0.2, 0.1)).toBe(3);
    expect(kitsToPayBack(450, 0)).toBeNull();
    expect(kitsToPayBack(450, -3)).toBeNull();
  });

  it('kit summary · bought and print-service prices · compares each with printing the same items', () => {
    const summary = summariseKit(
      plan(
        [
          item({ id: 1, quantity: 3, boughtPriceEach: 5 }),
          item({ id: 2, quantity: 10, geometry: cube(25.4), boughtPriceEach: 3, servicePriceEach: 1, serviceShipping: 5 }),
          item({ id: 3, quantity: 1 }),
        ],
        { printerPrice: 300 },
      ),
    );
    const [a, b] = summary.items;
    expect(a.bought).toEqual({ each: 5, total: 15 });
    expect(b.printService).toEqual({ each: 1, shipping: 5, total: 15 });
    const { buying, printService, cheapest, payback } = summary.buyOrPrint;
    expect(buying).toMatchObject({ items: 2, total: 45 });
    expect(buying!.printCost).toBeCloseTo(a.total!.printCost + b.total!.printCost, 12);
    expect(buying!.savings).toBeCloseTo(45 - buying!.printCost, 12);
    expect(printService).toMatchObject({ items: 1, total: 15 });
    // per item the cheaper: bought 15 for the cubes, the service's 15 rather than 30 bought for the inch cubes
    expect(cheapest).toMatchObject({ items: 2, total: 30 });
    expect(payback!.savingsPerKit).toBeCloseTo(30 - cheapest!.printCost, 12);
    expect(payback!.kits).toBe(Math.ceil(300 / payback!.savingsPerKit!));
    expect(payback!.message).toMatch(/pays for itself after \d+ kits/);
  });

  it('kit summary · printing dearer than buying · the printer never pays for itself', () => {
    const summary = summariseKit(plan([item({ boughtPriceEach: 0.05 })], { printerPrice: 300 }));
    expect(summary.buyOrPrint.buying!.savings).toBeLessThan(0);
    expect(summary.buyOrPrint.payback).toMatchObject({ printerPrice: 300, kits: null });
    expect(summary.buyOrPrint.payback!.message).toMatch(/never pays for itself/);
  });

  it('kit summary · no prices or no printer price · no comparison and no payback', () => {
    const summary = summariseKit(plan([item()], { printerPrice: 300 }));
    expect(summary.buyOrPrint).toMatchObject({ buying: null, printService: null, cheapest: null });
    expect(summary.buyOrPrint.payback).toMatchObject({ savingsPerKit: null, kits: null });
    expect(summariseKit(plan([item({ boughtPriceEach: 9 })])).buyOrPrint.payback).toBeNull();
  });
});

describe('kit summary · heat, fit and cautions', () => {
  it('kit summary · PLA on a car rig in sun · flagged, naming a material that holds', () => {
    // Vanos et al., Temperature 2018 (trade reference): a dashboard in sun reaches 69.4 °C; PLA's
    // softening figure in shared/materials.ts is 55 °C, so the margin is 55 − 69.4 = −14.4 °C.
    const exposure = heatExposureInfo('vehicle-sun');
    expect(exposure.temperatureC).toBe(69.4);
    const summary = summariseKit(plan([item({ id: 1 }), item({ id: 2, settings: { ...solidPla, material: 'ASA' } })], { heatExposure: 'vehicle-sun' }));
    const [pla, asa] = summary.items;
    expect(pla.heat).toMatchObject({ ok: false, marginC: -14.4 });
    expect(pla.heat!.message).toMatch(/will deform/);
    expect(pla.heat!.saferMaterials).toContain('ASA');
    expect(pla.heat!.message).toMatch(/ASA/);
    // ASA softens at 90 °C: 20.6 °C of margin, above HEAT_MARGIN_C
    expect(asa.heat!.ok).toBe(true);
    expect(asa.heat!.marginC).toBeCloseTo(materialInfo('ASA').softensAtC - exposure.temperatureC, 9);
    expect(asa.heat!.marginC).toBeGreaterThanOrEqual(HEAT_MARGIN_C);
  });

  it('kit summary · PLA in a parked car · inside the margin, so it may sag', () => {
    // 55 − 46.7 = 8.3 °C, less than the HEAT_MARGIN_C of 10 °C in shared/materials.ts
    expect(HEAT_MARGIN_C).toBe(10);
    const summary = summariseKit(plan([item()], { heatExposure: 'cabin' }));
    expect(summary.items[0].heat).toMatchObject({ ok: false, marginC: 8.3 });
    expect(summary.items[0].heat!.message).toMatch(/may sag/);
  });

  it('kit summary · no heat exposure · no heat check', () => {
    expect(summariseKit(plan([item()])).items[0].heat).toBeNull();
  });

  it('kit summary · a 9.5-inch bar · stands up on the cart printer, lies flat on the big box, fits nowhere on a small bed', () => {
    // 9.5 in × 25.4 mm/in = 241.3 mm exactly
    const bar: PartGeometry = { volumeMm3: inchesToMm(9.5) * 20 * 20, areaMm2: 2 * 400 + 4 * 20 * inchesToMm(9.5), sizeMm: [inchesToMm(9.5), 20, 20] };
    expect(bar.sizeMm[0]).toBe(241.3);
    const small: KitPrinterRef = { id: 3, name: 'Mini', bedMm: [100, 100, 100], nozzleMm: 0.4, watts: null };
    const summary = summariseKit(
      plan([item({ id: 1, geometry: bar, printer: cart }), item({ id: 2, geometry: bar, printer: bigBox }), item({ id: 3, geometry: bar, printer: small })]),
    );
    expect(summary.items[0].fit).toMatchObject({ fits: 'rotated', orientation: [20, 20, 241.3] });
    expect(summary.items[1].fit!.fits).toBe('as-is');
    expect(summary.items[2].fit!.fits).toBe('no');
    expect(summary.items[2].fit!.message).toMatch(/Too big/);
  });

  it('kit summary · a bar whose recipe says upright · stands on the cart printer as the recipe says, and says so', () => {
    const bar: PartGeometry = { volumeMm3: inchesToMm(9.5) * 20 * 20, areaMm2: 2 * 400 + 4 * 20 * inchesToMm(9.5), sizeMm: [inchesToMm(9.5), 20, 20] };
    const upright = summariseKit(plan([item({ geometry: bar, printer: cart, orientationNote: 'Upright, bore at the top' })])).items[0].fit!;
    expect(upright).toMatchObject({ fits: 'rotated', orientation: [20, 20, 241.3], recipe: { followed: true } });
    // the big box takes it lying down, but the recipe's way comes first
    const onBigBox = summariseKit(plan([item({ geometry: bar, printer: bigBox, orientationNote: 'Upright, bore at the top' })])).items[0].fit!;
    expect(onBigBox).toMatchObject({ orientation: [20, 20, 241.3], recipe: { followed: true } });
    // a 10-inch plate the recipe stands upright is 254 mm tall, more than the cart printer's 250 mm
    // (10 in × 25.4 mm/in): it has to lie down, and the advice says that differs from the recipe
    const plate: PartGeometry = { volumeMm3: 254 * 25.4 * 5, areaMm2: 2 * 254 * 25.4 + 2 * 5 * (254 + 25.4), sizeMm: [inchesToMm(10), inchesToMm(1), 5] };
    const standing = summariseKit(plan([item({ geometry: plate, printer: cart, orientationNote: 'Stand it upright' })])).items[0].fit!;
    expect(standing.recipe).toEqual({ words: 'Stand it upright', followed: false });
    expect(standing.fits).toBe('diagonal');
    expect(standing.message).toMatch(
      /needs 25.4 × 5 mm of bed and 254 mm of height, more than this bed has\. Here it must lie another way than the recipe says/,
    );
  });

  it('kit summary · a 10 × 1 inch plate · fits the cart printer only diagonally', () => {
    const plate: PartGeometry = { volumeMm3: 254 * 25.4 * 5, areaMm2: 2 * 254 * 25.4 + 2 * 5 * (254 + 25.4), sizeMm: [inchesToMm(10), inchesToMm(1), 5] };
    const summary = summariseKit(plan([item({ geometry: plate, printer: cart })]));
    expect(summary.items[0].fit!.fits).toBe('diagonal');
  });

  it('kit summary · a load-bearing vehicle part · carries the safety cautions, an unflagged part none', () => {
    const summary = summariseKit(
      plan([item({ id: 1, safety: { carriesLoad: true, overhead: false, vehicle: true, heat: true }, testedLoadKg: 0.5 }), item({ id: 2 })]),
    );
    const texts = summary.items[0].cautions.map((c) => c.text).join(' ');
    expect(texts).toMatch(/tested load of 0\.5 kg/);
    expect(texts).toMatch(/safety cable/);
    expect(texts).toMatch(/key grip, the rigging lead and local codes/);
    expect(summary.items[1].cautions).toEqual([]);
  });

  it('kit summary · set-report warnings and a nozzle the recipe does not expect · passed on with the material marked', () => {
    const summary = summariseKit(
      plan([
        item({
          printer: { ...cart, nozzleMm: 0.6 },
          evidenceWarnings: [
            { material: 'PLA', text: 'PLA deformed in heat in 2 of 2 reports' },
            { material: 'PETG', text: 'PETG cracked after drops or impacts in 2 of 3 reports' },
          ],
        }),
      ]),
    );
    expect(summary.items[0].evidenceWarnings.map((w) => w.matchesMaterial)).toEqual([true, false]);
    expect(summary.items[0].notes.join(' ')).toMatch(/0\.4 mm nozzle; Cart printer has 0\.6 mm/);
  });
});
