// Over 350 lines: a quarter of it is the rules stated in comments; the per-item figures, totals and
// buy-or-print comparison share one pass over the items.
// The arithmetic of a shoot kit: what every item costs in filament, time and money, whether it fits
// its printer and survives the shoot's heat, the totals per material and per printer, and whether
// printing beats buying. Pure: the server loads the figures, this adds them up.
//
// Rules (each also stated in the summary's `assumptions`):
// - an item's figures are the estimate for one piece, times the quantity: from the model's layer
//   slices when the caller has them (estimateFromSlices), else the quick estimate (estimatePrint);
// - filament cost uses the price per kg given for the material; electricity is added for items on a
//   printer with known watts when a price per kWh is known (kWh = W × h ÷ 1000);
// - spools are whole 1 kg spools per material (spoolsNeeded);
// - printers run side by side, so the kit takes as many days as its busiest printer; items with no
//   printer chosen count as one more printer;
// - buy or print compares only items that have the price in question; the payback compares print
//   cost with the cheaper of buying and a print service, item by item.
import type { SafetyFlags } from './catalogue';
import {
  estimateFromSlices,
  estimatePrint,
  fitOnBed,
  spoolsNeeded,
  ceilWhole,
  type BedFitResult,
  type FilamentDiameter,
  type PartGeometry,
  type PrintSettings,
  type Size3,
} from './estimate';
import { heatCheck, heatExposureInfo, MATERIAL_IDS, type HeatCheck, type HeatExposure, type MaterialId } from './materials';
import { safetyCautions, type Caution } from './safety';
import type { SliceProfile } from './slice';

/** Common practice: a printer tended through one working day. */
export const DEFAULT_PRINT_HOURS_PER_DAY = 8;
/** The usual spool of filament (common practice). */
export const SPOOL_G = 1000;

/** Days of printing for `hours` at `hoursPerDay`, rounded up to whole days. */
export function printingDays(hours: number, hoursPerDay: number): number {
  if (!Number.isFinite(hours) || hours < 0) throw new RangeError('Hours must be a number ≥ 0.');
  if (!Number.isFinite(hoursPerDay) || hoursPerDay <= 0) throw new RangeError('Hours per day must be a number > 0.');
  return ceilWhole(hours / hoursPerDay);
}

/**
 * How many kits like this one it takes for a printer to pay for itself: the printer price over
 * what printing saves per kit, rounded up. Null when printing saves nothing.
 */
export function kitsToPayBack(printerPrice: number, savingsPerKit: number): number | null {
  if (!Number.isFinite(printerPrice) || printerPrice < 0) throw new RangeError('The printer price must be a number ≥ 0.');
  if (!(savingsPerKit > 0)) return null;
  return ceilWhole(printerPrice / savingsPerKit);
}

export interface KitPrinterRef {
  id: number;
  name: string;
  bedMm: Size3;
  /** Free round the bed's edge for a brim or skirt, per side; the default when omitted. */
  bedMarginMm?: number;
  nozzleMm: number;
  watts: number | null;
}

export type KitPrintSettings = Pick<PrintSettings, 'material' | 'nozzleMm' | 'layerMm' | 'walls' | 'topBottomLayers' | 'infillPct' | 'speedMmS'>;

export interface KitPlanItem {
  id: number;
  title: string;
  quantity: number;
  /** The model's figures; null when the part has no analysed model file. */
  geometry: PartGeometry | null;
  /** The model sliced at this item's layer height, walls and skins, when the caller could slice it. */
  slices?: SliceProfile | null;
  settings: KitPrintSettings;
  /** The recipe's orientation note: the bed-fit check lays the part that way first. */
  orientationNote?: string | null;
  printer: KitPrinterRef | null;
  safety: SafetyFlags;
  testedLoadKg: number | null;
  /** Outcome warnings from set reports on this part. */
  evidenceWarnings: readonly { material: string; text: string }[];
  /** Per piece. */
  boughtPriceEach: number | null;
  /** Per piece. */
  servicePriceEach: number | null;
  /** Once for the item's pieces; counted only with a print-service price. */
  serviceShipping: number | null;
  /** Remarks the caller already knows (an older revision, several model files, …). */
  notes?: readonly string[];
}

export interface KitPlan {
  heatExposure: HeatExposure | null;
  printHoursPerDay: number;
  printerPrice: number | null;
  pricesPerKg: Record<MaterialId, number>;
  pricePerKwh: number | null;
  items: readonly KitPlanItem[];
}

export interface PieceFigures {
  massG: number;
  lengthM: Record<FilamentDiameter, number>;
  timeMin: number;
  filamentCost: number;
}

export interface ItemTotals extends PieceFigures {
  hours: number;
  /** Null when the printer's watts or the price per kWh is unknown. */
  energyKwh: number | null;
  energyCost: number | null;
  /** Filament plus electricity where known. */
  printCost: number;
}

export interface KitItemSummary {
  id: number;
  title: string;
  quantity: number;
  material: MaterialId;
  printer: { id: number; name: string } | null;
  /** One piece; null when there is nothing to estimate from. */
  each: PieceFigures | null;
  /** All pieces of the item. */
  total: ItemTotals | null;
  /** Null when no printer is chosen or the size is unknown. */
  fit: BedFitResult | null;
  /** Null when the kit names no heat exposure. */
  heat: HeatCheck | null;
  cautions: Caution[];
  evidenceWarnings: { material: string; text: string; matchesMaterial: boolean }[];
  bought: { each: number; total: number } | null;
  printService: { each: number; shipping: number; total: number } | null;
  notes: string[];
}

export interface MaterialTotal {
  material: MaterialId;
  pieces: number;
  grams: number;
  lengthM: Record<FilamentDiameter, number>;
  hours: number;
  spools: number;
  filamentCost: number;
}

export interface PrinterTotal {
  /** Null for the items with no printer chosen. */
  printer: { id: number; name: string } | null;
  pieces: number;
  hours: number;
  days: number;
}

export interface PriceComparison {
  /** Items that have this price (and an estimate). */
  items: number;
  /** What those items cost bought, from a print service, or the cheaper of the two. */
  total: number;
  /** What printing the same items costs. */
  printCost: number;
  /** total − printCost; negative when printing costs more. */
  savings: number;
}

export interface KitSummary {
  items: KitItemSummary[];
  totals: {
    pieces: number;
    grams: number;
    lengthM: Record<FilamentDiameter, number>;
    hours: number;
    filamentCost: number;
    energyCost: number;
    printCost: number;
    /** Which estimated items include electricity. */
    energyIncluded: 'all' | 'some' | 'none';
    byMaterial: MaterialTotal[];
    byPrinter: PrinterTotal[];
    /** Days of the busiest printer at the kit's hours a day. */
    daysOfPrinting: number;
    /** Items with no estimate, left out of every total. */
    unestimated: number[];
  };
  buyOrPrint: {
    buying: PriceComparison | null;
    printService: PriceComparison | null;
    /** Per item the cheaper of buying and the print service. */
    cheapest: PriceComparison | null;
    /** Null when the kit has no printer price. */
    payback: { printerPrice: number; savingsPerKit: number | null; kits: number | null; message: string } | null;
  };
  assumptions: string[];
}

const zeroLengths = (): Record<FilamentDiameter, number> => ({ '1.75': 0, '2.85': 0 });

function times(figures: PieceFigures, quantity: number): PieceFigures {
  return {
    massG: figures.massG * quantity,
    lengthM: { '1.75': figures.lengthM['1.75'] * quantity, '2.85': figures.lengthM['2.85'] * quantity },
    timeMin: figures.timeMin * quantity,
    filamentCost: figures.filamentCost * quantity,
  };
}

function money(value: number): string {
  return value.toFixed(2);
}

function summariseItem(item: KitPlanItem, plan: KitPlan): KitItemSummary {
  const material = item.settings.material;
  const notes = [...(item.notes ?? [])];
  let each: PieceFigures | null = null;
  let total: ItemTotals | null = null;
  if (item.geometry) {
    const settings = { ...item.settings, pricePerKg: plan.pricesPerKg[material] };
    const estimate = item.slices ? estimateFromSlices(item.slices, settings) : estimatePrint(item.geometry, settings);
    each = { massG: estimate.massG, lengthM: estimate.lengthM, timeMin: estimate.timeMin, filamentCost: estimate.cost };
    const all = times(each, item.quantity);
    const hours = all.timeMin / 60;
    const watts = item.printer?.watts ?? null;
    const energyKwh = watts !== null && plan.pricePerKwh !== null ? (watts * hours) / 1000 : null;
    const energyCost = energyKwh !== null ? energyKwh * plan.pricePerKwh! : null;
    total = { ...all, hours, energyKwh, energyCost, printCost: all.filamentCost + (energyCost ?? 0) };
  } else {
    notes.push('No analysed model file: this item is left out of the totals.');
  }
  if (item.printer && Math.abs(item.printer.nozzleMm - item.settings.nozzleMm) > 1e-6) {
    notes.push(
      `The recipe is for a ${item.settings.nozzleMm} mm nozzle; ${item.printer.name} has ${item.printer.nozzleMm} mm. Change one or expect other figures.`,
    );
  }
  const bought = item.boughtPriceEach !== null ? { each: item.boughtPriceEach, total: item.boughtPriceEach * item.quantity } : null;
  const printService =
    item.servicePriceEach !== null
      ? {
          each: item.servicePriceEach,
          shipping: item.serviceShipping ?? 0,
          total: item.servicePriceEach * item.quantity + (item.serviceShipping ?? 0),
        }
      : null;
  return {
    id: item.id,
    title: item.title,
    quantity: item.quantity,
    material,
    printer: item.printer ? { id: item.printer.id, name: item.printer.name } : null,
    each,
    total,
    fit:
      item.printer && item.geometry
        ? fitOnBed(item.geometry.sizeMm, item.printer.bedMm, { marginMm: item.printer.bedMarginMm, orientationNote: item.orientationNote })
        : null,
    heat: plan.heatExposure ? heatCheck(material, plan.heatExposure) : null,
    cautions: safetyCautions(item.safety, item.testedLoadKg),
    evidenceWarnings: item.evidenceWarnings.map((w) => ({ material: w.material, text: w.text, matchesMaterial: w.material === material })),
    bought,
    printService,
    notes,
  };
}

function compare(items: KitItemSummary[], price: (i: KitItemSummary) => number | null): PriceComparison | null {
  const compared = items.filter((i) => i.total !== null && price(i) !== null);
  if (!compared.length) return null;
  const total = compared.reduce((sum, i) => sum + price(i)!, 0);
  const printCost = compared.reduce((sum, i) => sum + i.total!.printCost, 0);
  return { items: compared.length, total, printCost, savings: total - printCost };
}

function cheaperOf(a: number | null, b: number | null): number | null {
  if (a === null) return b;
  if (b === null) return a;
  return Math.min(a, b);
}

function paybackOf(printerPrice: number | null, cheapest: PriceComparison | null): KitSummary['buyOrPrint']['payback'] {
  if (printerPrice === null) return null;
  if (!cheapest) {
    return { printerPrice, savingsPerKit: null, kits: null, message: 'Add bought or print-service prices to the items to see when a printer pays for itself.' };
  }
  const kits = kitsToPayBack(printerPrice, cheapest.savings);
  return {
    printerPrice,
    savingsPerKit: cheapest.savings,
    kits,
    message:
      kits === null
        ? 'Printing these items saves nothing against buying them or a print service, so a printer never pays for itself on kits like this.'
        : `Printing saves ${money(cheapest.savings)} a kit, so a printer at ${money(printerPrice)} pays for itself after ${kits} ${kits === 1 ? 'kit' : 'kits'} like this.`,
  };
}

export function summariseKit(plan: KitPlan): KitSummary {
  const items = plan.items.map((item) => summariseItem(item, plan));
  const estimated = items.filter((i) => i.total !== null);

  const byMaterial: MaterialTotal[] = MATERIAL_IDS.flatMap((material) => {
    const of = estimated.filter((i) => i.material === material);
    if (!of.length) return [];
    const grams = of.reduce((sum, i) => sum + i.total!.massG, 0);
    return [
      {
        material,
        pieces: of.reduce((sum, i) => sum + i.quantity, 0),
        grams,
        lengthM: {
          '1.75': of.reduce((sum, i) => sum + i.total!.lengthM['1.75'], 0),
          '2.85': of.reduce((sum, i) => sum + i.total!.lengthM['2.85'], 0),
        },
        hours: of.reduce((sum, i) => sum + i.total!.hours, 0),
        spools: spoolsNeeded(grams, SPOOL_G),
        filamentCost: of.reduce((sum, i) => sum + i.total!.filamentCost, 0),
      },
    ];
  });

  const printerKeys = [...new Set(estimated.map((i) => i.printer?.id ?? null))];
  const byPrinter: PrinterTotal[] = printerKeys.map((key) => {
    const of = estimated.filter((i) => (i.printer?.id ?? null) === key);
    const hours = of.reduce((sum, i) => sum + i.total!.hours, 0);
    return { printer: of[0].printer, pieces: of.reduce((sum, i) => sum + i.quantity, 0), hours, days: printingDays(hours, plan.printHoursPerDay) };
  });
  // named printers first, in the order the kit lists them; "no printer" last
  byPrinter.sort((a, b) => (a.printer === null ? 1 : 0) - (b.printer === null ? 1 : 0));

  const withEnergy = estimated.filter((i) => i.total!.energyCost !== null).length;
  const lengthM = zeroLengths();
  for (const i of estimated) {
    lengthM['1.75'] += i.total!.lengthM['1.75'];
    lengthM['2.85'] += i.total!.lengthM['2.85'];
  }
  const filamentCost = estimated.reduce((sum, i) => sum + i.total!.filamentCost, 0);
  const energyCost = estimated.reduce((sum, i) => sum + (i.total!.energyCost ?? 0), 0);

  const buying = compare(items, (i) => i.bought?.total ?? null);
  const printService = compare(items, (i) => i.printService?.total ?? null);
  const cheapest = compare(items, (i) => cheaperOf(i.bought?.total ?? null, i.printService?.total ?? null));

  const assumptions = [
    'Each item is estimated for one piece from its model file and recipe, then multiplied by the quantity: from the model cut into layers at the recipe’s layer height, or, where it could not be sliced, from its volume, area and size alone (the quick estimate).',
    `Filament at the kit owner's price per kg for each material; spools of ${SPOOL_G / 1000} kg, rounded up per material.`,
    plan.pricePerKwh === null
      ? 'Electricity not included: the kit owner has no price per kWh.'
      : `Electricity at ${plan.pricePerKwh} per kWh for items on a printer with known watts.`,
    `Days of printing at ${plan.printHoursPerDay} h a day, printers side by side: the busiest printer sets the days (items without a printer count as one more printer).`,
    'Buy or print compares only items with that price; the payback uses, item by item, the cheaper of buying and a print service.',
  ];
  if (plan.heatExposure) {
    const exposure = heatExposureInfo(plan.heatExposure);
    assumptions.push(`Heat: ${exposure.label.toLowerCase()}, about ${Math.round(exposure.temperatureC)} °C.`);
  }

  return {
    items,
    totals: {
      pieces: estimated.reduce((sum, i) => sum + i.quantity, 0),
      grams: estimated.reduce((sum, i) => sum + i.total!.massG, 0),
      lengthM,
      hours: estimated.reduce((sum, i) => sum + i.total!.hours, 0),
      filamentCost,
      energyCost,
      printCost: filamentCost + energyCost,
      energyIncluded: withEnergy === 0 ? 'none' : withEnergy === estimated.length ? 'all' : 'some',
      byMaterial,
      byPrinter,
      daysOfPrinting: Math.max(0, ...byPrinter.map((p) => p.days)),
      unestimated: items.filter((i) => i.total === null).map((i) => i.id),
    },
    buyOrPrint: { buying, printService, cheapest, payback: paybackOf(plan.printerPrice, cheapest) },
    assumptions,
  };
}
