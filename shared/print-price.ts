// What a print costs the member who asks for it, in the crew's currency, computed with dinero.js in
// integer minor units (never floats for money):
// - filament = grams ÷ 1000 × the owner's price per kg for the material;
// - energy = watts × hours ÷ 1000 × price per kWh (definition of the kilowatt-hour), when the printer's
//   watts and the owner's price per kWh are known;
// - machine time = hours × the owner's machine-hour rate, when they set one.
// The quantities are rounded before they are priced (grams to 0.1 g, energy to 1 Wh, hours to 0.01 h),
// each line is rounded once to the currency's minor unit (half up), and the total is the sum of the
// rounded lines, so the lines always add up to the total.
import { add, dinero, halfUp, multiply, toDecimal, toSnapshot, transformScale, type Dinero, type DineroCurrency } from 'dinero.js';
import * as iso4217 from 'dinero.js/currencies';

export type CurrencyCode = string;

/** Prices are typed with at most this many decimals (price per kg, per kWh, per hour). */
const PRICE_SCALE = 4;

export function currencyOf(code: CurrencyCode): DineroCurrency<number> {
  const c = (iso4217 as Record<string, DineroCurrency<number> | undefined>)[code.toUpperCase()];
  if (!c || typeof c !== 'object' || !('exponent' in c)) throw new RangeError(`${code} is not an ISO 4217 currency code.`);
  return c;
}

export function isCurrencyCode(code: string): boolean {
  try {
    currencyOf(code);
    return true;
  } catch {
    return false;
  }
}

/** A decimal price as typed (e.g. 22.5 per kg) as an exact scaled amount. */
export function priceAmount(value: number, code: CurrencyCode): Dinero<number> {
  if (!Number.isFinite(value) || value < 0) throw new RangeError('A price must be a number ≥ 0.');
  // a price parsed from at most 4 decimals is the nearest double to that decimal: rounding recovers it
  return dinero({ amount: Math.round(value * 10 ** PRICE_SCALE), currency: currencyOf(code), scale: PRICE_SCALE });
}

/** A decimal amount in currency units (e.g. a kit fee of 12.50) as minor units (1250). */
export function toMinor(value: number, code: CurrencyCode): number {
  return minorOf(priceAmount(value, code));
}

function minorOf(amount: Dinero<number>): number {
  const c = toSnapshot(amount).currency;
  return toSnapshot(transformScale(amount, c.exponent, halfUp)).amount;
}

function fromMinor(minor: number, code: CurrencyCode): Dinero<number> {
  const c = currencyOf(code);
  return dinero({ amount: minor, currency: c, scale: c.exponent });
}

/** Minor units as a plain decimal string in the currency's own digits ("12.50", "1250" for JPY). */
export function minorToDecimal(minor: number, code: CurrencyCode): string {
  return toDecimal(fromMinor(minor, code));
}

/** Adds minor-unit amounts of one currency through dinero.js. */
export function sumMinor(amounts: readonly number[], code: CurrencyCode): number {
  return toSnapshot(amounts.reduce((acc, m) => add(acc, fromMinor(m, code)), fromMinor(0, code))).amount;
}

/** `rate` percent of `minor`, rounded half up to the minor unit (rate typed with at most 2 decimals). */
export function percentOf(minor: number, ratePct: number, code: CurrencyCode): number {
  if (!Number.isFinite(ratePct) || ratePct < 0) throw new RangeError('A rate must be a number ≥ 0.');
  const hundredthsOfPct = Math.round(ratePct * 100);
  return minorOf(multiply(fromMinor(minor, code), { amount: hundredthsOfPct, scale: 4 }));
}

export interface PriceSheetTerms {
  /** The owner's price per kg per material; the shelf's default where they named none. */
  pricesPerKg: Record<string, number>;
  pricePerKwh: number | null;
  machineHourRate: number | null;
}

export interface PrintFigures {
  /** Grams per material, all pieces together. */
  filament: readonly { material: string; grams: number }[];
  minutes: number;
  /** The printer's power; null when unknown. */
  watts: number | null;
}

export type PriceLineKind = 'filament' | 'energy' | 'machine';

export interface PriceLine {
  kind: PriceLineKind;
  label: string;
  /** The quantity and rate it was priced at, as a person reads it. */
  basis: string;
  amountMinor: number;
}

export interface PrintPrice {
  currency: CurrencyCode;
  lines: PriceLine[];
  totalMinor: number;
  /** The rounded quantities that were priced. */
  figures: { grams: number; hours: number; wattHours: number | null };
  notes: string[];
}

export function roundedGrams(grams: number): number {
  return Math.round(grams * 10) / 10;
}

export function computePrintPrice(figures: PrintFigures, terms: PriceSheetTerms, currency: CurrencyCode): PrintPrice {
  if (figures.filament.some((f) => !(f.grams >= 0)) || !(figures.minutes >= 0)) throw new RangeError('Grams and minutes must be numbers ≥ 0.');
  const code = currencyOf(currency).code;
  const centiHours = Math.round((figures.minutes * 100) / 60);
  const lines: PriceLine[] = [];
  const notes: string[] = [];

  let totalDecigrams = 0;
  for (const { material, grams } of figures.filament) {
    const decigrams = Math.round(grams * 10);
    totalDecigrams += decigrams;
    const pricePerKg = terms.pricesPerKg[material];
    if (pricePerKg === undefined) throw new RangeError(`There is no price per kg for ${material}.`);
    // decigrams × 10⁻⁴ = kilograms
    const filament = multiply(priceAmount(pricePerKg, code), { amount: decigrams, scale: 4 });
    lines.push({
      kind: 'filament',
      label: `Filament (${material})`,
      basis: `${(decigrams / 10).toFixed(1)} g at ${pricePerKg} ${code}/kg`,
      amountMinor: minorOf(filament),
    });
  }

  let wattHours: number | null = null;
  if (figures.watts !== null && terms.pricePerKwh !== null) {
    wattHours = Math.round((figures.watts * figures.minutes) / 60);
    // watt-hours × 10⁻³ = kilowatt-hours
    const energy = multiply(priceAmount(terms.pricePerKwh, code), { amount: wattHours, scale: 3 });
    lines.push({
      kind: 'energy',
      label: 'Electricity',
      basis: `${(wattHours / 1000).toFixed(3)} kWh (${figures.watts} W × ${(centiHours / 100).toFixed(2)} h) at ${terms.pricePerKwh} ${code}/kWh`,
      amountMinor: minorOf(energy),
    });
  } else {
    notes.push(
      figures.watts === null
        ? 'The printer’s power is not set, so electricity is not charged.'
        : 'The owner has no price per kWh, so electricity is not charged.',
    );
  }

  if (terms.machineHourRate !== null && terms.machineHourRate > 0) {
    const machine = multiply(priceAmount(terms.machineHourRate, code), { amount: centiHours, scale: 2 });
    lines.push({
      kind: 'machine',
      label: 'Machine time',
      basis: `${(centiHours / 100).toFixed(2)} h at ${terms.machineHourRate} ${code}/h`,
      amountMinor: minorOf(machine),
    });
  }

  return {
    currency: code,
    lines,
    totalMinor: sumMinor(
      lines.map((l) => l.amountMinor),
      code,
    ),
    figures: { grams: totalDecigrams / 10, hours: centiHours / 100, wattHours },
    notes,
  };
}
