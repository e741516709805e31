// The estimate a print request carries (grams per material, minutes, the notes behind them), made
// with the planning service from the part's model file and recipe, or from the kit's summary.
import { Op } from 'sequelize';
import type { MaterialId } from '@shared/materials';
import type { PrintRequestInput } from '@shared/schemas/print-requests';
import { Part, PartFile, PartRevision, Recipe, type User } from '../../db/models';
import { AppError } from '../../errors';
import { findVisiblePart } from '../parts/access';
import type { PlanningService } from '../planning/service';

type FileWithPosition = PartFile & { RevisionFile?: { position: number } };

/** What a request would take: one part with its recipe, or a whole kit through its summary; times the quantity. */
export async function estimateRequest(planning: Pick<PlanningService, 'estimate' | 'summary'>, viewer: User, input: PrintRequestInput) {
  if (input.partId !== undefined) {
    const part = await findVisiblePart(viewer, input.partId).catch(() => null);
    if (!part || part.status !== 'published' || !part.publishedRevisionId) {
      throw AppError.field('partId', 'Only parts on the shelf can be asked for; pick one from the shelf.');
    }
    // a crew-only part stays inside its crew: the printer's owner must be in it too
    if (part.crewId && part.crewId !== input.crewId) {
      throw AppError.field('crewId', 'This part is published to one crew only; ask a member of that crew to print it.');
    }
    const revision = await PartRevision.findByPk(part.publishedRevisionId, {
      include: [{ model: PartFile, as: 'files', through: { attributes: ['position'] } }],
    });
    const recipes = await Recipe.findAll({ where: { revisionId: part.publishedRevisionId }, order: [['position', 'ASC']] });
    const recipe = input.recipeId ? recipes.find((x) => x.id === input.recipeId) : (recipes.find((x) => x.purpose === 'set-ready') ?? recipes[0]);
    if (!recipe)
      throw AppError.field(
        'recipeId',
        input.recipeId ? 'That recipe is not one of this part’s published recipes.' : 'This part has no published recipe to print it with.',
      );
    const files = [...((revision?.files ?? []) as FileWithPosition[])].sort((a, b) => (a.RevisionFile?.position ?? 0) - (b.RevisionFile?.position ?? 0));
    const model = files.find((f) => f.kind === 'model' && f.analysis && f.analysis.volumeMm3 > 0);
    if (!model) throw AppError.field('partId', 'This part has no analysed model file, so there is nothing to estimate the print from.');
    const material = (input.material ?? recipe.material) as MaterialId;
    const e = await planning.estimate(viewer, {
      fileId: model.id,
      material,
      nozzleMm: recipe.nozzleMm,
      layerMm: recipe.layerMm,
      walls: recipe.walls,
      topBottomLayers: recipe.topBottomLayers,
      infillPct: recipe.infillPct,
      speedMmS: recipe.speedMmS,
    });
    const grams = e.massG * input.quantity;
    return {
      kind: 'part' as const,
      partId: part.id,
      recipeId: recipe.id,
      kitId: null,
      title: revision?.title ?? part.slug,
      material,
      filament: [{ material, grams }],
      grams,
      minutes: e.timeMin * input.quantity,
      notes: [
        `Estimated from ${model.originalName} with its ${recipe.purpose} recipe (${recipe.material}, ${recipe.layerMm} mm layers, ${recipe.infillPct} % infill), ${input.quantity} × one piece.`,
        ...e.assumptions.filter((a) => !/price/i.test(a)),
      ],
    };
  }
  const summary = await planning.summary(viewer, input.kitId!);
  const itemParts = summary.items.length
    ? await Part.findAll({ where: { id: { [Op.in]: summary.items.flatMap((i) => (i.part ? [i.part.id] : [])) } }, attributes: ['id', 'crewId'] })
    : [];
  if (itemParts.some((p) => p.crewId && p.crewId !== input.crewId)) {
    throw AppError.field('crewId', 'This kit holds parts published to another crew only; ask a member of that crew, or take those items out first.');
  }
  const byMaterial = new Map<string, number>();
  let minutes = 0;
  const notes: string[] = [];
  for (const item of summary.items) {
    if (!item.total) {
      notes.push(`${item.title} has no estimate and is not priced.`);
      continue;
    }
    byMaterial.set(item.material, (byMaterial.get(item.material) ?? 0) + item.total.massG * input.quantity);
    minutes += item.total.hours * 60 * input.quantity;
  }
  if (!byMaterial.size) throw AppError.field('kitId', 'No item of this kit has an estimate, so there is nothing to price; add parts with model files first.');
  const filament = [...byMaterial].map(([material, grams]) => ({ material, grams }));
  return {
    kind: 'kit' as const,
    partId: null,
    recipeId: null,
    kitId: summary.kit.id,
    title: `Kit: ${summary.kit.name}`,
    material: filament.length === 1 ? filament[0].material : 'mixed',
    filament,
    grams: filament.reduce((s, f) => s + f.grams, 0),
    minutes,
    notes: [
      `Estimated from the kit’s ${summary.items.length} item(s) with each item’s recipe${input.quantity > 1 ? `, ${input.quantity} times over` : ''}.`,
      `Items: ${summary.items.map((i) => `${i.quantity * input.quantity} × ${i.title} (${i.material})`).join('; ')}.`,
      ...notes,
    ],
  };
}
