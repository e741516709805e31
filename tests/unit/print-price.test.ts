import { describe, expect, it } from 'vitest';
import { computePrintPrice, currencyOf, minorToDecimal, percentOf, sumMinor, toMinor } from '@shared/print-price';

describe('print price · worked examples by hand', () => {
  it('print price · 125 g PLA at 22.00/kg, 200 W for 3 h at 0.30/kWh · 2.75 + 0.18 = 2.93', () => {
    // by hand: 0.125 kg × 22.00 = 2.75; 200 W × 3 h = 600 Wh = 0.6 kWh (kWh = W × h ÷ 1000, SI
    // definition of the kilowatt-hour) × 0.30 = 0.18
    const p = computePrintPrice(
      { filament: [{ material: 'PLA', grams: 125 }], minutes: 180, watts: 200 },
      { pricesPerKg: { PLA: 22 }, pricePerKwh: 0.3, machineHourRate: null },
      'EUR',
    );
    expect(p.lines.map((l) => [l.kind, l.amountMinor])).toEqual([
      ['filament', 275],
      ['energy', 18],
    ]);
    expect(p.totalMinor).toBe(293);
    expect(p.figures).toEqual({ grams: 125, hours: 3, wattHours: 600 });
  });

  it('print price · machine-hour rate 1.50/h for 2 h 30 min · 3.75 added', () => {
    // by hand: 2.5 h × 1.50 = 3.75
    const p = computePrintPrice(
      { filament: [{ material: 'PLA', grams: 40 }], minutes: 150, watts: null },
      { pricesPerKg: { PLA: 25 }, pricePerKwh: 0.3, machineHourRate: 1.5 },
      'GBP',
    );
    expect(p.lines.map((l) => [l.kind, l.amountMinor])).toEqual([
      ['filament', 100],
      ['machine', 375],
    ]);
    expect(p.totalMinor).toBe(475);
    expect(p.notes[0]).toMatch(/power is not set/);
  });

  it('print price · fractions of a cent · each line rounded half up, the total is the sum of the lines', () => {
    // 33.35 g × 19.99/kg = 0.66666… → 0.67; 120 W × 95 min = 190 Wh × 0.2817 = 0.0535… → 0.05
    const p = computePrintPrice(
      { filament: [{ material: 'PLA', grams: 33.349 }], minutes: 95, watts: 120 },
      { pricesPerKg: { PLA: 19.99 }, pricePerKwh: 0.2817, machineHourRate: null },
      'EUR',
    );
    expect(p.figures.grams).toBe(33.3);
    // 33.3 g × 19.99 = 0.665667 → 0.67 (half up)
    expect(p.lines[0].amountMinor).toBe(67);
    expect(p.lines[1].amountMinor).toBe(5);
    expect(p.totalMinor).toBe(p.lines.reduce((s, l) => s + l.amountMinor, 0));
  });

  it('print price · a currency without minor units (JPY, ISO 4217 exponent 0) · whole yen', () => {
    // ISO 4217: JPY has 0 decimals; 200 g × 3000 JPY/kg = 600 JPY
    expect(currencyOf('JPY').exponent).toBe(0);
    const p = computePrintPrice(
      { filament: [{ material: 'PLA', grams: 200 }], minutes: 60, watts: null },
      { pricesPerKg: { PLA: 3000 }, pricePerKwh: null, machineHourRate: null },
      'JPY',
    );
    expect(p.totalMinor).toBe(600);
    expect(minorToDecimal(600, 'JPY')).toBe('600');
  });

  it('print price · unknown currency code · refused', () => {
    expect(() =>
      computePrintPrice(
        { filament: [{ material: 'PLA', grams: 1 }], minutes: 1, watts: null },
        { pricesPerKg: { PLA: 1 }, pricePerKwh: null, machineHourRate: null },
        'XYZ',
      ),
    ).toThrow(/ISO 4217/);
  });
});

describe('money helpers · minor units', () => {
  it('money helpers · 0.1 + 0.2 · exactly 0.30 (no float drift)', () => {
    // the classic binary floating-point case: 0.1 + 0.2 = 0.30000000000000004 in doubles
    expect(sumMinor([toMinor(0.1, 'EUR'), toMinor(0.2, 'EUR')], 'EUR')).toBe(30);
    expect(minorToDecimal(30, 'EUR')).toBe('0.30');
  });

  it('money helpers · 7.7 % VAT of 129.95 · 10.01 (half up from 10.00615)', () => {
    // by hand: 129.95 × 0.077 = 10.00615 → 10.01
    expect(percentOf(12995, 7.7, 'CHF')).toBe(1001);
    // 20 % of 0.05 = 0.01 exactly
    expect(percentOf(5, 20, 'GBP')).toBe(1);
  });
});

describe('print price · several materials', () => {
  it('print price · 100 g PLA at 20/kg and 50 g TPU at 30/kg · one filament line each, 2.00 + 1.50', () => {
    // by hand: 0.1 kg × 20 = 2.00; 0.05 kg × 30 = 1.50
    const p = computePrintPrice(
      {
        filament: [
          { material: 'PLA', grams: 100 },
          { material: 'TPU', grams: 50 },
        ],
        minutes: 60,
        watts: null,
      },
      { pricesPerKg: { PLA: 20, TPU: 30 }, pricePerKwh: null, machineHourRate: null },
      'USD',
    );
    expect(p.lines.map((l) => [l.label, l.amountMinor])).toEqual([
      ['Filament (PLA)', 200],
      ['Filament (TPU)', 150],
    ]);
    expect(p.totalMinor).toBe(350);
    expect(p.figures.grams).toBe(150);
  });
});
