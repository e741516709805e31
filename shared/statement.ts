// A kit's statement for the production office: one line per item (priced like a print request:
// filament, electricity, machine time), the kit's fee lines, the subtotal, tax at the crew's rate and
// the total, all in integer minor units of the crew's currency. Every line is rounded once; the
// subtotal is the sum of the lines, tax is rounded once on the subtotal, and total = subtotal + tax,
// so the lines add up to the total to the cent. Parts under a non-commercial licence are flagged:
// billing them to a production is commercial use.
import { licenceInfo, isLicenceId } from './licences';
import { computePrintPrice, percentOf, sumMinor, toMinor, type PriceSheetTerms } from './print-price';

export interface StatementItemInput {
  title: string;
  quantity: number;
  material: string;
  /** All pieces; null when the item has no estimate (it is listed, not priced). */
  grams: number | null;
  minutes: number | null;
  watts: number | null;
  licence: string;
  author: string;
}

export interface StatementInput {
  currency: string;
  taxRatePct: number | null;
  terms: PriceSheetTerms;
  items: readonly StatementItemInput[];
  fees: readonly { label: string; amount: number }[];
}

export interface StatementLine {
  kind: 'item' | 'fee';
  title: string;
  quantity: number | null;
  material: string | null;
  grams: number | null;
  hours: number | null;
  filamentMinor: number;
  energyMinor: number;
  machineMinor: number;
  amountMinor: number;
  licence: string | null;
  /** Set for parts under a non-commercial licence. */
  caution: string | null;
}

export interface StatementFigures {
  currency: string;
  taxRatePct: number | null;
  lines: StatementLine[];
  subtotalMinor: number;
  taxMinor: number;
  totalMinor: number;
  cautions: string[];
  notes: string[];
}

export function nonCommercialCaution(title: string, licence: string, author: string): string | null {
  if (!isLicenceId(licence)) return null;
  const info = licenceInfo(licence);
  if (!info.nonCommercial) return null;
  return `${title} is under ${info.shortName} (${info.name}), a non-commercial licence: billing it to a production is commercial use. Ask the author, ${author}, for permission before you charge for it.`;
}

export function buildStatement(input: StatementInput): StatementFigures {
  const { currency } = input;
  const lines: StatementLine[] = [];
  const cautions: string[] = [];
  const notes: string[] = [];
  for (const item of input.items) {
    const caution = nonCommercialCaution(item.title, item.licence, item.author);
    if (caution) cautions.push(caution);
    if (item.grams === null || item.minutes === null) {
      notes.push(`${item.title} has no estimate and is listed without a cost.`);
      lines.push({
        kind: 'item',
        title: item.title,
        quantity: item.quantity,
        material: item.material,
        grams: null,
        hours: null,
        filamentMinor: 0,
        energyMinor: 0,
        machineMinor: 0,
        amountMinor: 0,
        licence: item.licence,
        caution,
      });
      continue;
    }
    const price = computePrintPrice(
      { filament: [{ material: item.material, grams: item.grams }], minutes: item.minutes, watts: item.watts },
      input.terms,
      currency,
    );
    const of = (kind: string) =>
      sumMinor(
        price.lines.filter((l) => l.kind === kind).map((l) => l.amountMinor),
        currency,
      );
    lines.push({
      kind: 'item',
      title: item.title,
      quantity: item.quantity,
      material: item.material,
      grams: price.figures.grams,
      hours: price.figures.hours,
      filamentMinor: of('filament'),
      energyMinor: of('energy'),
      machineMinor: of('machine'),
      amountMinor: price.totalMinor,
      licence: item.licence,
      caution,
    });
  }
  for (const fee of input.fees) {
    const amount = toMinor(fee.amount, currency);
    lines.push({
      kind: 'fee',
      title: fee.label,
      quantity: null,
      material: null,
      grams: null,
      hours: null,
      filamentMinor: 0,
      energyMinor: 0,
      machineMinor: 0,
      amountMinor: amount,
      licence: null,
      caution: null,
    });
  }
  const subtotalMinor = sumMinor(
    lines.map((l) => l.amountMinor),
    currency,
  );
  const taxMinor = input.taxRatePct ? percentOf(subtotalMinor, input.taxRatePct, currency) : 0;
  return {
    currency,
    taxRatePct: input.taxRatePct,
    lines,
    subtotalMinor,
    taxMinor,
    totalMinor: sumMinor([subtotalMinor, taxMinor], currency),
    cautions,
    notes,
  };
}
