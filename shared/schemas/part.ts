import { z } from 'zod';
import { CATEGORY_SLUGS, MOUNT_SLUGS } from '../catalogue';
import { LICENCE_IDS } from '../licences';
import { recipeSchema } from './recipe';
import { boolish } from '../validation';
import { partVisibilitySchema } from './crews';

export const keyDimensionSchema = z.object({
  name: z
    .string({ error: 'Name the dimension, e.g. "rod bore".' })
    .trim()
    .min(2, 'Name the dimension, e.g. "rod bore".')
    .max(60, 'Keep the name under 60 characters.'),
  valueMm: z.coerce
    .number({ error: 'Give the value in millimetres.' })
    .positive('The value must be more than 0 mm.')
    .max(2000, 'That is more than 2 m; check the unit.'),
  tolMm: z.coerce
    .number({ error: 'Give the tolerance in millimetres.' })
    .min(0, 'A tolerance cannot be negative.')
    .max(50, 'A tolerance over 50 mm is not a key dimension.')
    .default(0),
});
export type KeyDimension = z.infer<typeof keyDimensionSchema>;

export const mountRefSchema = z
  .object({
    slug: z.enum(MOUNT_SLUGS, { error: 'Choose a mount standard from the list.' }),
    note: z.string().trim().max(200, 'Keep the note under 200 characters.').optional(),
  })
  .refine((m) => m.slug !== 'other' || (m.note && m.note.length >= 3), {
    message: 'Describe the mount in the note when you choose "Other".',
    path: ['note'],
  });
export type MountRef = z.infer<typeof mountRefSchema>;

export const safetySchema = z.object({
  carriesLoad: z.boolean().default(false),
  overhead: z.boolean().default(false),
  vehicle: z.boolean().default(false),
  heat: z.boolean().default(false),
});

export const madeWithSchema = z.object(
  {
    kind: z
      .string({ error: 'Say which maker the part was made with.' })
      .trim()
      .min(1, 'Say which maker the part was made with.')
      .max(40, 'That is not one of the makers.'),
    params: z.record(z.string(), z.unknown(), { error: 'Send the maker’s sizes as "params".' }),
  },
  { error: 'Send the maker as { kind, params }.' },
);

/** The editable properties of a part, without defaults: an update changes only what it names. */
const partFields = {
  title: z
    .string({ error: 'Give the part a title.' })
    .trim()
    .min(1, 'Give the part a title.')
    .min(3, 'Use at least 3 characters for the title.')
    .max(120, 'Keep the title under 120 characters.'),
  summary: z
    .string({ error: 'Say in a line what the part is for.' })
    .trim()
    .min(10, 'Say in a line what the part is for (at least 10 characters).')
    .max(280, 'Keep the summary under 280 characters.'),
  description: z.string().max(20_000, 'Keep the description under 20,000 characters.'),
  category: z.enum(CATEGORY_SLUGS, { error: 'Choose a category from the list.' }),
  bodies: z.array(z.string().trim().min(1)).max(30, 'List at most 30 camera bodies.'),
  mounts: z.array(mountRefSchema).max(12, 'List at most 12 mount standards.'),
  keyDimensions: z.array(keyDimensionSchema).max(20, 'List at most 20 key dimensions.'),
  safety: safetySchema,
  testedLoadKg: z.coerce.number().positive('A tested load must be more than 0 kg.').max(500, 'A tested load over 500 kg is not a printed part.').nullable(),
  licence: z.enum(LICENCE_IDS, { error: 'Choose one of the open licences in the list.' }),
  recipes: z.array(recipeSchema).min(1, 'Add at least one print recipe you have proven.').max(10, 'Add at most 10 recipes.'),
};

export const partSubmissionSchema = z.object({
  ...partFields,
  description: partFields.description.default(''),
  bodies: partFields.bodies.default([]),
  mounts: partFields.mounts.default([]),
  keyDimensions: partFields.keyDimensions.default([]),
  safety: safetySchema.default({ carriesLoad: false, overhead: false, vehicle: false, heat: false }),
  testedLoadKg: partFields.testedLoadKg.optional(),
  parentId: z.coerce.number().int().positive().nullable().optional(),
  /** The STL files in this upload were drawn in inches (3MF declares its own unit). */
  drawnInInches: boolish.default(false),
  /** Made to size on the make pages: the maker and its parameters (the server checks them against the maker). */
  make: madeWithSchema.nullable().optional(),
  /** Everyone on the shelf (the default), or one crew of the author's only. */
  visibility: partVisibilitySchema.optional(),
});
export type PartSubmission = z.infer<typeof partSubmissionSchema>;

export const partUpdateSchema = z
  .object({ ...partFields, visibility: partVisibilitySchema })
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one field to change.' });
export type PartUpdate = z.infer<typeof partUpdateSchema>;

export const fileUploadOptionsSchema = z.object({
  drawnInInches: boolish.default(false),
});

export const partFileParamsSchema = z.object({
  id: z.coerce.number().int().positive('The part id must be a positive number.'),
  fileId: z.coerce.number().int().positive('The file id must be a positive number.'),
});
