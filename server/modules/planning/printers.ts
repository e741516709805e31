// A member's own printers; kit items on a deleted printer keep their place with no printer chosen.
import type { PrinterInfo, PrinterList } from '@shared/api/planning';
import { DEFAULT_BED_MARGIN_MM } from '@shared/estimate';
import { MAX_PRINTERS, type PrinterInput, type PrinterPatch } from '@shared/schemas/planning';
import { KitItem, Printer, type User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { presentPrinter } from './presenter';
import type { PlanningDeps } from './service';
import { defined, textOrNull } from './values';

async function ownPrinter(owner: User, id: number): Promise<Printer> {
  const printer = await Printer.findOne({ where: { id, ownerId: owner.id } });
  if (!printer) throw AppError.notFound('There is no printer with that id among yours.');
  return printer;
}

export function printerService({ sequelize }: Pick<PlanningDeps, 'sequelize'>) {
  return {
    async listPrinters(owner: User): Promise<PrinterList> {
      const printers = await Printer.findAll({
        where: { ownerId: owner.id },
        order: [
          ['name', 'ASC'],
          ['id', 'ASC'],
        ],
      });
      return { items: printers.map(presentPrinter) };
    },

    async getPrinter(owner: User, id: number): Promise<PrinterInfo> {
      return presentPrinter(await ownPrinter(owner, id));
    },

    async createPrinter(owner: User, input: PrinterInput): Promise<PrinterInfo> {
      if ((await Printer.count({ where: { ownerId: owner.id } })) >= MAX_PRINTERS) {
        throw AppError.conflict(`You have ${MAX_PRINTERS} printers already; delete one you no longer use first.`);
      }
      const printer = await Printer.create({
        ownerId: owner.id,
        name: input.name,
        bedXMm: input.bedMm[0],
        bedYMm: input.bedMm[1],
        bedZMm: input.bedMm[2],
        bedMarginMm: input.bedMarginMm ?? DEFAULT_BED_MARGIN_MM,
        nozzleMm: input.nozzleMm,
        watts: input.watts ?? null,
        notes: textOrNull(input.notes),
      });
      return presentPrinter(await printer.reload());
    },

    async updatePrinter(owner: User, id: number, patch: PrinterPatch): Promise<PrinterInfo> {
      const printer = await ownPrinter(owner, id);
      await printer.update(
        defined({
          name: patch.name,
          bedXMm: patch.bedMm?.[0],
          bedYMm: patch.bedMm?.[1],
          bedZMm: patch.bedMm?.[2],
          bedMarginMm: patch.bedMarginMm,
          nozzleMm: patch.nozzleMm,
          watts: patch.watts,
          notes: patch.notes === undefined ? undefined : textOrNull(patch.notes),
        }),
      );
      return presentPrinter(await printer.reload());
    },

    /** Kit items on this printer keep their place with no printer chosen. */
    async deletePrinter(owner: User, id: number): Promise<void> {
      const printer = await ownPrinter(owner, id);
      await transact(sequelize, async (t) => {
        await KitItem.update({ printerId: null }, { where: { printerId: printer.id }, transaction: t });
        await printer.destroy({ transaction: t });
      });
    },
  };
}
