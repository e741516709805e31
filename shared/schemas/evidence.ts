import { z } from 'zod';
import { SET_CONDITION_KEYS } from '../evidence-terms';
import { MATERIAL_IDS } from '../materials';
import { SET_REPORT_OUTCOMES } from '../evidence-terms';

export const ratingSchema = z.object({
  stars: z.coerce
    .number({ error: 'Choose from 1 to 5 stars.' })
    .int('Choose a whole number of stars.')
    .min(1, 'Choose from 1 to 5 stars.')
    .max(5, 'Choose from 1 to 5 stars.'),
  comment: z.string().trim().max(2000, 'Keep the comment under 2,000 characters.').optional(),
});
export type RatingInput = z.infer<typeof ratingSchema>;

export const setReportSchema = z
  .object({
    production: z.string({ error: 'Name the production or job.' }).trim().min(2, 'Name the production or job.').max(120, 'Keep it under 120 characters.'),
    daysInUse: z.coerce
      .number({ error: 'Say how many days it was in use.' })
      .int('Use whole days.')
      .min(1, 'At least one day.')
      .max(3650, 'That is more than ten years.'),
    conditions: z
      .array(z.enum(SET_CONDITION_KEYS, { error: 'Pick conditions from the list.' }))
      .max(SET_CONDITION_KEYS.length)
      .default([]),
    recipeId: z.coerce.number().int().positive().nullable().optional(),
    material: z.enum(MATERIAL_IDS, { error: 'Choose the material it was printed in.' }).optional(),
    infillPct: z.coerce.number().min(0).max(100, 'Infill is at most 100 %.').optional(),
    walls: z.coerce.number().int().min(1).max(20).optional(),
    outcome: z.enum(SET_REPORT_OUTCOMES, { error: 'Say how it held up.' }),
    notes: z.string().trim().max(4000, 'Keep the notes under 4,000 characters.').optional(),
  })
  .refine((r) => r.recipeId || r.material, {
    message: 'Pick the recipe you printed it with, or give your own material.',
    path: ['material'],
  });
export type SetReportInput = z.infer<typeof setReportSchema>;

export const reportFilterSchema = z.object({
  material: z.enum(MATERIAL_IDS).optional(),
  condition: z.enum(SET_CONDITION_KEYS).optional(),
  outcome: z.enum(SET_REPORT_OUTCOMES).optional(),
});

export const flagSchema = z.object({
  reason: z.string({ error: 'Say what is wrong with it.' }).trim().min(3, 'Say what is wrong with it.').max(1000, 'Keep it under 1,000 characters.'),
});
