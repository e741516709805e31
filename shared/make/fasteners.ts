// Clearance holes and the few fastener sizes the generators draw around.
// Sources are named beside each table; docs/sources.md lists them too.
import { inchesToMm } from '../units';

export const SCREWS = ['1/4-20', '3/8-16', 'M3', 'M4', 'M5', 'M6'] as const;
export type Screw = (typeof SCREWS)[number];
export const CLEARANCES = ['close', 'normal', 'loose'] as const;
export type Clearance = (typeof CLEARANCES)[number];

export const SCREW_LABELS: Record<Screw, string> = {
  '1/4-20': '1/4-20 UNC',
  '3/8-16': '3/8-16 UNC',
  M3: 'M3',
  M4: 'M4',
  M5: 'M5',
  M6: 'M6',
};

/**
 * Clearance hole diameters in mm.
 * Inch screws: ASME B18.2.8 via Machinery's Handbook 31st ed., Table 1a: normal fit 1/4 → 0.281 in,
 * 3/8 → 0.406 in (checked); close 0.266 / 0.391 in and loose 0.297 / 0.422 in (secondary charts).
 * Metric screws: ISO 273 fine / medium / coarse (secondary charts), which we call close / normal / loose.
 */
export const CLEARANCE_HOLE_MM: Record<Screw, Record<Clearance, number>> = {
  '1/4-20': { close: inchesToMm(0.266), normal: inchesToMm(0.281), loose: inchesToMm(0.297) },
  '3/8-16': { close: inchesToMm(0.391), normal: inchesToMm(0.406), loose: inchesToMm(0.422) },
  M3: { close: 3.2, normal: 3.4, loose: 3.6 },
  M4: { close: 4.3, normal: 4.5, loose: 4.8 },
  M5: { close: 5.3, normal: 5.5, loose: 5.8 },
  M6: { close: 6.4, normal: 6.6, loose: 7.0 },
};

export const CLEARANCE_STANDARD: Record<Screw, string> = {
  '1/4-20': 'ASME B18.2.8',
  '3/8-16': 'ASME B18.2.8',
  M3: 'ISO 273',
  M4: 'ISO 273',
  M5: 'ISO 273',
  M6: 'ISO 273',
};

/** ISO 273 names its classes fine / medium / coarse. */
export function clearanceName(screw: Screw, clearance: Clearance): string {
  if (CLEARANCE_STANDARD[screw] === 'ISO 273') return { close: 'fine', normal: 'medium', loose: 'coarse' }[clearance];
  return `${clearance} fit`;
}

/**
 * Across-flats of the matching hex nut in mm: ISO 4032 M3 5.5, M4 7, M5 8, M6 10; ASME B18.2.2
 * 1/4 → 7/16 in, 3/8 → 9/16 in (from memory; the pocket adds its own clearance).
 */
export const NUT_ACROSS_FLATS_MM: Record<Screw, number> = {
  '1/4-20': inchesToMm(7 / 16),
  '3/8-16': inchesToMm(9 / 16),
  M3: 5.5,
  M4: 7,
  M5: 8,
  M6: 10,
};

/** Head diameter of a socket head cap screw (ISO 4762; ASME B18.3, 1/4 → 0.375 in, 3/8 → 0.5625 in), from memory. */
export const HEAD_DIAMETER_MM: Record<Screw, number> = {
  '1/4-20': inchesToMm(0.375),
  '3/8-16': inchesToMm(0.5625),
  M3: 5.5,
  M4: 7,
  M5: 8.5,
  M6: 10,
};
