import { z } from 'zod';
import { REVIEW_CHECKLIST } from '../review';

const checklistKeys = REVIEW_CHECKLIST.map((c) => c.key) as [string, ...string[]];

const note = z.string().trim().max(4000, 'Keep the note under 4,000 characters.');

export const approveSchema = z.object({
  note: note.optional(),
  checklist: z.array(z.enum(checklistKeys)).max(checklistKeys.length).optional(),
});

export const noteRequiredSchema = z.object({
  note: z
    .string({ error: 'Write a note for the contributor: say what needs to change, or why.' })
    .trim()
    .min(5, 'Write a note for the contributor: say what needs to change, or why (at least 5 characters).')
    .max(4000, 'Keep the note under 4,000 characters.'),
});

export const partIdParamSchema = z.object({
  partId: z.coerce.number({ error: 'The part id must be a number.' }).int().positive('The part id must be a positive number.'),
});
