// Making parts to size: the makers' list, previews (measured, estimated, checked against the chosen
// printer, material and heat) and files, all generated in the make worker pool; and each printer's
// calibration per material, applied to every maker when that printer is chosen. Nothing made here is
// stored: a made part is kept only when it goes into a kit or onto the shelf.
import { availableParallelism } from 'node:os';
import type { CalibrationInfo, CalibrationList, MakePreview, MakerInfo, MakerList } from '@shared/api/make';
import { DEFAULT_PRICE_PER_KG, estimatePrint, fitOnBed, type PrintSettings } from '@shared/estimate';
import type { Corrections } from '@shared/make';
import { heatCheck, type MaterialId } from '@shared/materials';
import { meshConcerns } from '@shared/mesh/concerns';
import { safetyCautions } from '@shared/safety';
import { MAX_LAYER_TO_NOZZLE } from '@shared/schemas/recipe';
import { MADE_PART_RECIPE, type CalibrationInput, type MadeKitItemInput, type MakeFormat, type MakeRequest } from '@shared/schemas/make';
import type { Sequelize } from 'sequelize';
import type { KitItemInfo } from '@shared/api/planning';
import { MAX_KIT_ITEMS } from '@shared/schemas/planning';
import { KitItem, PriceSheet, Printer, PrinterCalibration, type User } from '../../db/models';
import { transact } from '../../db/transaction';
import { findKit } from '../planning/access';
import { loadItems, presentItem } from '../planning/presenter';
import { AppError } from '../../errors';
import { WorkerBusyError, WorkerCrashedError, WorkerPool, WorkerTimeoutError, type WorkerPoolOptions } from '../files/worker-pool';
import type { MakeJob, MakeResult } from './make-tasks';
import { generatorOf, jsonSchemaOf, madeTitle, makers, parseParams, presentCalibration, round } from './made';
import { workerModuleUrl } from '../../worker-module';

export const MAKE_POOL: WorkerPoolOptions = {
  name: 'make',
  // generation is short; two threads at most leave the event loop and the database a core
  maxThreads: Math.max(1, Math.min(2, availableParallelism() - 1)),
  maxQueue: 32,
  memoryMb: 512,
  // a preview takes well under a second at the finest resolution; more means something is wrong
  timeoutMs: 15_000,
  nice: 5,
  tasks: workerModuleUrl('./make-tasks', import.meta.url),
};

export interface MadeMesh {
  params: Record<string, unknown>;
  result: MakeResult;
  corrections: MakePreview['corrections'];
  printer: Printer | null;
}

export function createMakeService() {
  let pool: WorkerPool<typeof import('./make-tasks')> | null = null;
  const run = async (job: MakeJob): Promise<MakeResult> => {
    pool ??= new WorkerPool<typeof import('./make-tasks')>(MAKE_POOL);
    try {
      return await pool.run('makePart', job);
    } catch (err) {
      if (err instanceof WorkerBusyError) throw new AppError(503, 'busy', 'Many parts are being made right now. Try again in a moment.');
      if (err instanceof WorkerTimeoutError || err instanceof WorkerCrashedError) {
        throw new AppError(422, 'too_complex', 'Making this part took too long and was stopped. Use a coarser resolution or smaller sizes.');
      }
      // a generator refuses a combination its schema let through (e.g. a hole wider than the part)
      if (err instanceof RangeError || (err instanceof Error && err.name === 'MakeError')) {
        throw AppError.field('params', err.message);
      }
      throw err;
    }
  };

  async function ownPrinter(viewer: User | undefined, printerId: number | null | undefined): Promise<Printer | null> {
    if (printerId == null) return null;
    const printer = viewer ? await Printer.findOne({ where: { id: printerId, ownerId: viewer.id } }) : null;
    if (!printer) {
      const message = viewer ? 'That printer is not one of yours; pick one of your printers or none.' : 'Sign in to make parts for one of your printers.';
      throw AppError.field('printerId', message);
    }
    return printer;
  }

  async function correctionsFor(printer: Printer | null, material: MaterialId): Promise<MakePreview['corrections']> {
    if (!printer) return null;
    const c = await PrinterCalibration.findOne({ where: { printerId: printer.id, material } });
    if (!c) return null;
    return { holeMm: c.holeCorrectionMm, outerMm: c.outerCorrectionMm ?? 0, printer: printer.name, material };
  }

  async function make(viewer: User | undefined, kind: string, input: MakeRequest, extra: Pick<MakeJob, 'format'> = {}): Promise<MadeMesh> {
    const params = parseParams(kind, input.params);
    const printer = await ownPrinter(viewer, input.printerId);
    const corrections = await correctionsFor(printer, input.material);
    const c: Corrections = corrections ? { holeMm: corrections.holeMm, outerMm: corrections.outerMm } : {};
    const result = await run({ kind, params, corrections: c, ...extra });
    return { params, result, corrections, printer };
  }

  return {
    list(): MakerList {
      const items: MakerInfo[] = Object.entries(makers).map(([kind, g]) => ({
        kind,
        title: g.title,
        summary: g.summary,
        fields: g.fields,
        schema: jsonSchemaOf(g.schema),
        defaults: g.defaults as Record<string, unknown>,
      }));
      return { items };
    },

    make,

    async preview(viewer: User | undefined, kind: string, input: MakeRequest): Promise<MakePreview> {
      generatorOf(kind);
      const nozzleMm =
        input.recipe.nozzleMm ?? (input.printerId != null ? (await ownPrinter(viewer, input.printerId))?.nozzleMm : undefined) ?? MADE_PART_RECIPE.nozzleMm;
      const s = { ...MADE_PART_RECIPE, ...input.recipe, nozzleMm };
      if (s.layerMm > Math.round(s.nozzleMm * MAX_LAYER_TO_NOZZLE * 1000) / 1000) {
        const message = `A ${s.layerMm} mm layer is too thick for a ${s.nozzleMm} mm nozzle; use at most ${round(s.nozzleMm * MAX_LAYER_TO_NOZZLE, 3)} mm.`;
        throw AppError.field('recipe.layerMm', message);
      }
      // the quick estimate from the mesh's figures, as a kit plans a made item: slicing a toothed ring
      // takes seconds, and the preview answers while the member types
      const { result, corrections, printer } = await make(viewer, kind, input);
      const { analysis } = result;

      const sheet = viewer ? await PriceSheet.findByPk(viewer.id) : null;
      const pricePerKg = sheet?.pricesPerKg[input.material] ?? DEFAULT_PRICE_PER_KG[input.material];
      const settings: PrintSettings = {
        material: input.material,
        nozzleMm: s.nozzleMm,
        layerMm: s.layerMm,
        walls: s.walls,
        topBottomLayers: s.topBottomLayers,
        infillPct: s.infillPct,
        speedMmS: s.speedMmS,
        pricePerKg,
        printerWatts: printer?.watts ?? undefined,
        pricePerKwh: printer?.watts ? (sheet?.pricePerKwh ?? undefined) : undefined,
      };
      const e = analysis.volumeMm3 > 0 ? estimatePrint({ volumeMm3: analysis.volumeMm3, areaMm2: analysis.areaMm2, sizeMm: analysis.sizeMm }, settings) : null;
      const estimate = e
        ? {
            volumeMm3: e.volumeMm3,
            massG: e.massG,
            lengthM: e.lengthM,
            timeMin: e.timeMin,
            cost: e.cost,
            pricePerKg,
            partsMm3: e.partsMm3,
            method: e.method,
            assumptions: e.assumptions,
          }
        : null;

      const bedFit = printer ? { ...fitOnBed(analysis.sizeMm, printer.bedMm(), { marginMm: printer.bedMarginMm }), printer: printer.name } : null;
      const heat = input.exposure ? { ...heatCheck(input.material, input.exposure), exposure: input.exposure } : null;
      const cautions = result.loadBearing ? safetyCautions({ carriesLoad: true, overhead: false, vehicle: false, heat: false }, null, [input.material]) : [];
      const warnings = [
        ...meshConcerns(analysis).map((c) => `The made mesh is not sound (${c}); please tell us which sizes did this.`),
        ...result.warnings,
        ...(bedFit && bedFit.fits !== 'as-is' ? [bedFit.message] : []),
        ...(heat && !heat.ok ? [heat.message] : []),
        ...cautions.map((c) => c.text),
      ];
      return {
        kind,
        analysis,
        estimate,
        warnings,
        checks: { bedFit, heat, cautions },
        parameters: result.drawn.parameters,
        sizes: result.drawn.sizes,
        corrections,
        calibrationNotes: result.drawn.notes.filter((n) => n.includes(' so it prints at ')),
        notes: result.drawn.notes.filter((n) => !n.includes(' so it prints at ')),
        loadBearing: result.loadBearing,
      };
    },

    async file(viewer: User | undefined, kind: string, input: MakeRequest, format: MakeFormat): Promise<{ fileName: string; body: Buffer; mime: string }> {
      generatorOf(kind);
      const { params, result } = await make(viewer, kind, input, { format });
      const name = madeTitle(kind, params)
        .toLowerCase()
        .replace(/[^a-z0-9.]+/g, '-')
        .replace(/^-+|-+$/g, '')
        .slice(0, 80);
      return {
        fileName: `${name || kind}.${format}`,
        body: Buffer.from(result.file!),
        mime: format === '3mf' ? 'model/3mf' : 'model/stl',
      };
    },

    /** Puts a made part in a kit: measured now (its figures plan the kit), stored as maker + sizes. */
    async addToKit(viewer: User, kitId: number, input: MadeKitItemInput, sequelize: Sequelize): Promise<KitItemInfo> {
      const { kit } = await findKit(viewer, kitId, 'edit');
      const params = parseParams(input.kind, input.params);
      let printer: Printer | null = null;
      if (input.printerId != null) {
        printer = await Printer.findOne({ where: { id: input.printerId, ownerId: kit.ownerId } });
        if (!printer) {
          const message = 'That printer is not one of the kit owner’s printers; pick one of theirs or none.';
          throw AppError.field('printerId', message);
        }
      }
      const corrections = await correctionsFor(printer, input.material);
      const result = await run({ kind: input.kind, params, corrections: corrections ? { holeMm: corrections.holeMm, outerMm: corrections.outerMm } : {} });
      const a = result.analysis;
      const id = await transact(sequelize, async (t) => {
        const { kit: locked } = await findKit(viewer, kitId, 'edit', undefined, t);
        if ((await KitItem.count({ where: { kitId: locked.id }, transaction: t })) >= MAX_KIT_ITEMS) {
          throw AppError.conflict(`A kit holds at most ${MAX_KIT_ITEMS} items; split it into two kits.`);
        }
        const last = (await KitItem.max<number, KitItem>('position', { where: { kitId: locked.id }, transaction: t })) ?? -1;
        const item = await KitItem.create(
          {
            kitId: locked.id,
            partId: null,
            makeKind: input.kind,
            makeParams: params,
            makeGeometry: { volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm, loadBearing: result.loadBearing },
            position: last + 1,
            quantity: input.quantity,
            recipeId: null,
            material: input.material,
            printerId: printer?.id ?? null,
            boughtPriceEach: null,
            servicePriceEach: null,
            serviceShipping: null,
          },
          { transaction: t },
        );
        locked.changed('updatedAt', true);
        await locked.save({ transaction: t });
        return item.id;
      });
      const [item] = await loadItems(kit.id, id);
      return presentItem(item);
    },

    // ---- calibrations ------------------------------------------------------------------

    async calibrations(owner: User, printerId: number): Promise<CalibrationList> {
      const printer = await Printer.findOne({ where: { id: printerId, ownerId: owner.id } });
      if (!printer) throw AppError.notFound('There is no printer with that id among yours.');
      const rows = await PrinterCalibration.findAll({ where: { printerId }, order: [['material', 'ASC']] });
      return { items: rows.map(presentCalibration) };
    },

    /** Records (or replaces) what the gauge showed for this printer and material. Owner only. */
    async calibrate(owner: User, printerId: number, input: CalibrationInput): Promise<CalibrationInfo> {
      const printer = await Printer.findOne({ where: { id: printerId, ownerId: owner.id } });
      if (!printer) throw AppError.notFound('There is no printer with that id among yours.');
      const fields = {
        nominalMm: input.nominalMm,
        holeFitMm: input.holeFitMm,
        holeCorrectionMm: round(input.holeFitMm - input.nominalMm, 3),
        outerFitMm: input.outerFitMm ?? null,
        outerCorrectionMm: input.outerFitMm == null ? null : round(input.outerFitMm - input.nominalMm, 3),
      };
      // one row per printer and material (unique key): a second gauge replaces the first
      await PrinterCalibration.upsert({ printerId, material: input.material, ...fields });
      return presentCalibration((await PrinterCalibration.findOne({ where: { printerId, material: input.material } }))!);
    },

    async close() {
      const p = pool;
      pool = null;
      await p?.close();
    },
  };
}

export type MakeService = ReturnType<typeof createMakeService>;
