// Prep-day planning: print estimates, a member's printers and filament prices, shoot kits.
import { z } from 'zod';
import { DEFAULT_PRINT_HOURS_PER_DAY } from '../kit-summary';
import { HEAT_EXPOSURES, isMaterialId, MATERIAL_IDS, type MaterialId } from '../materials';
import { isCurrency } from '../money';
import { MAX_LAYER_TO_NOZZLE, recipeSchema } from './recipe';

export const KIT_ACCESS = ['read', 'edit'] as const;
export type KitShareAccess = (typeof KIT_ACCESS)[number];

export const MAX_PRINTERS = 50;
export const MAX_KITS = 200;
export const MAX_KIT_ITEMS = 200;
export const MAX_KIT_SHARES = 50;

const recipe = recipeSchema.shape;

function optionalText(what: string, max: number) {
  return z
    .string({ error: `The ${what} must be text.` })
    .trim()
    .max(max, `Keep the ${what} to ${max} characters or fewer.`)
    .nullable()
    .optional();
}

/** An amount of money in the crew's currency (no currency is stored). */
function money(what: string, max = 1_000_000) {
  return z
    .number({ error: `Enter the ${what} as a number.` })
    .min(0, `The ${what} cannot be negative.`)
    .max(max, `The ${what} must be at most ${max.toLocaleString('en')}.`);
}

function positiveId(what: string) {
  return z
    .number({ error: `Give the ${what} as a number.` })
    .int(`Give the ${what} as a whole number.`)
    .positive(`Give the ${what} as a positive number.`);
}

const side = (what: string) =>
  z
    .number({ error: `Enter each ${what} in millimetres.` })
    .positive(`Each ${what} must be more than 0 mm.`)
    .max(2000, `Each ${what} must be at most 2000 mm.`);

function layerFits(s: { nozzleMm?: number; layerMm?: number }): boolean {
  if (s.nozzleMm === undefined || s.layerMm === undefined) return true;
  return s.layerMm <= Math.round(s.nozzleMm * MAX_LAYER_TO_NOZZLE * 1000) / 1000;
}
const layerMessage = `The layer is too thick for the nozzle; use at most ${MAX_LAYER_TO_NOZZLE * 100} % of the nozzle diameter.`;

// ---- estimate ------------------------------------------------------------------------------

export const estimateSchema = z
  .object({
    fileId: positiveId('model file id').optional(),
    volumeMm3: z
      .number({ error: 'Enter the volume in mm³.' })
      .min(0, 'The volume cannot be negative.')
      .max(1e9, 'The volume must be at most 1 m³ (10⁹ mm³).')
      .optional(),
    areaMm2: z
      .number({ error: 'Enter the surface area in mm².' })
      .min(0, 'The surface area cannot be negative.')
      .max(1e8, 'The surface area must be at most 10⁸ mm².')
      .optional(),
    sizeMm: z.tuple([side('size'), side('size'), side('size')], { error: 'Give the size as three numbers: x, y and z in mm.' }).optional(),
    material: recipe.material,
    nozzleMm: recipe.nozzleMm,
    layerMm: recipe.layerMm,
    walls: recipe.walls,
    topBottomLayers: recipe.topBottomLayers,
    infillPct: recipe.infillPct,
    speedMmS: recipe.speedMmS.optional(),
    accelerationMmS2: z
      .number({ error: 'Enter the acceleration in mm/s².' })
      .min(50, 'The acceleration must be between 50 and 50,000 mm/s².')
      .max(50_000, 'The acceleration must be between 50 and 50,000 mm/s².')
      .optional(),
    travelSpeedMmS: z
      .number({ error: 'Enter the travel speed in mm/s.' })
      .min(5, 'The travel speed must be between 5 and 1,000 mm/s.')
      .max(1000, 'The travel speed must be between 5 and 1,000 mm/s.')
      .optional(),
    pricePerKg: money('price per kg', 10_000).optional(),
    printerWatts: z
      .number({ error: 'Enter the printer’s power in watts.' })
      .positive('The printer’s power must be more than 0 W.')
      .max(10_000, 'The printer’s power must be at most 10,000 W.')
      .optional(),
    pricePerKwh: money('price per kWh', 100).optional(),
  })
  .superRefine((input, ctx) => {
    const figures = [input.volumeMm3, input.areaMm2, input.sizeMm].filter((v) => v !== undefined).length;
    if (input.fileId !== undefined && figures > 0) {
      ctx.addIssue({ code: 'custom', path: ['fileId'], message: 'Give either a model file id or the volume, surface area and size, not both.' });
    } else if (input.fileId === undefined && figures < 3) {
      const path = input.volumeMm3 === undefined ? 'volumeMm3' : input.areaMm2 === undefined ? 'areaMm2' : 'sizeMm';
      ctx.addIssue({
        code: 'custom',
        path: figures === 0 ? ['fileId'] : [path],
        message:
          figures === 0
            ? 'Choose a model file, or give its volume, surface area and size.'
            : 'Give the volume (mm³), the surface area (mm²) and the size (x, y, z in mm) together.',
      });
    }
    if (!layerFits(input)) ctx.addIssue({ code: 'custom', path: ['layerMm'], message: layerMessage });
  });
export type EstimateInput = z.infer<typeof estimateSchema>;

// ---- printers ------------------------------------------------------------------------------

const printerFields = {
  name: z.string({ error: 'Name the printer.' }).trim().min(1, 'Name the printer.').max(80, 'Keep the name to 80 characters or fewer.'),
  bedMm: z.tuple([side('bed size'), side('bed size'), side('bed size')], { error: 'Give the bed as three sizes: x, y and z in mm.' }),
  nozzleMm: recipe.nozzleMm,
  bedMarginMm: z.number({ error: 'Enter the margin in mm.' }).min(0, 'The margin cannot be negative.').max(50, 'The margin must be at most 50 mm.').optional(),
  watts: z
    .number({ error: 'Enter the power in watts.' })
    .int('Enter the power in whole watts.')
    .positive('The power must be more than 0 W.')
    .max(10_000, 'The power must be at most 10,000 W.')
    .nullable()
    .optional(),
  notes: optionalText('notes', 2000),
};

export const printerSchema = z.object(printerFields);
export type PrinterInput = z.infer<typeof printerSchema>;

export const printerPatchSchema = z
  .object(printerFields)
  .partial()
  .refine((p) => Object.values(p).some((v) => v !== undefined), { message: 'Send at least one field to change.' });
export type PrinterPatch = z.infer<typeof printerPatchSchema>;

// ---- filament prices -----------------------------------------------------------------------

export const priceSheetSchema = z.object({
  prices: z
    .record(z.string(), money('price per kg', 10_000), { error: 'Send the prices as { "PLA": 22, … } per kg.' })
    .superRefine((prices, ctx) => {
      for (const key of Object.keys(prices)) {
        if (!isMaterialId(key)) {
          ctx.addIssue({ code: 'custom', path: [key], message: `${key} is not a material on the list; use ${MATERIAL_IDS.join(', ')}.` });
        }
      }
    })
    .transform((prices) => prices as Partial<Record<MaterialId, number>>),
  pricePerKwh: money('price per kWh', 100).nullable().optional(),
  /** Charged per hour on print requests; absent keeps the saved rate, null removes it. */
  machineHourRate: money('machine-hour rate', 1000).nullable().optional(),
  currency: z.string().trim().toUpperCase().refine(isCurrency, { message: 'Give the currency as its three-letter code, such as EUR, USD or GBP.' }).optional(),
});
export type PriceSheetInput = z.infer<typeof priceSheetSchema>;

// ---- kits ----------------------------------------------------------------------------------

const date = (what: string) =>
  z.iso
    .date({ error: `Give the ${what} as a date like 2026-03-14.` })
    .nullable()
    .optional();

const kitFields = {
  name: z.string({ error: 'Name the kit.' }).trim().min(2, 'Name the kit (at least 2 characters).').max(120, 'Keep the name to 120 characters or fewer.'),
  production: optionalText('production', 120),
  startsOn: date('first shoot day'),
  endsOn: date('last shoot day'),
  locationNotes: optionalText('location notes', 4000),
  heatExposure: z
    .enum(HEAT_EXPOSURES, { error: `Choose the heat on the shoot: ${HEAT_EXPOSURES.join(', ')}, or none.` })
    .nullable()
    .optional(),
  printHoursPerDay: z
    .number({ error: 'Enter the print hours per day as a number.' })
    .min(0.5, 'Print at least half an hour a day.')
    .max(24, 'A day has 24 hours.'),
  printerPrice: money('printer price').nullable().optional(),
};

function datesInOrder(k: { startsOn?: string | null; endsOn?: string | null }): boolean {
  return !k.startsOn || !k.endsOn || k.startsOn <= k.endsOn;
}
const datesMessage = { message: 'The last shoot day cannot be before the first.', path: ['endsOn'] };

export const kitSchema = z
  .object({ ...kitFields, printHoursPerDay: kitFields.printHoursPerDay.default(DEFAULT_PRINT_HOURS_PER_DAY) })
  .refine(datesInOrder, datesMessage);
export type KitInput = z.infer<typeof kitSchema>;

export const kitPatchSchema = z
  .object(kitFields)
  .partial()
  .refine((p) => Object.values(p).some((v) => v !== undefined), { message: 'Send at least one field to change.' })
  .refine(datesInOrder, datesMessage);
export type KitPatch = z.infer<typeof kitPatchSchema>;

const itemFields = {
  partId: positiveId('part id'),
  quantity: z
    .number({ error: 'Enter how many to print.' })
    .int('Enter a whole number of pieces.')
    .min(1, 'Print at least 1.')
    .max(100, 'Use at most 100 pieces per item; add another item for more.'),
  recipeId: positiveId('recipe id').nullable().optional(),
  material: z
    .enum(MATERIAL_IDS, { error: `Choose the material: ${MATERIAL_IDS.join(', ')}.` })
    .nullable()
    .optional(),
  printerId: positiveId('printer id').nullable().optional(),
  boughtPriceEach: money('bought price').nullable().optional(),
  servicePriceEach: money('print-service price').nullable().optional(),
  serviceShipping: money('print-service shipping').nullable().optional(),
};

export const kitItemSchema = z.object({ ...itemFields, quantity: itemFields.quantity.default(1) });
export type KitItemInput = z.infer<typeof kitItemSchema>;

export const kitItemPatchSchema = z
  .object(itemFields)
  .partial()
  .refine((p) => Object.values(p).some((v) => v !== undefined), { message: 'Send at least one field to change.' });
export type KitItemPatch = z.infer<typeof kitItemPatchSchema>;

export const kitShareSchema = z
  .object({
    email: z
      .string({ error: 'Enter an e-mail address.' })
      .trim()
      .toLowerCase()
      .max(254, 'That e-mail address is too long.')
      .pipe(z.email({ error: 'Enter an e-mail address like name@example.com.' }))
      .optional(),
    userId: positiveId('member id').optional(),
    access: z.enum(KIT_ACCESS, { error: 'Choose "read" (can look) or "edit" (can change items).' }),
  })
  .refine((s) => (s.email === undefined) !== (s.userId === undefined), { message: 'Give an e-mail address or a member id (one of the two).', path: ['email'] });

export const kitSharesSchema = z.object({
  shares: z
    .array(kitShareSchema, { error: 'Send the list of members as "shares".' })
    .max(MAX_KIT_SHARES, `Share a kit with at most ${MAX_KIT_SHARES} members.`),
});
export type KitSharesInput = z.infer<typeof kitSharesSchema>;

export const kitCrewSharesSchema = z.object({
  crewShares: z
    .array(
      z.object({
        crewId: positiveId('crew id'),
        access: z.enum(KIT_ACCESS, { error: 'Choose "read" (can look) or "edit" (can change items).' }),
      }),
      { error: 'Send the list of crews as "crewShares".' },
    )
    .max(10, 'Share a kit with at most 10 crews.'),
});
export type KitCrewSharesInput = z.infer<typeof kitCrewSharesSchema>;

export const kitParamsSchema = z.object({
  id: z.coerce.number({ error: 'The kit id must be a number.' }).int().positive('The kit id must be a positive number.'),
});
export const kitItemParamsSchema = kitParamsSchema.extend({
  itemId: z.coerce.number({ error: 'The item id must be a number.' }).int().positive('The item id must be a positive number.'),
});
export const printerParamsSchema = z.object({
  id: z.coerce.number({ error: 'The printer id must be a number.' }).int().positive('The printer id must be a positive number.'),
});
