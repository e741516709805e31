import { z } from 'zod';
import { INFILL_PATTERNS, MAX_LAYER_TO_NOZZLE, RECIPE_PURPOSES, SUPPORT_MODES } from '../form-limits';
import { MATERIAL_IDS } from '../materials';

export { INFILL_PATTERNS, MAX_LAYER_TO_NOZZLE, RECIPE_PURPOSES, SUPPORT_MODES };

function maxLayerFor(nozzleMm: number): number {
  // Rounded to the micrometre so 0.4 mm gives 0.32, not 0.32000000000000006.
  return Math.round(nozzleMm * MAX_LAYER_TO_NOZZLE * 1000) / 1000;
}

/** `unit` is written after the number, e.g. " mm" or " %". */
function numberIn(what: string, unit: string, min: number, max: number) {
  const range = `The ${what} must be between ${min} and ${max}${unit}.`;
  return z
    .number({ error: `Enter the ${what} as a number in${unit}.` })
    .min(min, range)
    .max(max, range);
}

function wholeNumberIn(what: string, min: number, max: number) {
  const range = `Use between ${min} and ${max} ${what}.`;
  return (
    z
      .number({ error: `Enter the number of ${what}.` })
      // A refine, not .int(): .int() aborts the parse, which would hide the layer/nozzle check.
      .refine(Number.isInteger, `Enter a whole number of ${what}.`)
      .min(min, range)
      .max(max, range)
  );
}

function choiceOf<const T extends readonly [string, ...string[]]>(what: string, values: T) {
  return z.enum(values, { error: `Choose the ${what}: ${values.join(', ')}.` });
}

function optionalText(what: string, max: number) {
  return z
    .string({ error: `The ${what} must be text.` })
    .trim()
    .max(max, `Keep the ${what} to ${max} characters or fewer.`)
    .optional();
}

/** True for an issue on the whole recipe or on one of the two fields the layer rule compares. */
function isWholeOrComparedField(path: readonly PropertyKey[] | undefined): boolean {
  const field = path?.[0];
  return field === undefined || field === 'nozzleMm' || field === 'layerMm';
}

const bedSide = z
  .number({ error: 'Enter each printer bed size in millimetres.' })
  .positive('Each printer bed size must be more than 0 mm.')
  .max(2000, 'Each printer bed size must be at most 2000 mm.');

export const recipeSchema = z
  .object(
    {
      purpose: choiceOf('purpose', RECIPE_PURPOSES),
      material: choiceOf('material', MATERIAL_IDS),
      nozzleMm: numberIn('nozzle diameter', ' mm', 0.1, 1.2),
      layerMm: numberIn('layer height', ' mm', 0.04, 1),
      walls: wholeNumberIn('walls', 1, 20),
      topBottomLayers: wholeNumberIn('top and bottom layers', 0, 50),
      infillPct: numberIn('infill', ' %', 0, 100),
      infillPattern: choiceOf('infill pattern', INFILL_PATTERNS),
      hotendC: numberIn('hotend temperature', ' °C', 150, 320),
      bedC: numberIn('bed temperature', ' °C', 0, 130),
      speedMmS: numberIn('print speed', ' mm/s', 5, 600),
      supports: choiceOf('supports', SUPPORT_MODES),
      orientationNote: optionalText('orientation note', 500),
      printerBedMm: z.tuple([bedSide, bedSide, bedSide], { error: 'Give the printer bed as three sizes: x, y and z in mm.' }).optional(),
      resultNotes: optionalText('result notes', 2000),
    },
    { error: 'Send the print recipe with all its settings.' },
  )
  .refine((recipe) => recipe.layerMm <= maxLayerFor(recipe.nozzleMm), {
    path: ['layerMm'],
    error: (issue) => {
      const recipe = issue.input as { nozzleMm: number; layerMm: number };
      return `A ${recipe.layerMm} mm layer is too thick for a ${recipe.nozzleMm} mm nozzle; use at most ${maxLayerFor(recipe.nozzleMm)} mm (80 % of the nozzle).`;
    },
    // Run even when other fields failed, as long as the two numbers it compares are valid.
    when: (payload) => payload.issues.every((issue) => !isWholeOrComparedField(issue.path)),
  });

export type RecipeInput = z.infer<typeof recipeSchema>;
