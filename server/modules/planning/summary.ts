// A kit's summary (what to print, how long, what it costs, whether it survives the shoot) and its CSV.
// The arithmetic is in shared/kit-summary.ts; this gathers each item's recipe, model figures,
// slices, printer and set-report warnings.
import { Op } from 'sequelize';
import type { KitSummaryResponse } from '@shared/api/planning';
import { lineWidthFor } from '@shared/estimate';
import { summariseKit, type KitPlanItem } from '@shared/kit-summary';
import { heatExposureInfo } from '@shared/materials';
import type { ModelFileAnalysis } from '@shared/mesh';
import { DEFAULT_CURRENCY } from '@shared/money';
import { MADE_PART_RECIPE } from '@shared/schemas/make';
import type { SliceProfile } from '@shared/slice';
import { PartFile, PartRevision, PriceSheet, Recipe, type Kit, type KitItem, type Printer, type User } from '../../db/models';
import { madeTitle } from '../make/made';
import { audienceOf, type PartAudience } from '../parts/access';
import { keysOf } from '../files/stored-files';
import { findKit } from './access';
import { kitCsv, kitCsvFileName } from './export';
import { defaultRecipe } from './items';
import { effectivePrices, isOnShelfForKits, loadItems } from './presenter';
import type { PlanningDeps } from './service';
import { soundnessNotes } from './values';

function printerRef(printer: Printer | null): KitPlanItem['printer'] {
  return printer
    ? { id: printer.id, name: printer.name, bedMm: printer.bedMm(), bedMarginMm: printer.bedMarginMm, nozzleMm: printer.nozzleMm, watts: printer.watts }
    : null;
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

type FileWithPosition = PartFile & { RevisionFile?: { position: number } };

function modelFilesOf(revision: PartRevision | undefined): PartFile[] {
  const files = [...((revision?.files ?? []) as FileWithPosition[])];
  files.sort((a, b) => (a.RevisionFile?.position ?? 0) - (b.RevisionFile?.position ?? 0));
  return files.filter((f) => f.kind === 'model');
}

export function summaryService({ storage, slicer, evidence }: Pick<PlanningDeps, 'storage' | 'slicer' | 'evidence'>) {
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
    const fallbacks = orphanRevisions.length ? await Recipe.findAll({ where: { revisionId: { [Op.in]: orphanRevisions } }, order: [['position', 'ASC']] }) : [];
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
        notes.push(
          part.status === 'retired'
            ? 'This part was retired from the shelf; check with the rigging lead before printing it.'
            : 'This part is not on the shelf right now.',
        );
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

  return {
    async summary(viewer: User, kitId: number): Promise<KitSummaryResponse> {
      const { kit } = await findKit(viewer, kitId, 'read');
      return summaryOf(kit, await audienceOf(viewer));
    },

    async exportCsv(viewer: User, kitId: number): Promise<{ fileName: string; body: string }> {
      const { kit } = await findKit(viewer, kitId, 'read');
      return { fileName: kitCsvFileName(kit.name, kit.id), body: kitCsv(await summaryOf(kit, await audienceOf(viewer))) };
    },
  };
}
