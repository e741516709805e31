// Wanted parts: a crew member asks for a part nobody has put on the shelf yet; others answer with one.
import { z } from 'zod';
import { buildBodySchema, buildMountsSchema, buildSizeSchema } from './builds';

export const WANTED_STATUSES = ['open', 'closed'] as const;
export type WantedStatus = (typeof WANTED_STATUSES)[number];
/** solved: an answer did it; withdrawn: no longer needed; spam: closed by a moderator as abuse. */
export const WANTED_CLOSE_REASONS = ['solved', 'withdrawn', 'spam'] as const;
export type WantedCloseReason = (typeof WANTED_CLOSE_REASONS)[number];
export { MAX_WANTED_PHOTOS } from '../form-limits';

const isoDay = /^\d{4}-\d{2}-\d{2}$/;

export const wantedSchema = z.object({
  title: z
    .string({ error: 'Say in a line what part you need.' })
    .trim()
    .min(5, 'Say in a line what part you need (at least 5 characters).')
    .max(120, 'Keep the line under 120 characters; put the rest in the details.'),
  details: z.string({ error: 'Write the details as text.' }).trim().max(4000, 'Keep the details under 4,000 characters.').default(''),
  body: buildBodySchema.optional().transform((v) => v ?? null),
  mounts: buildMountsSchema.default([]),
  keySizes: z.array(buildSizeSchema).max(10, 'List at most 10 key dimensions.').default([]),
  neededBy: z
    .string({ error: 'Give the date as YYYY-MM-DD.' })
    .trim()
    .nullable()
    .optional()
    .transform((v, ctx) => {
      if (!v) return null;
      if (!isoDay.test(v) || Number.isNaN(Date.parse(`${v}T00:00:00Z`)) || new Date(`${v}T00:00:00Z`).toISOString().slice(0, 10) !== v) {
        ctx.addIssue({ code: 'custom', message: 'Give the date as YYYY-MM-DD, e.g. 2026-05-04.' });
        return z.NEVER;
      }
      return v;
    }),
  /** Search text that found nothing, kept so answerers see what was tried. */
  searchedFor: z
    .string()
    .trim()
    .max(200, 'Keep the search text under 200 characters.')
    .nullable()
    .optional()
    .transform((v) => v || null),
});
export type WantedInput = z.input<typeof wantedSchema>;
export type WantedData = z.output<typeof wantedSchema>;

export const wantedListSchema = z.strictObject(
  {
    status: z.enum(['open', 'closed', 'mine'], { error: 'Show status=open, closed or mine.' }).default('open'),
    limit: z.coerce
      .number({ error: 'Give the limit as a whole number from 1 to 100.' })
      .int()
      .min(1, 'Give the limit as a whole number from 1 to 100.')
      .max(100, 'Give the limit as a whole number from 1 to 100.')
      .default(50),
  },
  { error: (issue) => (issue.code === 'unrecognized_keys' ? 'The wanted board takes status and limit only.' : undefined) },
);
export type WantedListQuery = z.output<typeof wantedListSchema>;

export const wantedAnswerSchema = z.object({
  part: z
    .union([z.string(), z.number()], { error: 'Name the part by its id or the last part of its address.' })
    .transform((v) => String(v).trim())
    .pipe(z.string().min(1, 'Name the part by its id or the last part of its address.').max(120, 'That part address is too long.')),
  note: z.string({ error: 'Write the note as text.' }).trim().max(1000, 'Keep the note under 1,000 characters.').default(''),
});
export type WantedAnswerInput = z.input<typeof wantedAnswerSchema>;

export const wantedCloseSchema = z.object({
  reason: z.enum(WANTED_CLOSE_REASONS, { error: 'Close it as solved, withdrawn or (moderators) spam.' }),
  note: z.string({ error: 'Write the note as text.' }).trim().max(500, 'Keep the note under 500 characters.').default(''),
});
export type WantedCloseInput = z.input<typeof wantedCloseSchema>;

export const wantedPhotoParamsSchema = z.object({
  id: z.coerce.number({ error: 'The id must be a number.' }).int().positive('The id must be a positive number.'),
  photoId: z.coerce.number({ error: 'The photo id must be a number.' }).int().positive('The photo id must be a positive number.'),
  size: z.enum(['thumb', 'display'], { error: 'Ask for the thumb or the display size.' }),
});
