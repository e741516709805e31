// A kit as a spreadsheet for the prep-day printer cart: one row per item, then the totals.
import type { KitSummaryResponse } from '@shared/api/planning';
import { toCsv, type CsvCell } from '@shared/csv';

/** A byte-order mark, so spreadsheet programs open the file as UTF-8 (°, ×, accents). */
const BOM = '\ufeff';

export const KIT_CSV_COLUMNS = [
  'Part',
  'Quantity',
  'Material',
  'Printer',
  'Grams',
  'Metres (1.75 mm)',
  'Hours',
  'Cost',
  'Fit',
  'Heat warning',
  'Cautions',
  'Notes',
] as const;

const round = (value: number, digits: number) => Number(value.toFixed(digits));

/** A file name from the kit name: lower-case ASCII words joined by hyphens. */
export function kitCsvFileName(name: string, id: number): string {
  const base = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return `${base || `kit-${id}`}.csv`;
}

export function kitCsv(summary: KitSummaryResponse): string {
  const rows: CsvCell[][] = [[...KIT_CSV_COLUMNS]];
  for (const item of summary.items) {
    const fitNote = item.fit && item.fit.fits !== 'as-is' ? [item.fit.message] : [];
    rows.push([
      item.title,
      item.quantity,
      item.material,
      item.printer?.name ?? '',
      item.total ? round(item.total.massG, 1) : null,
      item.total ? round(item.total.lengthM['1.75'], 2) : null,
      item.total ? round(item.total.hours, 2) : null,
      item.total ? round(item.total.printCost, 2) : null,
      item.fit?.fits ?? (item.printer ? 'size unknown' : 'no printer'),
      item.heat && !item.heat.ok ? item.heat.message : '',
      item.cautions.map((c) => c.text).join(' '),
      [...fitNote, ...item.evidenceWarnings.map((w) => `Set reports: ${w.text}.`), ...item.notes].join(' '),
    ]);
  }

  const t = summary.totals;
  for (const m of t.byMaterial) {
    rows.push([
      `Total ${m.material}`,
      m.pieces,
      m.material,
      '',
      round(m.grams, 1),
      round(m.lengthM['1.75'], 2),
      round(m.hours, 2),
      round(m.filamentCost, 2),
      '',
      '',
      '',
      `${m.spools} ${m.spools === 1 ? 'spool' : 'spools'} of 1 kg; ${round(m.lengthM['2.85'], 2)} m of 2.85 mm filament`,
    ]);
  }
  for (const p of t.byPrinter) {
    rows.push([
      p.printer ? `Printing on ${p.printer.name}` : 'Printing, no printer chosen',
      p.pieces,
      '',
      p.printer?.name ?? '',
      null,
      null,
      round(p.hours, 2),
      null,
      '',
      '',
      '',
      `${p.days} ${p.days === 1 ? 'day' : 'days'} at ${summary.kit.printHoursPerDay} h a day`,
    ]);
  }
  rows.push([
    'Total',
    t.pieces,
    '',
    '',
    round(t.grams, 1),
    round(t.lengthM['1.75'], 2),
    round(t.hours, 2),
    round(t.printCost, 2),
    '',
    '',
    '',
    `Filament ${t.filamentCost.toFixed(2)}, electricity ${t.energyCost.toFixed(2)}; ${t.daysOfPrinting} ${t.daysOfPrinting === 1 ? 'day' : 'days'} of printing`,
  ]);

  const b = summary.buyOrPrint;
  const comparison = (label: string, c: typeof b.buying) =>
    c &&
    rows.push([
      label,
      null,
      '',
      '',
      null,
      null,
      null,
      round(c.total, 2),
      '',
      '',
      '',
      `${c.items} ${c.items === 1 ? 'item' : 'items'}; printing them costs ${c.printCost.toFixed(2)}, saving ${c.savings.toFixed(2)}`,
    ]);
  comparison('Buying instead', b.buying);
  comparison('Print service instead', b.printService);
  if (b.payback) rows.push(['Printer payback', null, '', '', null, null, null, round(b.payback.printerPrice, 2), '', '', '', b.payback.message]);

  return BOM + toCsv(rows);
}
