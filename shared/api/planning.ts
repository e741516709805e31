// What the planning endpoints answer (estimate, printers, prices, shoot kits), for the client. The
// server builds these in server/modules/planning/presenter.ts and service.ts, typed against them.
import type { FilamentDiameter, Size3 } from '../estimate';
import type { KitItemSummary, KitSummary } from '../kit-summary';
import type { HeatExposure, HeatExposureInfo, MaterialId } from '../materials';
import type { RecipeInput } from '../schemas/recipe';
import type { KitShareAccess } from '../schemas/planning';
import type { MadeWith } from './make';

/** The print settings a made item is planned with. */
export type MadeRecipe = { nozzleMm: number; layerMm: number; walls: number; topBottomLayers: number; infillPct: number; speedMmS: number };

/** POST /api/estimate */
export interface EstimateResult {
  /** Plastic extruded, mm³ (not the part's solid volume). */
  volumeMm3: number;
  massG: number;
  lengthM: Record<FilamentDiameter, number>;
  timeMin: number;
  /** Filament, plus electricity when printerWatts and a price per kWh are known. */
  cost: number;
  pricePerKg: number;
  /** The extruded volume split into walls, top and bottom skins, and infill (mm³). */
  partsMm3: { walls: number; skins: number; infill: number };
  /** 'slices' when a model file was cut into layers, 'figures' for the quick estimate. */
  method: 'slices' | 'figures';
  assumptions: string[];
  /** What the estimate was made from. */
  geometry: {
    source: 'file' | 'figures';
    fileId: number | null;
    partId: number | null;
    volumeMm3: number;
    areaMm2: number;
    sizeMm: Size3;
  };
}

/** GET /api/printers (items), POST /api/printers, PATCH /api/printers/:id */
export interface PrinterInfo {
  id: number;
  name: string;
  /** Bed x, y, z in mm. */
  bedMm: [number, number, number];
  /** Kept free round the bed's edge for a brim or skirt, per side (mm). */
  bedMarginMm: number;
  nozzleMm: number;
  watts: number | null;
  notes: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface PrinterList {
  items: PrinterInfo[];
}

/** GET and PUT /api/me/prices */
export interface PriceSheetInfo {
  /** Price per kg for every material: the member's own where set, else the default. */
  prices: Record<MaterialId, number>;
  defaults: Record<MaterialId, number>;
  /** Materials the member priced themselves. */
  custom: MaterialId[];
  pricePerKwh: number | null;
  /** Charged per hour of printing on print requests for crew members; null when none. */
  machineHourRate: number | null;
  /** ISO 4217 code the prices are in (shared/money.ts). */
  currency: string;
  /** Null until the member first saves prices. */
  updatedAt: string | null;
}

export type KitAccess = 'owner' | KitShareAccess;

export interface KitMemberRef {
  id: number;
  displayName: string;
}

export interface KitShareInfo {
  user: KitMemberRef & {
    /** Only the kit's owner sees the addresses. */
    email: string | null;
  };
  access: KitShareAccess;
}

/** GET /api/kits */
export interface KitListItem {
  id: number;
  name: string;
  production: string | null;
  startsOn: string | null;
  endsOn: string | null;
  heatExposure: HeatExposure | null;
  owner: KitMemberRef;
  /** What the viewer may do: owner (everything), edit (kit fields and items), read (look). */
  access: KitAccess;
  itemCount: number;
  updatedAt: string;
}

export interface KitList {
  items: KitListItem[];
}

export type KitRecipeRef = Pick<RecipeInput, 'purpose' | 'material' | 'nozzleMm' | 'layerMm' | 'walls' | 'topBottomLayers' | 'infillPct' | 'speedMmS'> & {
  id: number;
  /** False when the part has a newer published revision than the one this recipe belongs to. */
  current: boolean;
};

export interface KitItemInfo {
  id: number;
  position: number;
  /** Null for a made item (then `made` says what to make). thumbnailUrl: the part's first photo, else the picture drawn from its model; null when it has neither yet. */
  part: { id: number; slug: string; title: string; onShelf: boolean; thumbnailUrl: string | null } | null;
  made: (MadeWith & { name: string; sizeMm: [number, number, number] | null; loadBearing: boolean; recipe: MadeRecipe }) | null;
  quantity: number;
  /** Null when the recipe has gone; the summary then uses the part's first set-ready recipe. */
  recipe: KitRecipeRef | null;
  /** The member's choice instead of the recipe's material, or null. */
  materialOverride: MaterialId | null;
  /** What it will be printed in (null only when the recipe has gone and no material was chosen). */
  material: MaterialId | null;
  printer: { id: number; name: string } | null;
  boughtPriceEach: number | null;
  servicePriceEach: number | null;
  serviceShipping: number | null;
}

/** GET /api/kits/:id, POST /api/kits (201), PATCH /api/kits/:id */
export interface KitDetail extends Omit<KitListItem, 'itemCount'> {
  locationNotes: string | null;
  printHoursPerDay: number;
  printerPrice: number | null;
  createdAt: string;
  shares: KitShareInfo[];
  /** Whole crews the kit is shared with (every member of the crew gets the access). */
  crewShares: KitCrewShareInfo[];
  /** Items whose part is published to a crew the viewer is not in are left out. */
  items: KitItemInfo[];
}

export interface KitCrewShareInfo {
  crewId: number;
  crewName: string;
  access: 'read' | 'edit';
}

/** PUT /api/kits/:id/shares */
export interface KitShareList {
  shares: KitShareInfo[];
}

/** PUT /api/kits/:id/crew-shares */
export interface KitCrewShareList {
  crewShares: KitCrewShareInfo[];
}

/** GET /api/kits/:id/summary */
export interface KitSummaryResponse extends Omit<KitSummary, 'items'> {
  kit: {
    id: number;
    name: string;
    production: string | null;
    startsOn: string | null;
    endsOn: string | null;
    heatExposure: HeatExposureInfo | null;
    printHoursPerDay: number;
    printerPrice: number | null;
  };
  /** Every cost and price of the kit is in this currency (ISO 4217): the kit owner's. */
  currency: string;
  /** part is null for a made item. */
  items: (KitItemSummary & { part: { id: number; slug: string } | null })[];
}
