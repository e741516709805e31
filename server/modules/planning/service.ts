// Prep days: print estimates, a member's printers and filament prices, and shoot kits (what to print
// for a shoot, on which printer, and whether it survives the shoot). The arithmetic is in
// shared/kit-summary.ts; this loads the figures and keeps the rules of who may do what.
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type {
  EstimateResult,
  KitDetail,
  KitItemInfo,
  KitList,
  KitCrewShareList,
  KitShareList,
  KitSummaryResponse,
  PrinterInfo,
  PrinterList,
  PriceSheetInfo,
} from '@shared/api/planning';
import { DEFAULT_BED_MARGIN_MM, DEFAULT_PRICE_PER_KG, estimateFromSlices, estimatePrint, lineWidthFor, type PartGeometry, type PrintEstimate, type PrintSettings } from '@shared/estimate';
import type { ModelFileAnalysis } from '@shared/mesh';
import type { SliceProfile } from '@shared/slice';
import { summariseKit, type KitPlanItem } from '@shared/kit-summary';
import { MADE_PART_RECIPE } from '@shared/schemas/make';
import { madeTitle } from '../make/service';
import { heatExposureInfo } from '@shared/materials';
import { meshConcerns, type MeshSoundness } from '@shared/mesh/concerns';
import {
  MAX_KIT_ITEMS,
  MAX_KITS,
  MAX_PRINTERS,
  type EstimateInput,
  type KitInput,
  type KitItemInput,
  type KitItemPatch,
  type KitPatch,
  type KitCrewSharesInput,
  type KitSharesInput,
  type PriceSheetInput,
  type PrinterInput,
  type PrinterPatch,
} from '@shared/schemas/planning';
import { Crew, CrewMember, Kit, KitCrewShare, KitItem, KitShare, Part, PartFile, PartRevision, PriceSheet, Printer, Recipe, RevisionFile, User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import type { FileStorage } from '../files/storage';
import { keysOf } from '../files/stored-files';
import type { SliceQueue } from './slice-queue';
import type { EvidenceService } from '../evidence/service';
import type { Alerts } from '../notices/alerts';
import { audienceOf, crewAllows, findVisiblePart, seesUnpublished, type PartAudience } from '../parts/access';
import { findKit } from './access';
import { kitCsv, kitCsvFileName } from './export';
import { DEFAULT_CURRENCY } from '@shared/money';
import { effectivePrices, isOnShelfForKits, loadItems, presentCrewShares, presentItem, presentKit, presentKitList, presentPrinter, presentPriceSheet, presentShares } from './presenter';

export interface PlanningDeps {
  sequelize: Sequelize;
  /** Where stored model files live, for slicing them. */
  storage: FileStorage;
  /** Slices model files in a worker thread. */
  slicer: SliceQueue;
  /** Outcome warnings from set reports, per part. */
  evidence: Pick<EvidenceService, 'evidenceFor'>;
  /** Tells a member a kit was shared with them (bell and mail, as their settings allow). */
  alerts?: Alerts;
}

function fieldError(field: string, message: string) {
  return new AppError(422, 'validation_failed', message, { [field]: message });
}

/** Empty text means "none". */
function textOrNull(value: string | null | undefined): string | null {
  return value === undefined || value === null || value === '' ? null : value;
}

/** Only the keys that were sent: an update changes what it names. */
function defined<T extends object>(values: T): Partial<T> {
  return Object.fromEntries(Object.entries(values).filter(([, v]) => v !== undefined)) as Partial<T>;
}

/** What a crew should know about a model before trusting an estimate made from it. */
function soundnessNotes(name: string, a: MeshSoundness): string[] {
  const concerns = meshConcerns(a);
  if (!concerns.length) return [];
  const trust = a.watertight ? 'check the model before printing' : 'its volume and this estimate may be off';
  return [`${name}: ${concerns.join('; ')}, so ${trust}.`];
}

const noFile = () => AppError.notFound('There is no model file with that id on the shelf.');

async function visibleModelFile(viewer: User | undefined, fileId: number): Promise<PartFile> {
  const file = await PartFile.findByPk(fileId);
  if (!file) throw noFile();
  let part: Part;
  try {
    part = await findVisiblePart(viewer, file.partId);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) throw noFile();
    throw err;
  }
  const revisionIds = seesUnpublished(viewer, part)
    ? (await PartRevision.findAll({ where: { partId: part.id }, attributes: ['id'] })).map((r) => r.id)
    : [part.publishedRevisionId!];
  const linked = await RevisionFile.count({ where: { fileId, revisionId: { [Op.in]: revisionIds } } });
  if (!linked) throw noFile();
  if (file.kind !== 'model') {
    throw fieldError('fileId', `That file is a ${file.kind === 'photo' ? 'photo' : 'source file'}, not a model; choose the part’s STL or 3MF file.`);
  }
  if (!file.analysis) throw fieldError('fileId', 'That model file has no mesh figures, so there is nothing to estimate from.');
  return file;
}

/** A part that can go in a kit: on the shelf now. Missing and unpublished parts get the same answer. */
async function shelfPart(viewer: User, partId: number, transaction?: Transaction): Promise<Part> {
  const part = await Part.findByPk(partId, { transaction });
  if (!part || !isOnShelfForKits(part) || !crewAllows(await audienceOf(viewer, transaction), part)) {
    throw fieldError('partId', 'Only parts that are on the shelf can go in a kit; that one is not. Pick a part from the shelf.');
  }
  return part;
}

/** The default is the first set-ready recipe, else the first recipe. */
function defaultRecipe(recipes: Recipe[]): Recipe | null {
  return recipes.find((r) => r.purpose === 'set-ready') ?? recipes[0] ?? null;
}

async function publishedRecipe(part: Part, recipeId: number | null | undefined, transaction?: Transaction): Promise<Recipe> {
  if (recipeId) {
    const recipe = await Recipe.findOne({ where: { id: recipeId, revisionId: part.publishedRevisionId! }, transaction });
    if (!recipe) throw fieldError('recipeId', 'That recipe is not one of this part’s published recipes; pick one from the part’s page.');
    return recipe;
  }
  const recipes = await Recipe.findAll({ where: { revisionId: part.publishedRevisionId! }, order: [['position', 'ASC']], transaction });
  const recipe = defaultRecipe(recipes);
  if (!recipe) throw fieldError('recipeId', 'This part has no published recipe to print it with.');
  return recipe;
}

async function ownersPrinter(kit: Kit, printerId: number | null | undefined, transaction?: Transaction): Promise<number | null> {
  if (printerId === null || printerId === undefined) return null;
  const printer = await Printer.findOne({ where: { id: printerId, ownerId: kit.ownerId }, transaction });
  if (!printer) throw fieldError('printerId', 'That printer is not one of the kit owner’s printers; pick one of theirs or none.');
  return printer.id;
}

function printerRef(printer: Printer | null): KitPlanItem['printer'] {
  return printer ? { id: printer.id, name: printer.name, bedMm: printer.bedMm(), bedMarginMm: printer.bedMarginMm, nozzleMm: printer.nozzleMm, watts: printer.watts } : null;
}

/** A made item is planned from the mesh figures measured when it was added, with the made-part settings. */
function madePlan(item: KitItem): KitPlanItem {
  const g = item.makeGeometry;
  const r = MADE_PART_RECIPE;
  return {
    id: item.id,
    title: madeTitle(item.makeKind!, item.makeParams ?? {}),
    quantity: item.quantity,
    geometry: g ? { volumeMm3: g.volumeMm3, areaMm2: g.areaMm2, sizeMm: g.sizeMm } : null,
    slices: null,
    settings: { material: item.material ?? 'PETG', ...r },
    printer: printerRef(item.printer ?? null),
    safety: { carriesLoad: g?.loadBearing ?? false, overhead: false, vehicle: false, heat: false },
    // made to size: nobody has tested these sizes
    testedLoadKg: null,
    evidenceWarnings: [],
    boughtPriceEach: item.boughtPriceEach,
    servicePriceEach: item.servicePriceEach,
    serviceShipping: item.serviceShipping,
    notes: [`Made to size: planned from the made part’s figures with ${r.layerMm} mm layers, ${r.walls} walls and ${r.infillPct} % infill.`],
  };
}

function checkDates(startsOn: string | null, endsOn: string | null) {
  if (startsOn && endsOn && startsOn > endsOn) throw fieldError('endsOn', 'The last shoot day cannot be before the first.');
}

type FileWithPosition = PartFile & { RevisionFile?: { position: number } };

function modelFilesOf(revision: PartRevision | undefined): PartFile[] {
  const files = [...((revision?.files ?? []) as FileWithPosition[])];
  files.sort((a, b) => (a.RevisionFile?.position ?? 0) - (b.RevisionFile?.position ?? 0));
  return files.filter((f) => f.kind === 'model');
}

export function createPlanningService({ sequelize, evidence, storage, slicer, alerts }: PlanningDeps) {
  async function ownPrinter(owner: User, id: number): Promise<Printer> {
    const printer = await Printer.findOne({ where: { id, ownerId: owner.id } });
    if (!printer) throw AppError.notFound('There is no printer with that id among yours.');
    return printer;
  }

  /** An item of the kit; one whose part is published to a crew the viewer is not in is not there for them. */
  async function itemOf(kit: Kit, itemId: number, transaction?: Transaction, viewer?: User): Promise<KitItem> {
    const item = await KitItem.findOne({ where: { id: itemId, kitId: kit.id }, transaction });
    const part = item?.partId && viewer ? await Part.findByPk(item.partId, { attributes: ['id', 'crewId', 'authorId'], transaction }) : null;
    if (!item || (part && !crewAllows(await audienceOf(viewer, transaction), part))) throw AppError.notFound('There is no item with that id in this kit.');
    return item;
  }

  async function presentedItem(kitId: number, id: number): Promise<KitItemInfo> {
    const [item] = await loadItems(kitId, id);
    return presentItem(item);
  }

  async function touch(kit: Kit, transaction: Transaction) {
    kit.changed('updatedAt', true);
    await kit.save({ transaction });
  }

  return {
    async estimate(viewer: User | undefined, input: EstimateInput): Promise<EstimateResult> {
      const notes: string[] = [];
      let geometry: PartGeometry;
      let source: EstimateResult['geometry'];
      let sliceFor: ((settings: PrintSettings) => Promise<SliceProfile>) | null = null;
      if (input.fileId !== undefined) {
        const file = await visibleModelFile(viewer, input.fileId);
        const a = file.analysis!;
        const stlUnitScale = (a as Partial<ModelFileAnalysis>).unitScale ?? 1;
        sliceFor = (s) =>
          slicer.slice(
            { path: () => storage.localCopy(keysOf(file).original), stlUnitScale, settings: { layerMm: s.layerMm, walls: s.walls, lineWidthMm: lineWidthFor(s), skinLayers: s.topBottomLayers } },
            `file:${file.id}:${file.sha256}`,
          );
        geometry = { volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm };
        source = { source: 'file', fileId: file.id, partId: file.partId, volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm };
        notes.push(...soundnessNotes(file.originalName, a));
      } else {
        geometry = { volumeMm3: input.volumeMm3!, areaMm2: input.areaMm2!, sizeMm: input.sizeMm! };
        source = { source: 'figures', fileId: null, partId: null, ...geometry };
      }
      const sheet = viewer ? await PriceSheet.findByPk(viewer.id) : null;
      const ownPrice = sheet?.pricesPerKg[input.material];
      const pricePerKg = input.pricePerKg ?? ownPrice;
      const pricePerKwh = input.pricePerKwh ?? sheet?.pricePerKwh ?? undefined;
      if (input.pricePerKg === undefined && ownPrice !== undefined) notes.push('The price per kg is from your price sheet.');
      if (input.pricePerKwh === undefined && pricePerKwh !== undefined && input.printerWatts !== undefined) notes.push('The price per kWh is from your price sheet.');
      const settings: PrintSettings = {
        material: input.material,
        nozzleMm: input.nozzleMm,
        layerMm: input.layerMm,
        walls: input.walls,
        topBottomLayers: input.topBottomLayers,
        infillPct: input.infillPct,
        speedMmS: input.speedMmS,
        accelerationMmS2: input.accelerationMmS2,
        travelSpeedMmS: input.travelSpeedMmS,
        pricePerKg,
        printerWatts: input.printerWatts,
        pricePerKwh,
      };
      let estimate: PrintEstimate;
      try {
        const profile = sliceFor ? await sliceFor(settings).catch((err: Error) => {
          notes.push(`The model could not be sliced (${err.message}); this is the quick estimate from its figures.`);
          return null;
        }) : null;
        estimate = profile ? estimateFromSlices(profile, settings) : estimatePrint(geometry, settings);
      } catch (err) {
        if (err instanceof RangeError) throw new AppError(422, 'validation_failed', `These figures cannot be estimated: ${err.message}`);
        throw err;
      }
      return {
        volumeMm3: estimate.volumeMm3,
        massG: estimate.massG,
        lengthM: estimate.lengthM,
        timeMin: estimate.timeMin,
        cost: estimate.cost,
        pricePerKg: pricePerKg ?? DEFAULT_PRICE_PER_KG[input.material],
        partsMm3: estimate.partsMm3,
        method: estimate.method,
        assumptions: [...estimate.assumptions, ...notes],
        geometry: source,
      };
    },

    // ---- printers ----------------------------------------------------------------------

    async listPrinters(owner: User): Promise<PrinterList> {
      const printers = await Printer.findAll({ where: { ownerId: owner.id }, order: [['name', 'ASC'], ['id', 'ASC']] });
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

    // ---- filament prices ---------------------------------------------------------------

    async prices(user: User): Promise<PriceSheetInfo> {
      return presentPriceSheet(await PriceSheet.findByPk(user.id));
    },

    /** Replaces the member's prices: materials not named go back to the default. */
    async setPrices(user: User, input: PriceSheetInput): Promise<PriceSheetInfo> {
      const current = await PriceSheet.findByPk(user.id);
      await PriceSheet.upsert({
        userId: user.id,
        pricesPerKg: input.prices,
        pricePerKwh: input.pricePerKwh ?? null,
        machineHourRate: input.machineHourRate !== undefined ? input.machineHourRate : (current?.machineHourRate ?? null),
        ...(input.currency ? { currency: input.currency } : {}),
      });
      return presentPriceSheet(await PriceSheet.findByPk(user.id));
    },

    // ---- kits --------------------------------------------------------------------------

    async listKits(viewer: User): Promise<KitList> {
      const shares = await KitShare.findAll({ where: { userId: viewer.id } });
      const audience = await audienceOf(viewer);
      const myCrews = (await CrewMember.findAll({ where: { userId: viewer.id }, attributes: ['crewId'] })).map((m) => m.crewId);
      const crewShares = myCrews.length ? await KitCrewShare.findAll({ where: { crewId: { [Op.in]: myCrews } } }) : [];
      const accessOf = new Map<number, 'read' | 'edit'>();
      for (const s of [...shares, ...crewShares]) if (accessOf.get(s.kitId) !== 'edit') accessOf.set(s.kitId, s.access);
      const shared = [...accessOf.keys()];
      const kits = await Kit.findAll({
        where: shared.length ? { [Op.or]: [{ ownerId: viewer.id }, { id: { [Op.in]: shared } }] } : { ownerId: viewer.id },
        order: [['updatedAt', 'DESC'], ['id', 'DESC']],
      });
      const items = await presentKitList(kits, (kit) => (kit.ownerId === viewer.id ? 'owner' : accessOf.get(kit.id)!), audience);
      return { items };
    },

    async getKit(viewer: User, id: number): Promise<KitDetail> {
      const { kit, access } = await findKit(viewer, id, 'read');
      return presentKit(kit, access, await audienceOf(viewer));
    },

    async createKit(owner: User, input: KitInput): Promise<KitDetail> {
      if ((await Kit.count({ where: { ownerId: owner.id } })) >= MAX_KITS) {
        throw AppError.conflict(`You have ${MAX_KITS} kits already; delete old ones first.`);
      }
      const kit = await Kit.create({
        ownerId: owner.id,
        name: input.name,
        production: textOrNull(input.production),
        startsOn: input.startsOn ?? null,
        endsOn: input.endsOn ?? null,
        locationNotes: textOrNull(input.locationNotes),
        heatExposure: input.heatExposure ?? null,
        printHoursPerDay: input.printHoursPerDay,
        printerPrice: input.printerPrice ?? null,
      });
      return presentKit(await kit.reload(), 'owner', await audienceOf(owner));
    },

    async updateKit(viewer: User, id: number, patch: KitPatch): Promise<KitDetail> {
      const result = await transact(sequelize, async (t) => {
        const { kit, access } = await findKit(viewer, id, 'edit', undefined, t);
        const startsOn = patch.startsOn !== undefined ? patch.startsOn : kit.startsOn;
        const endsOn = patch.endsOn !== undefined ? patch.endsOn : kit.endsOn;
        checkDates(startsOn, endsOn);
        await kit.update(
          defined({
            name: patch.name,
            production: patch.production === undefined ? undefined : textOrNull(patch.production),
            startsOn: patch.startsOn,
            endsOn: patch.endsOn,
            locationNotes: patch.locationNotes === undefined ? undefined : textOrNull(patch.locationNotes),
            heatExposure: patch.heatExposure,
            printHoursPerDay: patch.printHoursPerDay,
            printerPrice: patch.printerPrice,
          }),
          { transaction: t },
        );
        return { kit, access };
      });
      return presentKit(await result.kit.reload(), result.access, await audienceOf(viewer));
    },

    async deleteKit(viewer: User, id: number): Promise<void> {
      const { kit } = await findKit(viewer, id, 'owner', 'Only the kit’s owner can delete it.');
      await transact(sequelize, async (t) => {
        await KitItem.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await kit.destroy({ transaction: t });
      });
    },

    async addItem(viewer: User, kitId: number, input: KitItemInput): Promise<KitItemInfo> {
      const id = await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        if ((await KitItem.count({ where: { kitId: kit.id }, transaction: t })) >= MAX_KIT_ITEMS) {
          throw AppError.conflict(`A kit holds at most ${MAX_KIT_ITEMS} items; split it into two kits.`);
        }
        const part = await shelfPart(viewer, input.partId, t);
        const recipe = await publishedRecipe(part, input.recipeId, t);
        const printerId = await ownersPrinter(kit, input.printerId, t);
        const last = (await KitItem.max<number, KitItem>('position', { where: { kitId: kit.id }, transaction: t })) ?? -1;
        const item = await KitItem.create(
          {
            kitId: kit.id,
            partId: part.id,
            position: last + 1,
            quantity: input.quantity,
            recipeId: recipe.id,
            material: input.material ?? null,
            printerId,
            boughtPriceEach: input.boughtPriceEach ?? null,
            servicePriceEach: input.servicePriceEach ?? null,
            serviceShipping: input.serviceShipping ?? null,
          },
          { transaction: t },
        );
        await touch(kit, t);
        return item.id;
      });
      return presentedItem(kitId, id);
    },

    async updateItem(viewer: User, kitId: number, itemId: number, patch: KitItemPatch): Promise<KitItemInfo> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        const item = await itemOf(kit, itemId, t, viewer);
        if (!item.partId && (patch.partId !== undefined || patch.recipeId !== undefined)) {
          throw fieldError(patch.partId !== undefined ? 'partId' : 'recipeId', 'A made item keeps its maker and sizes; make it again and add the new one instead.');
        }
        const changes: Partial<KitItem> = defined({
          quantity: patch.quantity,
          material: patch.material,
          boughtPriceEach: patch.boughtPriceEach,
          servicePriceEach: patch.servicePriceEach,
          serviceShipping: patch.serviceShipping,
        });
        if (patch.partId !== undefined && patch.partId !== item.partId) {
          const part = await shelfPart(viewer, patch.partId, t);
          changes.partId = part.id;
          changes.recipeId = (await publishedRecipe(part, patch.recipeId, t)).id;
        } else if (patch.recipeId !== undefined) {
          // null goes back to the part's default recipe
          changes.recipeId = (await publishedRecipe(await shelfPart(viewer, item.partId!, t), patch.recipeId, t)).id;
        }
        if (patch.printerId !== undefined) changes.printerId = await ownersPrinter(kit, patch.printerId, t);
        await item.update(changes, { transaction: t });
        await touch(kit, t);
      });
      return presentedItem(kitId, itemId);
    },

    async deleteItem(viewer: User, kitId: number, itemId: number): Promise<void> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        const item = await itemOf(kit, itemId, t, viewer);
        await item.destroy({ transaction: t });
        await touch(kit, t);
      });
    },

    /** Replaces who the kit is shared with. Owner only. */
    async setShares(viewer: User, kitId: number, input: KitSharesInput): Promise<KitShareList> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'owner', 'Only the kit’s owner can choose who it is shared with.', t);
        const fields: Record<string, string> = {};
        const resolved: { userId: number; access: 'read' | 'edit' }[] = [];
        for (const [i, share] of input.shares.entries()) {
          const key = `shares.${i}.${share.email !== undefined ? 'email' : 'userId'}`;
          const user = share.email !== undefined ? await User.findOne({ where: { email: share.email }, transaction: t }) : await User.findByPk(share.userId!, { transaction: t });
          // an unknown and a suspended account get the same words, and neither is named
          if (!user || user.status !== 'active') {
            fields[key] =
              share.email !== undefined
                ? `The kit cannot be shared with ${share.email}. Check the spelling, or ask them for the address they sign in with.`
                : `The kit cannot be shared with member ${share.userId}. Pick the member again, or share by the address they sign in with.`;
          } else if (user.id === kit.ownerId) {
            fields[key] = 'That is you: you own this kit already.';
          } else if (resolved.some((r) => r.userId === user.id)) {
            fields[key] = `${user.displayName} is on the list twice; keep one entry.`;
          } else {
            resolved.push({ userId: user.id, access: share.access });
          }
        }
        const problems = Object.values(fields);
        if (problems.length) {
          throw new AppError(422, 'validation_failed', problems.length === 1 ? problems[0] : 'Some of these members cannot be added; see each entry.', fields);
        }
        const before = new Set((await KitShare.findAll({ where: { kitId: kit.id }, attributes: ['userId'], transaction: t })).map((s) => s.userId));
        await KitShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitShare.bulkCreate(resolved.map((r) => ({ kitId: kit.id, ...r })), { transaction: t });
        await touch(kit, t);
        const added = resolved.filter((r) => !before.has(r.userId));
        for (const r of added) {
          await alerts?.send(
            [r.userId],
            'kit_shared',
            {
              title: `A shoot kit was shared with you: ${kit.name}`,
              body: `${viewer.displayName} shared the kit “${kit.name}” with you${r.access === 'edit' ? ' and lets you change it' : ' to read'}.`,
              link: `/kits/${kit.id}`,
              mail: { subject: `${viewer.displayName} shared a shoot kit with you: ${kit.name}`, heading: 'A shoot kit is shared with you', actionLabel: 'Open the kit' },
            },
            t,
            viewer.id,
          );
        }
      });
      const shares = await KitShare.findAll({ where: { kitId }, include: [{ model: User, as: 'user' }] });
      return { shares: presentShares(shares, 'owner') };
    },

    /** Replaces the crews the kit is shared with. Owner only, and only with crews the owner is in. */
    async setCrewShares(viewer: User, kitId: number, input: KitCrewSharesInput): Promise<KitCrewShareList> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'owner', 'Only the kit’s owner can choose which crews it is shared with.', t);
        const fields: Record<string, string> = {};
        const seen = new Set<number>();
        for (const [i, share] of input.crewShares.entries()) {
          if (seen.has(share.crewId)) fields[`crewShares.${i}.crewId`] = 'That crew is on the list twice; keep one entry.';
          else if (!(await CrewMember.count({ where: { crewId: share.crewId, userId: viewer.id }, transaction: t }))) {
            fields[`crewShares.${i}.crewId`] = 'You can share a kit only with a crew you are in.';
          }
          seen.add(share.crewId);
        }
        const problems = Object.values(fields);
        if (problems.length) throw new AppError(422, 'validation_failed', problems.length === 1 ? problems[0] : 'Some of these crews cannot be added; see each entry.', fields);
        await KitCrewShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitCrewShare.bulkCreate(input.crewShares.map((s) => ({ kitId: kit.id, crewId: s.crewId, access: s.access })), { transaction: t });
        await touch(kit, t);
      });
      const rows = await KitCrewShare.findAll({ where: { kitId }, include: [{ model: Crew, as: 'crew' }], order: [['id', 'ASC']] });
      return { crewShares: presentCrewShares(rows) };
    },

    /** A member the kit is shared with takes themselves off it; the owner keeps it. */
    async leave(viewer: User, kitId: number): Promise<void> {
      const { kit } = await findKit(viewer, kitId, 'read');
      if (kit.ownerId === viewer.id) throw AppError.conflict('You own this kit: delete it, or share it and keep it.');
      await KitShare.destroy({ where: { kitId: kit.id, userId: viewer.id } });
    },

    async summary(viewer: User, kitId: number): Promise<KitSummaryResponse> {
      const { kit } = await findKit(viewer, kitId, 'read');
      return summaryOf(kit, await audienceOf(viewer));
    },

    async exportCsv(viewer: User, kitId: number): Promise<{ fileName: string; body: string }> {
      const { kit } = await findKit(viewer, kitId, 'read');
      return { fileName: kitCsvFileName(kit.name, kit.id), body: kitCsv(await summaryOf(kit, await audienceOf(viewer))) };
    },
  };

  /** The model file sliced for a recipe (cached by the queue), or null with a note when it cannot be. */
  async function slicesFor(file: PartFile, recipe: Recipe, notes: string[]): Promise<SliceProfile | null> {
    const s = { nozzleMm: recipe.nozzleMm, layerMm: recipe.layerMm, walls: recipe.walls, skinLayers: recipe.topBottomLayers };
    try {
      return await slicer.slice(
        {
          path: () => storage.localCopy(keysOf(file).original),
          stlUnitScale: (file.analysis as Partial<ModelFileAnalysis> | null)?.unitScale ?? 1,
          settings: { layerMm: s.layerMm, walls: s.walls, lineWidthMm: lineWidthFor(s), skinLayers: s.skinLayers },
        },
        `file:${file.id}:${file.sha256}`,
      );
    } catch (err) {
      notes.push(`${file.originalName} could not be sliced (${(err as Error).message}); its figures give a quick estimate instead.`);
      return null;
    }
  }

  async function summaryOf(kit: Kit, audience: PartAudience): Promise<KitSummaryResponse> {
    const items = await loadItems(kit.id, undefined, audience);
    const sheet = await PriceSheet.findByPk(kit.ownerId);

    // a recipe that has gone is replaced by the part's default published recipe
    const orphanRevisions = [...new Set(items.filter((i) => i.part && !i.recipe && i.part.publishedRevisionId).map((i) => i.part!.publishedRevisionId!))];
    const fallbacks = orphanRevisions.length
      ? await Recipe.findAll({ where: { revisionId: { [Op.in]: orphanRevisions } }, order: [['position', 'ASC']] })
      : [];
    const chosen = items.map((i) => ({
      item: i,
      recipe: i.part ? (i.recipe ?? defaultRecipe(fallbacks.filter((r) => r.revisionId === i.part!.publishedRevisionId))) : null,
      fallback: !i.recipe,
    }));

    const revisionIds = [...new Set(chosen.flatMap((c) => (c.recipe ? [c.recipe.revisionId] : [])))];
    const revisions = revisionIds.length
      ? await PartRevision.findAll({
          where: { id: { [Op.in]: revisionIds } },
          include: [{ model: PartFile, as: 'files', through: { attributes: ['position'] } }],
        })
      : [];
    const partIds = [...new Set(items.flatMap((i) => (i.partId ? [i.partId] : [])))];
    const warnings = partIds.length ? await evidence.evidenceFor(partIds) : new Map();

    const skipped: string[] = [];
    const planned: { item: KitItem; plan: KitPlanItem }[] = [];
    for (const { item, recipe, fallback } of chosen) {
      if (!item.part) {
        planned.push({ item, plan: madePlan(item) });
        continue;
      }
      const part = item.part;
      const title = part.publishedRevision?.title ?? part.slug;
      if (!recipe) {
        skipped.push(`${title} has no recipe left to plan with; choose one again.`);
        continue;
      }
      const revision = revisions.find((r) => r.id === recipe.revisionId)!;
      const notes: string[] = [];
      if (!isOnShelfForKits(part)) {
        notes.push(part.status === 'retired' ? 'This part was retired from the shelf; check with the rigging lead before printing it.' : 'This part is not on the shelf right now.');
      }
      if (fallback) notes.push('The chosen recipe has gone; planned with the part’s first set-ready recipe.');
      else if (recipe.revisionId !== part.publishedRevisionId && part.publishedRevisionId) {
        notes.push('A newer revision of this part is on the shelf; choose one of its recipes to plan with it.');
      }
      const models = modelFilesOf(revision);
      const model = models.find((f) => f.analysis && f.analysis.volumeMm3 > 0);
      if (models.length > 1 && model) notes.push(`The part has ${models.length} model files; the estimate covers ${model.originalName} only.`);
      if (model) notes.push(...soundnessNotes(model.originalName, model.analysis!));
      const a = model?.analysis;
      const printer = item.printer ?? null;
      const slices = model ? await slicesFor(model, recipe, notes) : null;
      planned.push({
        item,
        plan: {
          id: item.id,
          title,
          quantity: item.quantity,
          geometry: a ? { volumeMm3: a.volumeMm3, areaMm2: a.areaMm2, sizeMm: a.sizeMm } : null,
          slices,
          settings: {
            material: item.material ?? recipe.material,
            nozzleMm: recipe.nozzleMm,
            layerMm: recipe.layerMm,
            walls: recipe.walls,
            topBottomLayers: recipe.topBottomLayers,
            infillPct: recipe.infillPct,
            speedMmS: recipe.speedMmS,
          },
          orientationNote: recipe.orientationNote,
          printer: printerRef(printer),
          safety: { carriesLoad: revision.carriesLoad, overhead: revision.overhead, vehicle: revision.vehicle, heat: revision.heat },
          testedLoadKg: revision.testedLoadKg,
          evidenceWarnings: warnings.get(part.id)?.warnings ?? [],
          boughtPriceEach: item.boughtPriceEach,
          servicePriceEach: item.servicePriceEach,
          serviceShipping: item.serviceShipping,
          notes,
        },
      });
    }

    const summary = summariseKit({
      heatExposure: kit.heatExposure,
      printHoursPerDay: kit.printHoursPerDay,
      printerPrice: kit.printerPrice,
      pricesPerKg: effectivePrices(sheet),
      pricePerKwh: sheet?.pricePerKwh ?? null,
      items: planned.map((p) => p.plan),
    });
    return {
      kit: {
        id: kit.id,
        name: kit.name,
        production: kit.production,
        startsOn: kit.startsOn,
        endsOn: kit.endsOn,
        heatExposure: kit.heatExposure ? heatExposureInfo(kit.heatExposure) : null,
        printHoursPerDay: kit.printHoursPerDay,
        printerPrice: kit.printerPrice,
      },
      currency: sheet?.currency ?? DEFAULT_CURRENCY,
      ...summary,
      items: summary.items.map((s, i) => {
        const part = planned[i].item.part;
        return { ...s, part: part ? { id: part.id, slug: part.slug } : null };
      }),
      assumptions: [...summary.assumptions, ...skipped],
    };
  }
}

export type PlanningService = ReturnType<typeof createPlanningService>;
