// The JSON printers, price sheets and kits are shown as (shapes in shared/api/planning.ts).
import { Op } from 'sequelize';
import type {
  KitAccess,
  KitCrewShareInfo,
  KitDetail,
  KitItemInfo,
  KitListItem,
  KitRecipeRef,
  KitShareInfo,
  PrinterInfo,
  PriceSheetInfo,
} from '@shared/api/planning';
import { DEFAULT_PRICE_PER_KG } from '@shared/estimate';
import { DEFAULT_CURRENCY } from '@shared/money';
import { MATERIAL_IDS, type MaterialId } from '@shared/materials';
import { MADE_PART_RECIPE } from '@shared/schemas/make';
import { madeTitle, madeWith } from '../make/made';
import { Crew, Kit, KitCrewShare, KitItem, KitShare, Part, PartFile, PartRevision, Printer, Recipe, User, type PriceSheet } from '../../db/models';
import { crewAllows, type PartAudience } from '../parts/access';
import { coverThumbnail } from '../parts/presenter';

export function presentPrinter(p: Printer): PrinterInfo {
  return {
    id: p.id,
    name: p.name,
    bedMm: p.bedMm(),
    bedMarginMm: p.bedMarginMm,
    nozzleMm: p.nozzleMm,
    watts: p.watts,
    notes: p.notes,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

/** Every material's price per kg: the member's own where set, the default elsewhere. */
export function effectivePrices(sheet: PriceSheet | null): Record<MaterialId, number> {
  const own = sheet?.pricesPerKg ?? {};
  return Object.fromEntries(MATERIAL_IDS.map((m) => [m, own[m] ?? DEFAULT_PRICE_PER_KG[m]])) as Record<MaterialId, number>;
}

export function presentPriceSheet(sheet: PriceSheet | null): PriceSheetInfo {
  const own = sheet?.pricesPerKg ?? {};
  return {
    prices: effectivePrices(sheet),
    defaults: { ...DEFAULT_PRICE_PER_KG },
    custom: MATERIAL_IDS.filter((m) => own[m] !== undefined),
    pricePerKwh: sheet?.pricePerKwh ?? null,
    machineHourRate: sheet?.machineHourRate ?? null,
    currency: sheet?.currency ?? DEFAULT_CURRENCY,
    updatedAt: sheet?.updatedAt?.toISOString() ?? null,
  };
}

function memberRef(user: User | undefined, id: number) {
  return { id, displayName: user?.displayName ?? '' };
}

export function presentShares(shares: KitShare[], access: KitAccess): KitShareInfo[] {
  return shares
    .map((s) => ({
      user: { ...memberRef(s.user, s.userId), email: access === 'owner' ? (s.user?.email ?? null) : null },
      access: s.access,
    }))
    .sort((a, b) => a.user.displayName.localeCompare(b.user.displayName));
}

function recipeRef(recipe: Recipe, part: Part): KitRecipeRef {
  return {
    id: recipe.id,
    purpose: recipe.purpose,
    material: recipe.material,
    nozzleMm: recipe.nozzleMm,
    layerMm: recipe.layerMm,
    walls: recipe.walls,
    topBottomLayers: recipe.topBottomLayers,
    infillPct: recipe.infillPct,
    speedMmS: recipe.speedMmS,
    current: recipe.revisionId === part.publishedRevisionId,
  };
}

export function isOnShelfForKits(part: Part): boolean {
  return part.status === 'published' && part.publishedRevisionId !== null;
}

/**
 * A kit's items (or one of them) with their part, recipe and printer, in the kit's order. With an
 * audience, items whose part is published to a crew the viewer is not in are left out.
 */
export async function loadItems(kitId: number, itemId?: number, audience?: PartAudience): Promise<KitItem[]> {
  const items = await KitItem.findAll({
    where: itemId === undefined ? { kitId } : { kitId, id: itemId },
    include: [
      {
        model: Part,
        as: 'part',
        include: [{ model: PartRevision, as: 'publishedRevision', include: [{ model: PartFile, as: 'files', through: { attributes: ['position'] } }] }],
      },
      { model: Recipe, as: 'recipe' },
      { model: Printer, as: 'printer' },
    ],
    order: [
      ['position', 'ASC'],
      ['id', 'ASC'],
    ],
  });
  return audience ? items.filter((i) => !i.part || crewAllows(audience, i.part)) : items;
}

const filesInOrder = (files: PartFile[]) =>
  [...files].sort(
    (a, b) =>
      ((a as unknown as { RevisionFile?: { position: number } }).RevisionFile?.position ?? 0) -
      ((b as unknown as { RevisionFile?: { position: number } }).RevisionFile?.position ?? 0),
  );

export function presentItem(item: KitItem): KitItemInfo {
  const part = item.part ?? null;
  const recipe = part ? (item.recipe ?? null) : null;
  return {
    id: item.id,
    position: item.position,
    part: part
      ? {
          id: part.id,
          slug: part.slug,
          title: part.publishedRevision?.title ?? part.slug,
          onShelf: isOnShelfForKits(part),
          thumbnailUrl: coverThumbnail(part.id, filesInOrder(part.publishedRevision?.files ?? [])),
        }
      : null,
    made: item.makeKind ? madeKitInfo(item) : null,
    quantity: item.quantity,
    recipe: recipe && part ? recipeRef(recipe, part) : null,
    materialOverride: item.material,
    material: item.material ?? recipe?.material ?? null,
    printer: item.printer ? { id: item.printer.id, name: item.printer.name } : null,
    boughtPriceEach: item.boughtPriceEach,
    servicePriceEach: item.servicePriceEach,
    serviceShipping: item.serviceShipping,
  };
}

/** A made item: its maker, sizes and the settings it is planned with. */
export function madeKitInfo(item: KitItem): NonNullable<KitItemInfo['made']> {
  const params = item.makeParams ?? {};
  const g = item.makeGeometry;
  return {
    ...madeWith(item.makeKind!, params),
    name: madeTitle(item.makeKind!, params),
    sizeMm: g?.sizeMm ?? null,
    loadBearing: g?.loadBearing ?? false,
    recipe: MADE_PART_RECIPE,
  };
}

export async function presentKit(kit: Kit, access: KitAccess, audience: PartAudience): Promise<KitDetail> {
  const [owner, shares, crewShares, items] = await Promise.all([
    User.findByPk(kit.ownerId),
    KitShare.findAll({ where: { kitId: kit.id }, include: [{ model: User, as: 'user' }] }),
    KitCrewShare.findAll({ where: { kitId: kit.id }, include: [{ model: Crew, as: 'crew' }], order: [['id', 'ASC']] }),
    loadItems(kit.id, undefined, audience),
  ]);
  return {
    id: kit.id,
    name: kit.name,
    production: kit.production,
    startsOn: kit.startsOn,
    endsOn: kit.endsOn,
    locationNotes: kit.locationNotes,
    heatExposure: kit.heatExposure,
    printHoursPerDay: kit.printHoursPerDay,
    printerPrice: kit.printerPrice,
    owner: memberRef(owner ?? undefined, kit.ownerId),
    access,
    createdAt: kit.createdAt.toISOString(),
    updatedAt: kit.updatedAt.toISOString(),
    shares: presentShares(shares, access),
    crewShares: presentCrewShares(crewShares),
    items: items.map(presentItem),
  };
}

export function presentCrewShares(rows: KitCrewShare[]): KitCrewShareInfo[] {
  return rows.map((r) => ({ crewId: r.crewId, crewName: r.crew?.name ?? '', access: r.access }));
}

export async function presentKitList(kits: Kit[], accessOf: (kit: Kit) => KitAccess, audience: PartAudience): Promise<KitListItem[]> {
  if (!kits.length) return [];
  const ids = kits.map((k) => k.id);
  const [owners, rows] = await Promise.all([
    User.findAll({ where: { id: { [Op.in]: [...new Set(kits.map((k) => k.ownerId))] } } }),
    KitItem.findAll({
      where: { kitId: { [Op.in]: ids } },
      attributes: ['kitId'],
      include: [{ model: Part, as: 'part', attributes: ['id', 'crewId', 'authorId'] }],
    }),
  ]);
  const counts = new Map<number, number>();
  for (const r of rows) if (!r.part || crewAllows(audience, r.part)) counts.set(r.kitId, (counts.get(r.kitId) ?? 0) + 1);
  return kits.map((kit) => ({
    id: kit.id,
    name: kit.name,
    production: kit.production,
    startsOn: kit.startsOn,
    endsOn: kit.endsOn,
    heatExposure: kit.heatExposure,
    owner: memberRef(
      owners.find((o) => o.id === kit.ownerId),
      kit.ownerId,
    ),
    access: accessOf(kit),
    itemCount: counts.get(kit.id) ?? 0,
    updatedAt: kit.updatedAt.toISOString(),
  }));
}
