// Rough print estimates for shoot planning: filament, time, cost, and whether a part fits a bed.
//
// Model (each step is also reported in `assumptions`):
// - line width w = nozzle × 1.125 unless given (common practice);
// - walls = surface area × walls × w;
// - top and bottom skins = footprint × top/bottom layers × layer height × 2, where the footprint
//   is the smallest of the bounding-box x·y, the mean cross-section (volume ÷ height) and half
//   the surface area, so hollow or sloped parts are not charged a full slab;
// - infill = infill % × what remains of the solid volume, floored at 0;
// - the total never exceeds the solid volume;
// - mass = volume × density; filament length L = m / (ρ · π · (d/2)²);
// - time = volume ÷ (speed × layer height × w × flow efficiency) + a fixed time per layer;
// - cost = mass × price per kg, plus electricity when watts and a price per kWh are given.
import { materialInfo, type MaterialId } from './materials';

export type Size3 = readonly [number, number, number];

export interface PartGeometry {
  volumeMm3: number;
  areaMm2: number;
  /** Bounding box x, y, z. */
  sizeMm: Size3;
}

export interface PrintSettings {
  material: MaterialId;
  nozzleMm: number;
  layerMm: number;
  walls: number;
  topBottomLayers: number;
  infillPct: number;
  speedMmS?: number;
  pricePerKg?: number;
  lineWidthMm?: number;
  printerWatts?: number;
  pricePerKwh?: number;
}

export const FILAMENT_DIAMETERS_MM = ['1.75', '2.85'] as const;
export type FilamentDiameter = (typeof FILAMENT_DIAMETERS_MM)[number];

export interface PrintEstimate {
  /** Plastic actually extruded, not the part's solid volume. */
  volumeMm3: number;
  massG: number;
  lengthM: Record<FilamentDiameter, number>;
  timeMin: number;
  cost: number;
  assumptions: string[];
}

/** Common practice: slicers default to a line 1.1–1.2 × the nozzle (0.45 mm for 0.4 mm). */
export const LINE_WIDTH_PER_NOZZLE = 1.125;
/** Common practice for a general-purpose print speed on a hobby printer. */
export const DEFAULT_SPEED_MM_S = 60;
/**
 * Share of the set speed a printer averages once acceleration, travel and slower outer walls
 * are counted. A rough figure from memory; estimates should be read as ± 30 %.
 */
export const FLOW_EFFICIENCY = 0.6;
/** Layer change, retraction and travel to the next layer's start (from memory). */
export const LAYER_OVERHEAD_S = 6;
/**
 * Typical spool prices per kg in the catalogue's currency, every one from memory (no price list
 * consulted: prices vary by brand, colour and year); members set their own on their price sheet.
 */
export const DEFAULT_PRICE_PER_KG: Record<MaterialId, number> = {
  PLA: 20,
  PETG: 22,
  ABS: 20,
  ASA: 28,
  TPU: 30,
  PA: 45,
  PC: 40,
  'PLA-CF': 35,
  'PETG-CF': 40,
  'PA-CF': 70,
};

function requireAtLeast(name: string, value: number, min: number): void {
  if (!Number.isFinite(value) || value < min) throw new RangeError(`${name} must be a number ≥ ${min}.`);
}

function requirePositive(name: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a number > 0.`);
}

function validate(geometry: PartGeometry, settings: PrintSettings): void {
  requireAtLeast('Volume', geometry.volumeMm3, 0);
  requireAtLeast('Surface area', geometry.areaMm2, 0);
  geometry.sizeMm.forEach((side) => requireAtLeast('Each size', side, 0));
  requirePositive('Nozzle diameter', settings.nozzleMm);
  requirePositive('Layer height', settings.layerMm);
  requireAtLeast('Walls', settings.walls, 0);
  requireAtLeast('Top and bottom layers', settings.topBottomLayers, 0);
  if (!(settings.infillPct >= 0 && settings.infillPct <= 100)) throw new RangeError('Infill must be between 0 and 100 %.');
  if (settings.speedMmS !== undefined) requirePositive('Speed', settings.speedMmS);
  if (settings.lineWidthMm !== undefined) requirePositive('Line width', settings.lineWidthMm);
  if (settings.pricePerKg !== undefined) requireAtLeast('Price per kg', settings.pricePerKg, 0);
}

/** Metres of filament of diameter `diameterMm` that weigh `massG`. */
export function filamentLengthM(massG: number, diameterMm: number, densityGcm3: number): number {
  const volumeMm3 = (massG / densityGcm3) * 1000;
  const crossSectionMm2 = Math.PI * (diameterMm / 2) ** 2;
  return volumeMm3 / crossSectionMm2 / 1000;
}

function skinFootprintMm2({ volumeMm3, areaMm2, sizeMm: [x, y, z] }: PartGeometry): number {
  const meanCrossSection = z > 0 ? volumeMm3 / z : 0;
  return Math.min(x * y, meanCrossSection, areaMm2 / 2);
}

function layerCount(heightMm: number, layerMm: number): number {
  // The small allowance keeps 20 / 0.2 at 100 layers despite binary rounding.
  return Math.max(1, Math.ceil(heightMm / layerMm - 1e-9));
}

function round(value: number, digits = 2): number {
  return Number(value.toFixed(digits));
}

export function estimatePrint(geometry: PartGeometry, settings: PrintSettings): PrintEstimate {
  validate(geometry, settings);
  const material = materialInfo(settings.material);
  const lineWidth = settings.lineWidthMm ?? settings.nozzleMm * LINE_WIDTH_PER_NOZZLE;
  const speed = settings.speedMmS ?? DEFAULT_SPEED_MM_S;
  const pricePerKg = settings.pricePerKg ?? DEFAULT_PRICE_PER_KG[material.id];
  const solid = geometry.volumeMm3;

  const shell = geometry.areaMm2 * settings.walls * lineWidth;
  const footprint = skinFootprintMm2(geometry);
  const skins = footprint * settings.topBottomLayers * settings.layerMm * 2;
  const infill = (settings.infillPct / 100) * Math.max(0, solid - shell - skins);
  const volumeMm3 = Math.min(solid, shell + skins + infill);

  const massG = (volumeMm3 / 1000) * material.densityGcm3;
  const layers = layerCount(geometry.sizeMm[2], settings.layerMm);
  const extrusionS = volumeMm3 / (speed * settings.layerMm * lineWidth * FLOW_EFFICIENCY);
  const timeMin = (extrusionS + layers * LAYER_OVERHEAD_S) / 60;

  const assumptions = [
    settings.lineWidthMm === undefined
      ? `Line width ${round(lineWidth, 3)} mm: the ${settings.nozzleMm} mm nozzle × ${LINE_WIDTH_PER_NOZZLE} (common practice).`
      : `Line width ${lineWidth} mm, as given.`,
    `Walls: ${settings.walls} × ${round(lineWidth, 3)} mm over the whole ${round(geometry.areaMm2, 0)} mm² surface.`,
    `Top and bottom: ${settings.topBottomLayers} layers each over ${round(footprint, 0)} mm², the smallest of the bounding-box footprint, the mean cross-section and half the surface.`,
    `Infill: ${settings.infillPct} % of the inside; the total is capped at the part's solid volume.`,
    `${material.id} density ${material.densityGcm3} g/cm³.`,
    `Time: the printer averages ${FLOW_EFFICIENCY * 100} % of the set ${speed} mm/s, plus ${LAYER_OVERHEAD_S} s for each of ${layers} layers.`,
    settings.pricePerKg === undefined
      ? `Filament at ${pricePerKg} per kg, a typical ${material.id} price (from memory).`
      : `Filament at ${pricePerKg} per kg, as given.`,
  ];

  let cost = (massG / 1000) * pricePerKg;
  if (settings.printerWatts !== undefined && settings.pricePerKwh !== undefined) {
    const kwh = (settings.printerWatts * timeMin) / 60 / 1000;
    cost += kwh * settings.pricePerKwh;
    assumptions.push(`Electricity: ${settings.printerWatts} W for ${round(timeMin / 60)} h at ${settings.pricePerKwh} per kWh.`);
  } else {
    assumptions.push('Electricity not included; give the printer’s watts and a price per kWh to add it.');
  }

  return {
    volumeMm3,
    massG,
    lengthM: {
      '1.75': filamentLengthM(massG, 1.75, material.densityGcm3),
      '2.85': filamentLengthM(massG, 2.85, material.densityGcm3),
    },
    timeMin,
    cost,
    assumptions,
  };
}

/** Whole numbers from sums of decimals: 16.000000000001 h at 8 h a day is still 2 days, 1000.0000000001 g one spool. */
export const ROUNDING_SLACK = 1e-9;

/** Rounds up to a whole number, forgiving the last bits of binary rounding. */
export function ceilWhole(value: number): number {
  return Math.max(0, Math.ceil(value - ROUNDING_SLACK));
}

/** Whole spools to buy for `grams` of filament (rounded up with the same slack as print days). */
export function spoolsNeeded(grams: number, spoolG = 1000): number {
  requireAtLeast('Grams', grams, 0);
  requirePositive('Spool weight', spoolG);
  return ceilWhole(grams / spoolG);
}

export type BedFit = 'as-is' | 'rotated' | 'diagonal' | 'no';

export interface BedFitResult {
  fits: BedFit;
  /**
   * The part's sizes as placed. For 'as-is' and 'rotated': along bed x, y and z. For
   * 'diagonal': the footprint's long side, its short side, and the height.
   */
  orientation?: [number, number, number];
  /** For 'diagonal': angle between the footprint's long side and the bed's x edge. */
  angleDeg?: number;
  message: string;
}

/** Rounding slack so a part exactly as big as the usable bed fits (our choice, far below a micron). */
const FIT_TOLERANCE_MM = 1e-9;

// Keep the modelled z up first, then try each other axis standing up.
const AXIS_ORDERS = [
  [0, 1, 2],
  [1, 0, 2],
  [0, 2, 1],
  [2, 0, 1],
  [1, 2, 0],
  [2, 1, 0],
] as const;

function fitsAligned(part: Size3, bed: Size3): boolean {
  return part.every((side, axis) => side <= bed[axis] + FIT_TOLERANCE_MM);
}

/**
 * Angle in radians (long side from the bed's long edge) at which a p × q rectangle fits an a × b
 * rectangle when it cannot fit aligned, or null. Uses Carver's condition (W. E. Carver, Amer.
 * Math. Monthly 1956; from memory): for p ≥ q, a ≥ b and p > a, it fits iff q ≤ b and
 * b ≥ (2pqa + (p² − q²)·√(p² + q² − a²)) / (p² + q²).
 */
function tiltedFitAngle(p: number, q: number, a: number, b: number): number | null {
  if (p <= a || q > b) return null;
  const diagonalSq = p * p + q * q;
  const neededB = (2 * p * q * a + (p * p - q * q) * Math.sqrt(diagonalSq - a * a)) / diagonalSq;
  if (neededB > b + FIT_TOLERANCE_MM) return null;
  // The tilt where the long side's projection on the long edge is exactly a.
  return Math.atan2(q, p) + Math.acos(a / Math.sqrt(diagonalSq));
}

function formatMm(sides: readonly number[]): string {
  return `${sides.map((side) => round(side, 1)).join(' × ')} mm`;
}

function diagonalFit(part: Size3, bed: Size3): BedFitResult | null {
  const [bedX, bedY, bedZ] = bed;
  const [a, b] = bedX >= bedY ? [bedX, bedY] : [bedY, bedX];
  for (const vertical of [2, 0, 1] as const) {
    const height = part[vertical];
    if (height > bedZ + FIT_TOLERANCE_MM) continue;
    const [s, t] = part.filter((_, axis) => axis !== vertical);
    const [p, q] = s >= t ? [s, t] : [t, s];
    const tilt = tiltedFitAngle(p, q, a, b);
    if (tilt === null) continue;
    const fromLongEdgeDeg = (tilt * 180) / Math.PI;
    const angleDeg = bedX >= bedY ? fromLongEdgeDeg : 90 - fromLongEdgeDeg;
    return {
      fits: 'diagonal',
      orientation: [p, q, height],
      angleDeg,
      message: `Fits only diagonally: lay it with its ${formatMm([p, q])} side down (${round(height, 1)} mm tall) and turn it about ${Math.round(angleDeg)}° from the bed's x edge.`,
    };
  }
  return null;
}

/**
 * Room kept free round the bed's edge, per side, for a brim or skirt (common practice: slicers lay
 * a skirt a few millimetres out and brims of about 5 mm). A printer setting; this is its default.
 */
export const DEFAULT_BED_MARGIN_MM = 5;

export interface BedFitOptions {
  /** Kept free on each side of the bed's x and y; default DEFAULT_BED_MARGIN_MM. */
  marginMm?: number;
}

export function fitOnBed(partSizeMm: Size3, fullBedMm: Size3, options: BedFitOptions = {}): BedFitResult {
  const marginMm = options.marginMm ?? DEFAULT_BED_MARGIN_MM;
  [...partSizeMm, ...fullBedMm, marginMm].forEach((side) => requireAtLeast('Each size', side, 0));
  const bedMm: Size3 = [Math.max(0, fullBedMm[0] - 2 * marginMm), Math.max(0, fullBedMm[1] - 2 * marginMm), fullBedMm[2]];
  const bedText = marginMm > 0 ? `${formatMm(fullBedMm)} bed (keeping ${round(marginMm, 1)} mm round the edge for a brim or skirt)` : `${formatMm(fullBedMm)} bed`;
  if (fitsAligned(partSizeMm, bedMm)) {
    return { fits: 'as-is', orientation: [...partSizeMm], message: `Fits the ${bedText} as modelled.` };
  }
  for (const order of AXIS_ORDERS) {
    const placed: [number, number, number] = [partSizeMm[order[0]], partSizeMm[order[1]], partSizeMm[order[2]]];
    if (fitsAligned(placed, bedMm)) {
      return { fits: 'rotated', orientation: placed, message: `Fits if turned to ${formatMm(placed)} (x × y × z).` };
    }
  }
  return (
    diagonalFit(partSizeMm, bedMm) ?? {
      fits: 'no',
      message: `Too big for the ${bedText} in any orientation; split the part or use a larger printer.`,
    }
  );
}
