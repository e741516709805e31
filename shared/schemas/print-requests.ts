// Print requests between crew members: asking, the steps, statements.
import { z } from 'zod';
import { MAX_REQUEST_QUANTITY, MAX_STATEMENT_FEES } from '../form-limits';
import { MATERIAL_IDS } from '../materials';
import { PRINT_REQUEST_ACTIONS } from '../print-requests';

const positiveId = (what: string) =>
  z
    .number({ error: `Give the ${what} as a number.` })
    .int(`Give the ${what} as a whole number.`)
    .positive(`Give the ${what} as a positive number.`);

export { MAX_REQUEST_QUANTITY };

export const printRequestSchema = z
  .object({
    crewId: positiveId('crew id'),
    printerId: positiveId('printer id'),
    partId: positiveId('part id').optional(),
    recipeId: positiveId('recipe id').nullable().optional(),
    kitId: positiveId('kit id').optional(),
    quantity: z
      .number({ error: 'Enter how many to print.' })
      .int('Enter a whole number of pieces.')
      .min(1, 'Ask for at least 1.')
      .max(MAX_REQUEST_QUANTITY, `Ask for at most ${MAX_REQUEST_QUANTITY} at once; send another request for more.`)
      .default(1),
    material: z
      .enum(MATERIAL_IDS, { error: `Choose the material: ${MATERIAL_IDS.join(', ')}.` })
      .nullable()
      .optional(),
    neededBy: z.iso.date({ error: 'Give the date it is needed by like 2026-03-14.' }).nullable().optional(),
    note: z.string({ error: 'The note must be text.' }).trim().max(2000, 'Keep the note to 2000 characters or fewer.').nullable().optional(),
  })
  .refine((r) => (r.partId === undefined) !== (r.kitId === undefined), {
    message: 'Ask for a part from the shelf or for a whole kit (one of the two).',
    path: ['partId'],
  })
  .refine((r) => r.kitId === undefined || (r.recipeId ?? null) === null, {
    message: 'A kit is printed with each item’s own recipe; leave the recipe out.',
    path: ['recipeId'],
  });
export type PrintRequestInput = z.infer<typeof printRequestSchema>;

export const printRequestStepSchema = z.object({
  note: z.string({ error: 'The note must be text.' }).trim().max(1000, 'Keep the note to 1000 characters or fewer.').nullable().optional(),
});
export type PrintRequestStepInput = z.infer<typeof printRequestStepSchema>;

export const printRequestParamsSchema = z.object({
  id: z.coerce.number({ error: 'The request id must be a number.' }).int().positive('The request id must be a positive number.'),
});
export const printRequestActionParamsSchema = printRequestParamsSchema.extend({
  action: z.enum(PRINT_REQUEST_ACTIONS, { error: `The step must be one of: ${PRINT_REQUEST_ACTIONS.join(', ')}.` }),
});

// ---- statement -------------------------------------------------------------------------------

export { MAX_STATEMENT_FEES };

export const statementDetailsSchema = z.object({
  purchaseOrder: z
    .string({ error: 'The purchase-order number must be text.' })
    .trim()
    .max(60, 'Keep the purchase-order number to 60 characters or fewer.')
    .nullable()
    .optional(),
  fees: z
    .array(
      z.object({
        label: z.string({ error: 'Name the fee.' }).trim().min(1, 'Name the fee.').max(120, 'Keep the fee’s name to 120 characters or fewer.'),
        amount: z.number({ error: 'Enter the fee as a number.' }).min(0, 'A fee cannot be negative.').max(1_000_000, 'A fee must be at most 1,000,000.'),
      }),
      { error: 'Send the fees as a list of { label, amount }.' },
    )
    .max(MAX_STATEMENT_FEES, `Add at most ${MAX_STATEMENT_FEES} fee lines.`)
    .optional(),
});
export type StatementDetailsInput = z.infer<typeof statementDetailsSchema>;

export const statementQuerySchema = z.object({
  crewId: z.coerce.number({ error: 'The crew id must be a number.' }).int().positive('The crew id must be a positive number.').optional(),
});
