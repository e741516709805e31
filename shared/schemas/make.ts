// Making parts to size: what the make endpoints take besides the generator's own parameters
// (those are each generator's schema in shared/make), and a printer's calibration from the gauge.
import { z } from 'zod';
import { HEAT_EXPOSURES, MATERIAL_IDS } from '../materials';
import { recipeSchema } from './recipe';

const recipe = recipeSchema.shape;

/** A correction beyond this is a wrong step or a wrong gauge, not a printer (our own bound, as correctionsSchema in shared/make). */
export const MAX_CORRECTION_MM = 1;

const positiveId = (what: string) =>
  z
    .number({ error: `Give the ${what} as a number.` })
    .int(`Give the ${what} as a whole number.`)
    .positive(`Give the ${what} as a positive number.`);

/** How the made part would be printed, for the estimate; anything left out takes the default. */
export const makeRecipeSchema = z
  .object({
    nozzleMm: recipe.nozzleMm,
    layerMm: recipe.layerMm,
    walls: recipe.walls,
    topBottomLayers: recipe.topBottomLayers,
    infillPct: recipe.infillPct,
    speedMmS: recipe.speedMmS,
  })
  .partial();
export type MakeRecipe = z.infer<typeof makeRecipeSchema>;

export { MADE_PART_RECIPE } from '../form-limits';

export const makeRequestSchema = z.object({
  params: z.record(z.string(), z.unknown(), { error: 'Send the part’s sizes as "params", an object of fields.' }).default({}),
  /** One of the member's printers: its calibration for the material is applied, and its bed checked. */
  printerId: positiveId('printer id').nullable().optional(),
  material: z.enum(MATERIAL_IDS, { error: `Choose the material: ${MATERIAL_IDS.join(', ')}.` }).default('PETG'),
  exposure: z
    .enum(HEAT_EXPOSURES, { error: `Choose the heat it will see: ${HEAT_EXPOSURES.join(', ')}, or none.` })
    .nullable()
    .optional(),
  recipe: makeRecipeSchema.default({}),
});
export type MakeRequest = z.infer<typeof makeRequestSchema>;

export const MAKE_FORMATS = ['stl', '3mf'] as const;
export type MakeFormat = (typeof MAKE_FORMATS)[number];
export const makeFileQuerySchema = z.object({
  format: z.enum(MAKE_FORMATS, { error: 'Ask for format=stl or format=3mf.' }).default('3mf'),
});

export const makeKindParamsSchema = z.object({ kind: z.string().trim().min(1).max(40) });

/** A made part going into a kit: the generator's parameters, the material and printer as for a kit item. */
export const madeKitItemSchema = z.object({
  kind: z.string({ error: 'Say which maker the part comes from.' }).trim().min(1, 'Say which maker the part comes from.').max(40),
  params: z.record(z.string(), z.unknown(), { error: 'Send the part’s sizes as "params".' }),
  quantity: z
    .number({ error: 'Enter how many to print.' })
    .int('Enter a whole number of pieces.')
    .min(1, 'Print at least 1.')
    .max(100, 'Use at most 100 pieces per item; add another item for more.')
    .default(1),
  material: z.enum(MATERIAL_IDS, { error: `Choose the material: ${MATERIAL_IDS.join(', ')}.` }).default('PETG'),
  printerId: positiveId('printer id').nullable().optional(),
});
export type MadeKitItemInput = z.infer<typeof madeKitItemSchema>;

/**
 * What the member read off a printed fit-test gauge: the nominal size the gauge was made around
 * (the rod or pin they tried), the drawn size of the bore that fitted it, and optionally the drawn
 * size of the peg that fitted a true hole of that size.
 */
export const calibrationSchema = z
  .object({
    material: z.enum(MATERIAL_IDS, { error: `Choose the material the gauge was printed in: ${MATERIAL_IDS.join(', ')}.` }),
    nominalMm: z
      .number({ error: 'Enter the size of the rod or pin you tried, in mm.' })
      .min(1, 'The gauge’s size must be between 1 and 100 mm.')
      .max(100, 'The gauge’s size must be between 1 and 100 mm.'),
    holeFitMm: z.number({ error: 'Enter the size printed beside the bore that fitted, in mm.' }).positive('The bore that fitted must be more than 0 mm.'),
    outerFitMm: z
      .number({ error: 'Enter the size printed beside the peg that fitted, in mm.' })
      .positive('The peg that fitted must be more than 0 mm.')
      .nullable()
      .optional(),
  })
  .superRefine((c, ctx) => {
    const far = (fit: number) => Math.abs(fit - c.nominalMm) > MAX_CORRECTION_MM + 1e-9;
    if (far(c.holeFitMm)) {
      ctx.addIssue({
        code: 'custom',
        path: ['holeFitMm'],
        message: `A bore ${Math.abs(c.holeFitMm - c.nominalMm).toFixed(2)} mm away from ${c.nominalMm} mm is not a step of that gauge; check the step (within ±${MAX_CORRECTION_MM} mm).`,
      });
    }
    if (c.outerFitMm != null && far(c.outerFitMm)) {
      ctx.addIssue({
        code: 'custom',
        path: ['outerFitMm'],
        message: `A peg ${Math.abs(c.outerFitMm - c.nominalMm).toFixed(2)} mm away from ${c.nominalMm} mm is not a step of that gauge; check the step (within ±${MAX_CORRECTION_MM} mm).`,
      });
    }
  });
export type CalibrationInput = z.infer<typeof calibrationSchema>;
