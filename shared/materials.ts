// Filament materials and where a printed part of each can safely go.
//
// Every figure names its source beside it; docs/sources.md lists them all. Sources, as in the
// project's trade reference:
//   [UL]  UL Prospector, generic PLA datasheet (density per ISO 1183)                  checked
//   [DD]  designerdata.nl, PETG (density, Tg, HDT)                                      checked
//   [NZ]  NETZSCH polymer database (Tg of PLA, TPU, PA 6)                               checked
//   [WP]  encyclopaedia articles on ABS and ASA (Tg), and densities of ABS, ASA, TPU, PA, PC   secondary
//   [FT]  Fashion and Textiles (2020) Table 2, doi 10.1186/s40691-020-00232-7 (hotend and bed)  checked;
//         ASA, PC and the upper bed values secondary
// Fibre-filled grades are from memory: they follow the base polymer, slightly denser.
//
// `softensAtC` is a deliberately low "starts to soften under load" figure for heat checks (our
// rule): the heat deflection temperature where the reference gives one, otherwise Tg − 10 °C.

export const MATERIAL_IDS = ['PLA', 'PETG', 'ABS', 'ASA', 'TPU', 'PA', 'PC', 'PLA-CF', 'PETG-CF', 'PA-CF'] as const;
export type MaterialId = (typeof MATERIAL_IDS)[number];

export interface TemperatureWindow {
  min: number;
  max: number;
}

export interface MaterialInfo {
  id: MaterialId;
  name: string;
  densityGcm3: number;
  softensAtC: number;
  hotendC: TemperatureWindow;
  bedC: TemperatureWindow;
  /** Rubbery material: not a substitute for a rigid one, nor the reverse. */
  flexible: boolean;
  /** Wears a brass nozzle; print with a hardened one (common practice). */
  abrasive: boolean;
}

const MATERIALS: Record<MaterialId, MaterialInfo> = {
  // Density 1.24 [UL]; Tg 55–65 °C [NZ], HDT 55–65 °C at 0.455 MPa [UL]: softens at the low end;
  // hotend 180–220, bed 20–60 [FT].
  PLA: {
    id: 'PLA',
    name: 'PLA (polylactic acid)',
    densityGcm3: 1.24,
    softensAtC: 55,
    hotendC: { min: 180, max: 220 },
    bedC: { min: 20, max: 60 },
    flexible: false,
    abrasive: false,
  },
  // Density 1.27, HDT about 70 °C at 1.82 MPa (Tg about 80 °C) [DD]; hotend 220–250, bed 70–85 [FT].
  PETG: {
    id: 'PETG',
    name: 'PETG (glycol-modified polyester)',
    densityGcm3: 1.27,
    softensAtC: 70,
    hotendC: { min: 220, max: 250 },
    bedC: { min: 70, max: 85 },
    flexible: false,
    abrasive: false,
  },
  // Density 1.04, Tg about 105 °C [WP] → softens at Tg − 10 = 95 °C (our rule); hotend 230–250, bed 90–110 [FT].
  ABS: {
    id: 'ABS',
    name: 'ABS (acrylonitrile butadiene styrene)',
    densityGcm3: 1.04,
    softensAtC: 95,
    hotendC: { min: 230, max: 250 },
    bedC: { min: 90, max: 110 },
    flexible: false,
    abrasive: false,
  },
  // Density 1.07, Tg about 100 °C [WP] → 90 °C (Tg − 10, our rule); hotend 240–260, bed 90–110 [FT, secondary].
  ASA: {
    id: 'ASA',
    name: 'ASA (acrylonitrile styrene acrylate)',
    densityGcm3: 1.07,
    softensAtC: 90,
    hotendC: { min: 240, max: 260 },
    bedC: { min: 90, max: 110 },
    flexible: false,
    abrasive: false,
  },
  // Density 1.21 [WP]; Tg −50 to −30 °C [NZ] says nothing about heat, so 60 °C is a cautious
  // softening value from memory; hotend 210–240, bed 20–60 [FT].
  TPU: {
    id: 'TPU',
    name: 'TPU (thermoplastic polyurethane, flexible)',
    densityGcm3: 1.21,
    softensAtC: 60,
    hotendC: { min: 210, max: 240 },
    bedC: { min: 20, max: 60 },
    flexible: true,
    abrasive: false,
  },
  // Density 1.14 [WP]; Tg 45–80 °C depending on absorbed water [NZ]. Being semi-crystalline it
  // keeps its shape above Tg, so 70 °C (from memory) is used rather than the wet Tg;
  // hotend 250–280, bed 70–100 [FT].
  PA: {
    id: 'PA',
    name: 'PA (nylon 6)',
    densityGcm3: 1.14,
    softensAtC: 70,
    hotendC: { min: 250, max: 280 },
    bedC: { min: 70, max: 100 },
    flexible: false,
    abrasive: false,
  },
  // Density 1.20, Tg about 147 °C [WP] → 137 °C (Tg − 10, our rule); hotend 260–300, bed 100–120 [FT, secondary].
  PC: {
    id: 'PC',
    name: 'PC (polycarbonate)',
    densityGcm3: 1.2,
    softensAtC: 137,
    hotendC: { min: 260, max: 300 },
    bedC: { min: 100, max: 120 },
    flexible: false,
    abrasive: false,
  },
  // From memory, every figure: density 1.29 (PLA plus a little fibre), softening as PLA (fibres
  // stiffen it but barely raise the temperature it softens at), hotend 20 °C up for the filler.
  'PLA-CF': {
    id: 'PLA-CF',
    name: 'PLA-CF (carbon-fibre-filled PLA)',
    densityGcm3: 1.29,
    softensAtC: 55,
    hotendC: { min: 200, max: 230 },
    bedC: { min: 20, max: 60 },
    flexible: false,
    abrasive: true,
  },
  // From memory, every figure: density 1.30, softening as PETG, hotend 10 °C up.
  'PETG-CF': {
    id: 'PETG-CF',
    name: 'PETG-CF (carbon-fibre-filled PETG)',
    densityGcm3: 1.3,
    softensAtC: 70,
    hotendC: { min: 230, max: 260 },
    bedC: { min: 70, max: 85 },
    flexible: false,
    abrasive: true,
  },
  // From memory, every figure: density 1.18; fibres raise nylon's heat deflection well above the
  // unfilled polymer's, so 100 °C; hotend 260–300.
  'PA-CF': {
    id: 'PA-CF',
    name: 'PA-CF (carbon-fibre-filled nylon)',
    densityGcm3: 1.18,
    softensAtC: 100,
    hotendC: { min: 260, max: 300 },
    bedC: { min: 70, max: 100 },
    flexible: false,
    abrasive: true,
  },
};

export function isMaterialId(value: unknown): value is MaterialId {
  return typeof value === 'string' && (MATERIAL_IDS as readonly string[]).includes(value);
}

export function materialInfo(id: MaterialId): MaterialInfo {
  const info = MATERIALS[id];
  if (!info) throw new RangeError(`Unknown material: ${String(id)}`);
  return info;
}

/** To the whole degree: the softening figures and the heat of a place are rough to a few degrees. */
export function formatC(celsius: number): string {
  return `${Math.round(celsius)} °C`;
}

/** A margin that rounds to nothing still reads as one: 0.6 → "less than 1 °C". */
function formatMarginC(celsius: number): string {
  return Math.abs(celsius) < 1 ? 'less than 1 °C' : formatC(celsius);
}

function formatWindow(window: TemperatureWindow): string {
  return `${window.min}–${window.max} °C`;
}

/** The heater is switched off; a bed at room temperature is what some materials want. */
const BED_OFF_C = 0;
/** Room temperature for "bed off" (common practice: 20–25 °C). */
const ROOM_TEMPERATURE_C = 25;

export interface RecipeTemperatures {
  material: MaterialId;
  hotendC: number;
  bedC: number;
}

function windowWarning(label: string, valueC: number, material: MaterialInfo, window: TemperatureWindow): string | null {
  if (valueC < window.min) return `${label} ${formatC(valueC)} is below ${material.id}'s usual ${formatWindow(window)}.`;
  if (valueC > window.max) return `${label} ${formatC(valueC)} is above ${material.id}'s usual ${formatWindow(window)}.`;
  return null;
}

function bedWarning(bedC: number, material: MaterialInfo): string | null {
  if (bedC === BED_OFF_C) {
    if (material.bedC.min <= ROOM_TEMPERATURE_C) return null;
    return `${material.id} usually needs a heated bed at ${formatWindow(material.bedC)}; this recipe has the bed off.`;
  }
  return windowWarning('Bed', bedC, material, material.bedC);
}

/** Sentences for temperatures outside the material's usual window; empty when all is usual. */
export function recipeWindowWarnings(recipe: RecipeTemperatures): string[] {
  const material = materialInfo(recipe.material);
  const warnings = [windowWarning('Hotend', recipe.hotendC, material, material.hotendC), bedWarning(recipe.bedC, material)];
  return warnings.filter((warning): warning is string => warning !== null);
}

export const HEAT_EXPOSURES = ['cabin', 'vehicle-sun', 'outdoor-sun', 'near-lights'] as const;
export type HeatExposure = (typeof HEAT_EXPOSURES)[number];

export interface HeatExposureInfo {
  id: HeatExposure;
  label: string;
  temperatureC: number;
  /** Completes "… below the 69.4 °C of …". */
  where: string;
}

const EXPOSURES: Record<HeatExposure, HeatExposureInfo> = {
  // Vanos et al., Temperature 2018; 5(3):276–292, doi 10.1080/23328940.2018.1468205: cabin air
  // after an hour parked in sun 46.7 °C, dashboard 69.4 °C.
  cabin: { id: 'cabin', label: 'Inside a parked car', temperatureC: 46.7, where: 'the air in a car parked in the sun' },
  'vehicle-sun': {
    id: 'vehicle-sun',
    label: 'On a car dashboard or vehicle rig in sun',
    temperatureC: 69.4,
    where: 'a car dashboard after an hour in the sun',
  },
  // From memory, no source found: a dark surface in full summer sun. Kept below the 69.4 °C
  // dashboard above (a dashboard under glass runs hotter than a part in moving air).
  'outdoor-sun': { id: 'outdoor-sun', label: 'Outdoors in direct sun', temperatureC: 65, where: 'a dark part in direct sun' },
  // From memory, no source found, chosen on the warm side: a mount a short way from tungsten or
  // HMI heads (their housings run far hotter; the figure is for a mount beside them, not on them).
  'near-lights': { id: 'near-lights', label: 'Near lighting heads', temperatureC: 60, where: 'a mount near hot lights' },
};

export function heatExposureInfo(id: HeatExposure): HeatExposureInfo {
  const info = EXPOSURES[id];
  if (!info) throw new RangeError(`Unknown heat exposure: ${String(id)}`);
  return info;
}

/**
 * Headroom a part needs between the exposure and its softening point to count as safe: rig
 * parts carry load, dark colours run hotter, and prints vary. Our own choice (no source).
 */
export const HEAT_MARGIN_C = 10;

export interface HeatCheck {
  ok: boolean;
  /** Softening point minus exposure temperature; negative means it will soften. */
  marginC: number;
  message: string;
  saferMaterials: MaterialId[];
}

function marginFor(material: MaterialInfo, exposure: HeatExposureInfo): number {
  return Math.round((material.softensAtC - exposure.temperatureC) * 10) / 10;
}

function saferThan(material: MaterialInfo, exposure: HeatExposureInfo): MaterialId[] {
  return MATERIAL_IDS.filter((id) => {
    const other = MATERIALS[id];
    return id !== material.id && other.flexible === material.flexible && marginFor(other, exposure) >= HEAT_MARGIN_C;
  });
}

function orList(ids: readonly string[]): string {
  if (ids.length <= 1) return ids.join('');
  return `${ids.slice(0, -1).join(', ')} or ${ids.at(-1)}`;
}

function alternatives(safer: readonly MaterialId[], verb: string): string {
  if (safer.length === 0) return 'No material in the list has a safe margin there; keep the part out of the heat.';
  return `${verb} ${orList(safer.slice(0, 3))} instead.`;
}

export function heatCheck(materialId: MaterialId, exposureId: HeatExposure): HeatCheck {
  const material = materialInfo(materialId);
  const exposure = heatExposureInfo(exposureId);
  const marginC = marginFor(material, exposure);
  const softens = `${material.id} softens at about ${formatC(material.softensAtC)}`;
  const heat = `the ${formatC(exposure.temperatureC)} of ${exposure.where}`;

  if (marginC >= HEAT_MARGIN_C) {
    return { ok: true, marginC, message: `${softens}, well above ${heat}.`, saferMaterials: [] };
  }
  const saferMaterials = saferThan(material, exposure);
  const message =
    marginC >= 0
      ? `${softens}, only ${formatMarginC(marginC)} above ${heat}, so it may sag under load. ${alternatives(saferMaterials, 'Consider')}`
      : `${softens}, below ${heat}, so it will deform. ${alternatives(saferMaterials, 'Print it in')}`;
  return { ok: false, marginC, message, saferMaterials };
}
