import { z } from 'zod';
import { parseLength } from '../units';

function mmText(mm: number): string {
  return `${Number(mm.toFixed(3))} mm`;
}

/**
 * A length in millimetres. Accepts a number (mm) or text with a unit ("82 mm", "3/8 in", "1.5in")
 * read by shared/units.ts, so a form may pass what the member typed.
 */
export function lengthMm(label: string, min: number, max: number) {
  return z.preprocess(
    (value) => {
      if (typeof value !== 'string') return value;
      if (value.trim() === '') return undefined;
      return parseLength(value) ?? Number.NaN;
    },
    z
      .number({ error: `${label}: enter a length such as 12, 12 mm or 1/2 in.` })
      .refine(Number.isFinite, { message: `${label}: enter a length such as 12, 12 mm or 1/2 in.` })
      .min(min, { message: `${label} must be at least ${mmText(min)}.` })
      .max(max, { message: `${label} can be at most ${mmText(max)}.` }),
  );
}

export function countOf(label: string, min: number, max: number) {
  return z
    .number({ error: `${label}: enter a whole number.` })
    .int({ message: `${label}: enter a whole number.` })
    .min(min, { message: `${label} must be at least ${min}.` })
    .max(max, { message: `${label} can be at most ${max}.` });
}

export function choiceOf<const T extends readonly [string, ...string[]]>(label: string, values: T) {
  return z.enum(values, { error: `${label}: choose one of ${values.join(', ')}.` });
}

export const RESOLUTIONS = ['default', 'fine'] as const;
export type Resolution = (typeof RESOLUTIONS)[number];
export const resolution = choiceOf('Resolution', RESOLUTIONS);

/** Largest gap between a true circle and its drawn polygon, and the fewest sides, per resolution (our choice). */
const CIRCLE_RULES: Record<Resolution, { chordErrorMm: number; minSides: number; maxSides: number }> = {
  default: { chordErrorMm: 0.02, minSides: 64, maxSides: 192 },
  fine: { chordErrorMm: 0.005, minSides: 128, maxSides: 512 },
};

/** Sides for a circle of this diameter: enough that the polygon strays at most the resolution's chord error, a multiple of 4. */
export function circleSides(diameterMm: number, res: Resolution): number {
  const rule = CIRCLE_RULES[res];
  const r = Math.max(diameterMm / 2, 0.1);
  const ratio = Math.min(rule.chordErrorMm / r, 1);
  const sides = Math.ceil(Math.PI / Math.acos(1 - ratio));
  const clamped = Math.min(rule.maxSides, Math.max(rule.minSides, sides));
  return Math.ceil(clamped / 4) * 4;
}

export function roundMm(mm: number): number {
  return Math.round(mm * 1000) / 1000;
}

export function formatMm(mm: number): string {
  return `${Number(mm.toFixed(2))} mm`;
}

/** A printer calibration as stored and sent: millimetres added to drawn holes and outer sizes. */
export const correctionsSchema = z.object({
  holeMm: z
    .number({ error: 'Hole correction: enter a number of millimetres.' })
    .min(-1, { message: 'Hole correction must be between -1 and 1 mm.' })
    .max(1, { message: 'Hole correction must be between -1 and 1 mm.' })
    .optional(),
  outerMm: z
    .number({ error: 'Outer-size correction: enter a number of millimetres.' })
    .min(-1, { message: 'Outer-size correction must be between -1 and 1 mm.' })
    .max(1, { message: 'Outer-size correction must be between -1 and 1 mm.' })
    .optional(),
});
