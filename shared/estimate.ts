// Over 350 lines: much of it is the formulas and their sources in comments; the estimate and the bed fit
// share the settings and geometry types.
// Print estimates for shoot planning: filament, time, cost, and whether a part fits a bed.
//
// Material comes from layer figures (shared/slice.ts): per layer of thickness t,
// - walls = the band between the outline and its inset by walls × line width (outline length ×
//   walls × line width, less the overlap at corners);
// - top and bottom skins = the inset area not covered by every layer within `topBottomLayers`
//   above and below;
// - infill = the rest of the inset area × infill %;
// each × t. For a model file the layers are real slices of the mesh (estimateFromSlices). For a
// request that sends only figures (volume, area, size), the part is taken as a prism of its mean
// cross-section (volume ÷ height) with the side area (area − 2 × that) as its outline × height,
// rectangle-like corners, and solid skins at its very top and bottom (the quick estimate).
//
// Time, per layer: every path is cut into straight moves (walls: between sharp corners; skins and
// infill: lines as long as the region's mean chord), each timed with a trapezoidal speed profile
// (accelerate at a, cruise at v, brake at a; a move too short to reach v never does); plus travel
// between islands and from walls to the fill, at the travel speed, and a fixed layer change.
// - mass = volume × density; filament length L = m / (ρ · π · (d/2)²);
// - cost = mass × price per kg, plus electricity when watts and a price per kWh are given.
import { materialInfo, type MaterialId } from './materials';
import type { LayerFigures, SliceProfile } from './slice';

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
  /** Printing and travel acceleration; default DEFAULT_ACCELERATION_MM_S2. */
  accelerationMmS2?: number;
  travelSpeedMmS?: number;
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
  /** The same split into walls, top and bottom skins, and infill. */
  partsMm3: { walls: number; skins: number; infill: number };
  massG: number;
  lengthM: Record<FilamentDiameter, number>;
  timeMin: number;
  cost: number;
  /** 'slices' when the layers were cut from the mesh, 'figures' for the quick estimate. */
  method: 'slices' | 'figures';
  assumptions: string[];
}

/** Common practice: slicers default to a line 1.1–1.2 × the nozzle (0.45 mm for 0.4 mm). */
export const LINE_WIDTH_PER_NOZZLE = 1.125;
/** Common practice for a general-purpose print speed on a hobby printer. */
export const DEFAULT_SPEED_MM_S = 60;
/** From memory: hobby printers accelerate at roughly 500–3,000 mm/s²; a middling figure. */
export const DEFAULT_ACCELERATION_MM_S2 = 1000;
/** Common practice: travel moves run at about 150 mm/s on hobby printers. */
export const DEFAULT_TRAVEL_SPEED_MM_S = 150;
/** From memory: lifting to the next layer, retracting and priming take about half a second. */
export const LAYER_CHANGE_S = 0.5;
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
  validateSettings(settings);
}

/** Metres of filament of diameter `diameterMm` that weigh `massG`. */
export function filamentLengthM(massG: number, diameterMm: number, densityGcm3: number): number {
  const volumeMm3 = (massG / densityGcm3) * 1000;
  const crossSectionMm2 = Math.PI * (diameterMm / 2) ** 2;
  return volumeMm3 / crossSectionMm2 / 1000;
}

function layerCount(heightMm: number, layerMm: number): number {
  // The small allowance keeps 20 / 0.2 at 100 layers despite binary rounding.
  return Math.max(1, Math.ceil(heightMm / layerMm - 1e-9));
}

function round(value: number, digits = 2): number {
  return Number(value.toFixed(digits));
}

/**
 * Seconds for a straight move of `length` mm that starts and ends at rest, accelerating and braking
 * at `accel` mm/s² and cruising at `speed` mm/s (a trapezoidal speed profile): s/v + v/a when the
 * move is long enough to reach v (s ≥ v²/a), else 2·√(s/a) (a triangle).
 */
export function trapezoidTimeS(length: number, speed: number, accel: number): number {
  if (!(length > 0)) return 0;
  if (length >= (speed * speed) / accel) return length / speed + speed / accel;
  return 2 * Math.sqrt(length / accel);
}

/** `total` mm of path cut into `moves` equal straight moves. */
function pathTimeS(total: number, moves: number, speed: number, accel: number): number {
  if (!(total > 0)) return 0;
  const n = Math.max(1, Math.round(moves));
  return n * trapezoidTimeS(total / n, speed, accel);
}

/** The quick estimate's layers: a prism of the mean cross-section, with solid skins at its top and bottom. */
export function prismProfile(
  geometry: PartGeometry,
  settings: Pick<PrintSettings, 'layerMm' | 'walls' | 'topBottomLayers'> & { lineWidthMm: number },
): SliceProfile {
  const height = geometry.sizeMm[2];
  if (!(height > 0) || !(geometry.volumeMm3 > 0)) return { layers: [], layerMm: settings.layerMm, heightMm: 0, openLoops: 0 };
  const n = layerCount(height, settings.layerMm);
  const area = geometry.volumeMm3 / height;
  const perimeter = Math.max(0, (geometry.areaMm2 - 2 * area) / height);
  const d = settings.walls * settings.lineWidthMm;
  // Inset of a rectangle-like outline by d: A − P·d + 4d² (four right-angled corners); never negative.
  const core = Math.max(0, area - perimeter * d + 4 * d * d);
  const corePerimeter = core > 0 ? Math.max(0, perimeter - 8 * d) : 0;
  const k = Math.floor(settings.topBottomLayers);
  const layers: LayerFigures[] = [];
  for (let i = 0; i < n; i++) {
    const skin = i < k || i >= n - k ? core : 0;
    layers.push({
      area,
      perimeter,
      wallArea: area - core,
      skinArea: skin,
      sparseArea: core - skin,
      islands: 1,
      corners: 4,
      chord: corePerimeter > 0 ? (Math.PI * core) / corePerimeter : perimeter > 0 ? (Math.PI * area) / perimeter : 0,
    });
  }
  return { layers, layerMm: height / n, heightMm: height, openLoops: 0 };
}

function validateSettings(settings: PrintSettings): void {
  requirePositive('Nozzle diameter', settings.nozzleMm);
  requirePositive('Layer height', settings.layerMm);
  requireAtLeast('Walls', settings.walls, 0);
  requireAtLeast('Top and bottom layers', settings.topBottomLayers, 0);
  if (!(settings.infillPct >= 0 && settings.infillPct <= 100)) throw new RangeError('Infill must be between 0 and 100 %.');
  if (settings.speedMmS !== undefined) requirePositive('Speed', settings.speedMmS);
  if (settings.accelerationMmS2 !== undefined) requirePositive('Acceleration', settings.accelerationMmS2);
  if (settings.travelSpeedMmS !== undefined) requirePositive('Travel speed', settings.travelSpeedMmS);
  if (settings.lineWidthMm !== undefined) requirePositive('Line width', settings.lineWidthMm);
  if (settings.pricePerKg !== undefined) requireAtLeast('Price per kg', settings.pricePerKg, 0);
}

export function lineWidthFor(settings: Pick<PrintSettings, 'lineWidthMm' | 'nozzleMm'>): number {
  return settings.lineWidthMm ?? settings.nozzleMm * LINE_WIDTH_PER_NOZZLE;
}

/** The quick estimate, for a request that sends only the part's figures. */
export function estimatePrint(geometry: PartGeometry, settings: PrintSettings): PrintEstimate {
  validate(geometry, settings);
  const lineWidth = lineWidthFor(settings);
  const profile = prismProfile(geometry, { ...settings, lineWidthMm: lineWidth });
  return fromProfile(profile, settings, 'figures', geometry.volumeMm3, [
    `Quick estimate from the figures alone: the part taken as a prism of its mean cross-section (${round(geometry.volumeMm3 / Math.max(geometry.sizeMm[2], 1e-9), 0)} mm², volume ÷ height), its outline the side area ÷ height with four right-angled corners, solid skins only at its very top and bottom; the total is capped at the solid volume.`,
  ]);
}

/** The estimate from real slices of the mesh (sliceProfile in shared/slice.ts, at this recipe's layer height, walls and skins). */
export function estimateFromSlices(profile: SliceProfile, settings: PrintSettings): PrintEstimate {
  validateSettings(settings);
  const notes = [
    `Sliced from the mesh: ${profile.layers.length} layers of ${round(profile.layerMm, 3)} mm (height ÷ layers), each cut at its middle; outlines simplified to within 20 µm before measuring.`,
  ];
  if (profile.openLoops > 0) notes.push(`${profile.openLoops} outline loops did not close (holes in the mesh) and were closed straight across.`);
  return fromProfile(profile, settings, 'slices', Infinity, notes);
}

function fromProfile(profile: SliceProfile, settings: PrintSettings, method: PrintEstimate['method'], cap: number, notes: string[]): PrintEstimate {
  const material = materialInfo(settings.material);
  const lineWidth = lineWidthFor(settings);
  const speed = settings.speedMmS ?? DEFAULT_SPEED_MM_S;
  const accel = settings.accelerationMmS2 ?? DEFAULT_ACCELERATION_MM_S2;
  const travel = settings.travelSpeedMmS ?? DEFAULT_TRAVEL_SPEED_MM_S;
  const pricePerKg = settings.pricePerKg ?? DEFAULT_PRICE_PER_KG[material.id];
  const share = settings.infillPct / 100;
  const t = profile.layerMm;

  let walls = 0,
    skins = 0,
    infill = 0,
    seconds = 0;
  for (const layer of profile.layers) {
    walls += layer.wallArea * t;
    skins += layer.skinArea * t;
    infill += layer.sparseArea * share * t;
    const chord = Math.max(lineWidth, layer.chord);
    const loops = Math.max(1, layer.islands) * Math.max(1, Math.floor(settings.walls));
    const wallPath = layer.wallArea / lineWidth;
    seconds += pathTimeS(wallPath, Math.max(loops, layer.corners * Math.max(1, Math.floor(settings.walls))), speed, accel);
    // Skin and infill lines, each joined to the next by a short move one line spacing long.
    const skinPath = layer.skinArea / lineWidth;
    const skinLines = skinPath / chord;
    seconds += pathTimeS(skinPath, skinLines, speed, accel) + Math.round(skinLines) * trapezoidTimeS(lineWidth, speed, accel);
    const infillPath = (layer.sparseArea * share) / lineWidth;
    const infillLines = infillPath / chord;
    if (share > 0) seconds += pathTimeS(infillPath, infillLines, speed, accel) + Math.round(infillLines) * trapezoidTimeS(lineWidth / share, speed, accel);
    // Travel: to each island, and from its walls to its fill, about half a chord each.
    seconds += 2 * Math.max(1, layer.islands) * trapezoidTimeS(chord / 2, travel, accel);
    seconds += LAYER_CHANGE_S;
  }
  let volumeMm3 = walls + skins + infill;
  if (volumeMm3 > cap) {
    const scale = cap / volumeMm3;
    walls *= scale;
    skins *= scale;
    infill *= scale;
    volumeMm3 = cap;
  }
  const massG = (volumeMm3 / 1000) * material.densityGcm3;
  const timeMin = seconds / 60;
  const d = round(settings.walls * lineWidth, 3);
  const assumptions = [
    settings.lineWidthMm === undefined
      ? `Line width ${round(lineWidth, 3)} mm: the ${settings.nozzleMm} mm nozzle × ${LINE_WIDTH_PER_NOZZLE} (common practice).`
      : `Line width ${lineWidth} mm, as given.`,
    ...notes,
    `Walls: ${settings.walls} × ${round(lineWidth, 3)} mm along each layer's outline, the band between the outline and its inset by ${d} mm (${round(walls, 0)} mm³).`,
    `Top and bottom: ${settings.topBottomLayers} solid layers wherever a layer is not covered by the ${settings.topBottomLayers} above and below it (${round(skins, 0)} mm³).`,
    `Infill: ${settings.infillPct} % of the rest inside the walls (${round(infill, 0)} mm³).`,
    `${material.id} density ${material.densityGcm3} g/cm³.`,
    `Time: moves at ${speed} mm/s with ${accel} mm/s² acceleration, each starting and stopping at rest (trapezoidal profile; short moves never reach full speed); walls break at corners sharper than 45°, skin and infill lines are as long as the region's mean chord (π × area ÷ outline), each joined to the next by a move one line spacing long; travel at ${travel} mm/s, half a chord to each island and again to its fill; ${LAYER_CHANGE_S} s per layer change; no cooling pauses.`,
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
    partsMm3: { walls, skins, infill },
    massG,
    lengthM: {
      '1.75': filamentLengthM(massG, 1.75, material.densityGcm3),
      '2.85': filamentLengthM(massG, 2.85, material.densityGcm3),
    },
    timeMin,
    cost,
    method,
    assumptions,
  };
}

/** Whole numbers from sums of decimals: 16.000000000001 h at 8 h a day is still 2 days, 1000.0000000001 g one spool (our choice). */
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
  /** When the recipe says how to lay the part: its words, and whether this placement keeps to them. */
  recipe?: { words: string; followed: boolean };
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

function diagonalFit(part: Size3, bed: Size3, verticals: readonly (0 | 1 | 2)[] = [2, 0, 1]): BedFitResult | null {
  const [bedX, bedY, bedZ] = bed;
  const [a, b] = bedX >= bedY ? [bedX, bedY] : [bedY, bedX];
  for (const vertical of verticals) {
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
  /** The recipe's orientation note ("Flat face on the bed"): tried first when it says how to lay the part. */
  orientationNote?: string | null;
}

/** How a recipe can say a part lies: on its largest face, on its long edge, or standing on its end. */
export type StatedPose = 'flat' | 'edge' | 'upright';

// Words crews write in a recipe's orientation note (our own list). The earliest match wins, so
// "Flat side down, rod bore upright" reads as flat: later words describe a feature, not the part.
const POSE_WORDS: readonly { pose: StatedPose; pattern: RegExp }[] = [
  { pose: 'flat', pattern: /\b(flat|lying|lie it down|laid down|lay it down|largest face|biggest face|widest face)\b/ },
  { pose: 'edge', pattern: /\bon (?:its |the |a )?(?:long |longer |short |narrow )?(?:edge|side)\b/ },
  { pose: 'upright', pattern: /\b(upright|standing|stand it|stood|on (?:its |the )?end|vertical(?:ly)?|tall way)\b/ },
];

/** The pose a recipe's orientation note asks for, or null when it says none we can read. */
export function statedPose(note: string | null | undefined): StatedPose | null {
  if (!note) return null;
  const text = note.toLowerCase();
  let best: { pose: StatedPose; at: number } | null = null;
  for (const { pose, pattern } of POSE_WORDS) {
    const at = text.search(pattern);
    if (at >= 0 && (!best || at < best.at)) best = { pose, at };
  }
  return best?.pose ?? null;
}

/** Which modelled axis stands up in a pose: the shortest side for flat, the middle for edge, the longest upright. */
function verticalAxisFor(pose: StatedPose, part: Size3): 0 | 1 | 2 {
  // ties keep the modelled z up where it is one of the candidates
  const axes = ([2, 0, 1] as const).slice().sort((i, j) => part[i] - part[j]);
  return pose === 'flat' ? axes[0] : pose === 'edge' ? axes[1] : axes[2];
}

export function fitOnBed(partSizeMm: Size3, fullBedMm: Size3, options: BedFitOptions = {}): BedFitResult {
  const marginMm = options.marginMm ?? DEFAULT_BED_MARGIN_MM;
  [...partSizeMm, ...fullBedMm, marginMm].forEach((side) => requireAtLeast('Each size', side, 0));
  const bedMm: Size3 = [Math.max(0, fullBedMm[0] - 2 * marginMm), Math.max(0, fullBedMm[1] - 2 * marginMm), fullBedMm[2]];
  const bedText =
    marginMm > 0 ? `${formatMm(fullBedMm)} bed (keeping ${round(marginMm, 1)} mm round the edge for a brim or skirt)` : `${formatMm(fullBedMm)} bed`;
  const pose = statedPose(options.orientationNote);
  if (pose) return fitAsStated(partSizeMm, bedMm, bedText, pose, options.orientationNote!.trim());
  return fitAnyWay(partSizeMm, bedMm, bedText);
}

/** The recipe's way first; another way only when that does not fit, saying that it differs. */
function fitAsStated(part: Size3, bedMm: Size3, bedText: string, pose: StatedPose, note: string): BedFitResult {
  const words = note.length > 80 ? `${note.slice(0, 77)}…` : note;
  const up = verticalAxisFor(pose, part);
  const [i, j] = ([0, 1, 2] as const).filter((axis) => axis !== up);
  for (const placed of [
    [part[i], part[j], part[up]],
    [part[j], part[i], part[up]],
  ] as [number, number, number][]) {
    if (!fitsAligned(placed, bedMm)) continue;
    const asModelled = placed.every((side, axis) => side === part[axis]);
    return {
      fits: asModelled ? 'as-is' : 'rotated',
      orientation: placed,
      message: `Fits the ${bedText} laid as the recipe says (“${words}”): ${formatMm(placed)} (x × y × z).`,
      recipe: { words, followed: true },
    };
  }
  const diagonal = diagonalFit(part, bedMm, [up]);
  if (diagonal) {
    return {
      ...diagonal,
      message: `Laid as the recipe says (“${words}”), it ${diagonal.message.charAt(0).toLowerCase()}${diagonal.message.slice(1)}`,
      recipe: { words, followed: true },
    };
  }
  const other = fitAnyWay(part, bedMm, bedText);
  const needs = `Laid as the recipe says (“${words}”), it needs ${formatMm([part[i], part[j]])} of bed and ${round(part[up], 1)} mm of height`;
  if (other.fits === 'no')
    return { ...other, message: `${needs}; ${other.message.charAt(0).toLowerCase()}${other.message.slice(1)}`, recipe: { words, followed: false } };
  const how =
    other.fits === 'as-is'
      ? `as modelled, ${formatMm(part)} (x × y × z)`
      : other.fits === 'rotated'
        ? `turned to ${formatMm(other.orientation!)} (x × y × z)`
        : other.message.replace(/^Fits only diagonally: /, 'diagonally: ').replace(/\.$/, '');
  return {
    ...other,
    message: `${needs}, more than this bed has. Here it must lie another way than the recipe says: ${how}. Check that the layer lines still suit the load before printing it so.`,
    recipe: { words, followed: false },
  };
}

function fitAnyWay(partSizeMm: Size3, bedMm: Size3, bedText: string): BedFitResult {
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
