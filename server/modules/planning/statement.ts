// A kit's statement for the production office, as data (shared/statement.ts does the sums), CSV and
// PDF (pdfmake, with the Roboto fonts it ships). Priced with the kit owner's price sheet, in the
// currency and at the tax rate of the crew it is billed through.
import { createRequire } from 'node:module';
import { dirname, resolve } from 'node:path';
import pdfmake from 'pdfmake';
import { Op } from 'sequelize';
import type { StatementInfo } from '@shared/api/statement';
import { toCsv, type CsvCell } from '@shared/csv';
import { minorToDecimal } from '@shared/print-price';
import { buildStatement } from '@shared/statement';
import type { StatementDetailsInput } from '@shared/schemas/print-requests';
import { Crew, CrewMember, Kit, KitCrewShare, Part, PartRevision, PriceSheet, Printer, User } from '../../db/models';
import { AppError } from '../../errors';
import { findKit } from './access';
import { effectivePrices } from './presenter';
import type { PlanningService } from './service';
import { kitCsvFileName } from './export';

const fontDir = resolve(dirname(createRequire(import.meta.url).resolve('pdfmake/package.json')), 'fonts/Roboto');
pdfmake.setFonts({
  Roboto: {
    normal: resolve(fontDir, 'Roboto-Regular.ttf'),
    bold: resolve(fontDir, 'Roboto-Medium.ttf'),
    italics: resolve(fontDir, 'Roboto-Italic.ttf'),
    bolditalics: resolve(fontDir, 'Roboto-MediumItalic.ttf'),
  },
});
// nothing from the network, and from disk only the fonts
pdfmake.setUrlAccessPolicy(() => false);
pdfmake.setLocalAccessPolicy((path) => resolve(path).startsWith(fontDir));

async function crewFor(viewer: User, kit: Kit, crewId: number | undefined): Promise<Crew> {
  const mine = (await CrewMember.findAll({ where: { userId: viewer.id }, attributes: ['crewId'] })).map((m) => m.crewId);
  if (crewId !== undefined) {
    if (!mine.includes(crewId)) throw AppError.notFound('There is no crew with that id among yours.');
    return (await Crew.findByPk(crewId))!;
  }
  const shared = (await KitCrewShare.findAll({ where: { kitId: kit.id }, attributes: ['crewId'], order: [['id', 'ASC']] })).map((s) => s.crewId);
  const owners = (await CrewMember.findAll({ where: { userId: kit.ownerId }, attributes: ['crewId'], order: [['crewId', 'ASC']] })).map((m) => m.crewId);
  const pick = [...shared, ...owners, ...mine].find((id) => mine.includes(id));
  if (!pick) {
    throw AppError.field('crewId', 'Choose a crew of yours.', 'A statement is billed through a crew (its currency and tax rate); join or create a crew first.');
  }
  return (await Crew.findByPk(pick))!;
}

export async function loadStatement(planning: Pick<PlanningService, 'summary'>, viewer: User, kitId: number, crewId?: number): Promise<StatementInfo> {
  const { kit } = await findKit(viewer, kitId, 'read');
  const crew = await crewFor(viewer, kit, crewId);
  const summary = await planning.summary(viewer, kitId);
  const sheet = await PriceSheet.findByPk(kit.ownerId);
  const printerIds = summary.items.flatMap((i) => (i.printer ? [i.printer.id] : []));
  const printers = printerIds.length ? await Printer.findAll({ where: { id: { [Op.in]: printerIds } } }) : [];
  const partIds = summary.items.flatMap((i) => (i.part ? [i.part.id] : [])); // made-to-size items have no shelf part
  const parts = partIds.length
    ? await Part.findAll({
        where: { id: { [Op.in]: partIds } },
        include: [
          { model: PartRevision, as: 'publishedRevision' },
          { model: User, as: 'author' },
        ],
      })
    : [];
  const figures = buildStatement({
    currency: crew.currency,
    taxRatePct: crew.taxRatePct,
    terms: { pricesPerKg: effectivePrices(sheet), pricePerKwh: sheet?.pricePerKwh ?? null, machineHourRate: sheet?.machineHourRate ?? null },
    items: summary.items.map((i) => {
      const part = parts.find((p) => p.id === i.part?.id);
      return {
        title: i.title,
        quantity: i.quantity,
        material: i.material,
        grams: i.total?.massG ?? null,
        minutes: i.total ? i.total.hours * 60 : null,
        watts: printers.find((p) => p.id === i.printer?.id)?.watts ?? null,
        licence: part?.publishedRevision?.licence ?? '',
        author: (part as (Part & { author?: User }) | undefined)?.author?.displayName ?? 'the author',
      };
    }),
    fees: kit.statementFees ?? [],
  });
  return {
    kit: { id: kit.id, name: kit.name, production: kit.production, startsOn: kit.startsOn, endsOn: kit.endsOn },
    crew: { id: crew.id, name: crew.name, production: crew.production },
    purchaseOrder: kit.purchaseOrder ?? null,
    fees: kit.statementFees ?? [],
    issuedOn: new Date().toISOString().slice(0, 10),
    ...figures,
  };
}

export async function saveStatementDetails(viewer: User, kitId: number, input: StatementDetailsInput): Promise<void> {
  const { kit } = await findKit(viewer, kitId, 'edit');
  await kit.update({
    ...(input.purchaseOrder !== undefined ? { purchaseOrder: input.purchaseOrder?.trim() ? input.purchaseOrder.trim() : null } : {}),
    ...(input.fees !== undefined ? { statementFees: input.fees.length ? input.fees : null } : {}),
  });
}

export const STATEMENT_CSV_COLUMNS = [
  'Line',
  'Quantity',
  'Material',
  'Grams',
  'Hours',
  'Filament',
  'Electricity',
  'Machine time',
  'Amount',
  'Licence',
  'Caution',
] as const;

export function statementFileName(s: StatementInfo, ext: 'csv' | 'pdf'): string {
  return kitCsvFileName(`${s.kit.name} statement`, s.kit.id).replace(/\.csv$/, `.${ext}`);
}

/** The statement as CSV: amounts as plain decimals in the crew's currency, named in the header rows. */
export function statementCsv(s: StatementInfo): string {
  const money = (minor: number) => minorToDecimal(minor, s.currency);
  const rows: CsvCell[][] = [
    ['Statement', s.kit.name],
    ['Production', s.kit.production ?? s.crew.production ?? ''],
    ['Crew', s.crew.name],
    ['Purchase order', s.purchaseOrder ?? ''],
    ['Currency', s.currency],
    ['Issued on', s.issuedOn],
    [],
    [...STATEMENT_CSV_COLUMNS],
  ];
  for (const l of s.lines) {
    rows.push([
      l.title,
      l.quantity,
      l.material ?? '',
      l.grams,
      l.hours,
      l.kind === 'item' ? money(l.filamentMinor) : '',
      l.kind === 'item' ? money(l.energyMinor) : '',
      l.kind === 'item' ? money(l.machineMinor) : '',
      money(l.amountMinor),
      l.licence ?? '',
      l.caution ?? '',
    ]);
  }
  rows.push(['Subtotal', null, '', null, null, '', '', '', money(s.subtotalMinor), '', '']);
  rows.push([`Tax${s.taxRatePct ? ` ${s.taxRatePct} %` : ''}`, null, '', null, null, '', '', '', money(s.taxMinor), '', '']);
  rows.push(['Total', null, '', null, null, '', '', '', money(s.totalMinor), '', '']);
  for (const n of s.notes) rows.push(['Note', null, '', null, null, '', '', '', '', '', n]);
  return '\ufeff' + toCsv(rows);
}

export async function statementPdf(s: StatementInfo): Promise<Buffer> {
  const money = (minor: number) => `${minorToDecimal(minor, s.currency)}`;
  const right = (text: string, bold = false) => ({ text, alignment: 'right', bold });
  const body: unknown[][] = [
    ['Line', 'Qty', 'Material', right('Grams'), right('Hours'), right(`Amount (${s.currency})`)].map((c) =>
      typeof c === 'string' ? { text: c, bold: true } : { ...c, bold: true },
    ),
  ];
  for (const l of s.lines) {
    body.push([
      { text: [l.title, ...(l.caution ? [{ text: '  NC licence: see caution', color: '#9a3412', bold: true }] : [])] },
      l.quantity ?? '',
      l.material ?? (l.kind === 'fee' ? 'fee' : ''),
      right(l.grams === null ? '' : l.grams.toFixed(1)),
      right(l.hours === null ? '' : l.hours.toFixed(2)),
      right(money(l.amountMinor)),
    ]);
  }
  body.push([{ text: 'Subtotal', colSpan: 5, bold: true }, '', '', '', '', right(money(s.subtotalMinor), true)]);
  body.push([{ text: `Tax${s.taxRatePct ? ` at ${s.taxRatePct} %` : ''}`, colSpan: 5 }, '', '', '', '', right(money(s.taxMinor))]);
  body.push([{ text: 'Total', colSpan: 5, bold: true }, '', '', '', '', right(`${money(s.totalMinor)} ${s.currency}`, true)]);

  const doc = {
    info: { title: `Statement: ${s.kit.name}`, creator: 'Rigshelf' },
    pageSize: 'A4',
    pageMargins: [40, 48, 40, 48],
    defaultStyle: { font: 'Roboto', fontSize: 10 },
    content: [
      { text: 'Statement for the production office', fontSize: 16, bold: true, margin: [0, 0, 0, 6] },
      {
        columns: [
          { stack: [`Kit: ${s.kit.name}`, `Production: ${s.kit.production ?? s.crew.production ?? '—'}`, `Crew: ${s.crew.name}`] },
          { stack: [`Purchase order: ${s.purchaseOrder ?? '—'}`, `Currency: ${s.currency}`, `Issued on: ${s.issuedOn}`], alignment: 'right' },
        ],
        margin: [0, 0, 0, 12],
      },
      { table: { headerRows: 1, widths: ['*', 30, 55, 50, 45, 80], body }, layout: 'lightHorizontalLines' },
      ...(s.cautions.length
        ? [
            { text: 'Licence cautions', bold: true, color: '#9a3412', margin: [0, 14, 0, 4] },
            { ul: s.cautions, color: '#9a3412' },
          ]
        : []),
      ...(s.notes.length ? [{ text: 'Notes', bold: true, margin: [0, 12, 0, 4] }, { ul: s.notes }] : []),
      {
        text: 'Each line is priced from the print estimate with the kit owner’s prices (filament per kg, electricity per kWh, machine time per hour) and rounded once to the cent; the subtotal is the sum of the lines, tax is worked out once on the subtotal.',
        fontSize: 8,
        color: '#555555',
        margin: [0, 14, 0, 0],
      },
    ],
  };
  return pdfmake.createPdf(doc).getBuffer();
}
