import { describe, expect, it } from 'vitest';
import { buildStatement, nonCommercialCaution } from '@shared/statement';
import { loadConfig } from '../../server/config';

const terms = { pricesPerKg: { PLA: 19.99, PETG: 24.5 }, pricePerKwh: 0.2817, machineHourRate: null };
const item = (title: string, grams: number, minutes: number, licence = 'CC-BY-4.0') => ({
  title,
  quantity: 1,
  material: 'PLA',
  grams,
  minutes,
  watts: 120,
  licence,
  author: 'Ines Varga',
});

describe('statement · totals to the cent', () => {
  it('statement · 40 lines with fractions of a cent · subtotal is the sum of the lines, total = subtotal + tax', () => {
    const items = Array.from({ length: 40 }, (_, i) => item(`Part ${i}`, 3.33 + i * 1.17, 17 + i * 7));
    const s = buildStatement({
      currency: 'EUR',
      taxRatePct: 7.7,
      terms,
      items,
      fees: [
        { label: 'Courier', amount: 7.35 },
        { label: 'Handling', amount: 0.1 },
      ],
    });
    expect(s.lines).toHaveLength(42);
    expect(s.subtotalMinor).toBe(s.lines.reduce((sum, l) => sum + l.amountMinor, 0));
    for (const l of s.lines.filter((x) => x.kind === 'item')) expect(l.amountMinor).toBe(l.filamentMinor + l.energyMinor + l.machineMinor);
    // tax is rounded once, half up, on the subtotal (common practice for invoice-level VAT)
    expect(s.taxMinor).toBe(Math.round((s.subtotalMinor * 77) / 1000));
    expect(s.totalMinor).toBe(s.subtotalMinor + s.taxMinor);
  });

  it('statement · worked example · 100 g PLA at 19.99 for 1 h on 120 W at 0.2817/kWh, a 12.50 fee, 19 % tax', () => {
    // by hand: 0.1 kg × 19.99 = 1.999 → 2.00; 0.12 kWh × 0.2817 = 0.0338 → 0.03; + 12.50 = 14.53;
    // 19 % = 2.7607 → 2.76; total 17.29
    const s = buildStatement({ currency: 'EUR', taxRatePct: 19, terms, items: [item('Clip', 100, 60)], fees: [{ label: 'Prep', amount: 12.5 }] });
    expect(s.lines.map((l) => l.amountMinor)).toEqual([203, 1250]);
    expect([s.lines[0].filamentMinor, s.lines[0].energyMinor]).toEqual([200, 3]);
    expect(s.subtotalMinor).toBe(1453);
    expect(s.taxMinor).toBe(276);
    expect(s.totalMinor).toBe(1729);
  });

  it('statement · an item without an estimate · listed at 0 with a note, totals unchanged', () => {
    const s = buildStatement({ currency: 'GBP', taxRatePct: null, terms, items: [{ ...item('No model', 0, 0), grams: null, minutes: null }], fees: [] });
    expect(s.lines[0].amountMinor).toBe(0);
    expect(s.notes[0]).toMatch(/no estimate/);
    expect(s.totalMinor).toBe(0);
  });
});

describe('statement · non-commercial licences', () => {
  it('statement · every NC licence on the list · flagged with its name and the author; others not', () => {
    // SPDX License List: the -NC- identifiers are the non-commercial Creative Commons licences
    for (const id of ['CC-BY-NC-4.0', 'CC-BY-NC-SA-4.0', 'CC-BY-NC-ND-4.0']) {
      const c = nonCommercialCaution('Hood clip', id, 'Ines Varga')!;
      expect(c).toMatch(/non-commercial/);
      expect(c).toContain(id.replace('CC-BY-', 'CC BY-').replace(/-4\.0$/, ' 4.0'));
      expect(c).toMatch(/Ask the author, Ines Varga/);
    }
    for (const id of ['CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'MIT', 'GPL-3.0-or-later', 'CERN-OHL-S-2.0'])
      expect(nonCommercialCaution('Hood clip', id, 'x')).toBeNull();
  });
});

describe('config · payments', () => {
  const base = { DB_PASSWORD: 'x', SESSION_SECRET: 'a'.repeat(40) };
  it('config · defaults · the local fake on a free loopback port, webhooks to PUBLIC_URL', () => {
    const c = loadConfig({ ...base, PUBLIC_URL: 'http://127.0.0.1:4000' });
    expect(c.PAYMENTS_FAKE).toBe(true);
    expect(c.PAYMENTS_WEBHOOK_URL).toBe('http://127.0.0.1:4000/api/payments/webhook');
  });
  it('config · the fake on a public host, or one real key without the other · refused with the variable named', () => {
    expect(() => loadConfig({ ...base, PAYMENTS_API_HOST: 'pay.example.org' })).toThrow(/PAYMENTS_API_HOST/);
    expect(() => loadConfig({ ...base, NODE_ENV: 'production', PAYMENTS_SECRET_KEY: 'sk_live_something' })).toThrow(/PAYMENTS_WEBHOOK_SECRET/);
    const real = loadConfig({ ...base, NODE_ENV: 'production', PAYMENTS_SECRET_KEY: 'sk_live_something', PAYMENTS_WEBHOOK_SECRET: 'whsec_something' });
    expect(real).toMatchObject({ PAYMENTS_FAKE: false, paymentsConfigured: true });
  });

  it('config · production with no payment keys · starts, with paying back off', () => {
    const c = loadConfig({ ...base, NODE_ENV: 'production' });
    expect(c).toMatchObject({ PAYMENTS_FAKE: false, paymentsConfigured: false });
  });
});
