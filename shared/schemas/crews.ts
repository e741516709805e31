// Crews: a camera department working together on a production. Members hold a crew role, `lead`
// (manages members and invitations) or `member`.
import { z } from 'zod';

export const CREW_ROLES = ['lead', 'member'] as const;
export type CrewRole = (typeof CREW_ROLES)[number];

/** Invitation links work for this long. */
export const INVITATION_LIFETIME_DAYS = 14;
export const MAX_CREW_MEMBERS = 200;

/** ISO 4217 alphabetic codes as the running platform's ICU knows them (Intl.supportedValuesOf). */
export function isCurrencyCode(code: string): boolean {
  if (!/^[A-Z]{3}$/.test(code)) return false;
  const known = (Intl as unknown as { supportedValuesOf?: (key: string) => string[] }).supportedValuesOf?.('currency');
  return known ? known.includes(code) : true;
}

const name = z
  .string({ error: 'Name the crew, e.g. "Camera dept, The Salt Road".' })
  .trim()
  .min(2, 'Name the crew, e.g. "Camera dept, The Salt Road".')
  .max(80, 'Keep the crew’s name under 80 characters.');
const production = z
  .string({ error: 'Write the production or company as text.' })
  .trim()
  .max(120, 'Keep the production under 120 characters.')
  .transform((v) => (v === '' ? null : v))
  .nullable();
const currency = z
  .string({ error: 'Choose the currency the crew pays in, as a three-letter code like EUR or GBP.' })
  .trim()
  .toUpperCase()
  .refine(isCurrencyCode, 'Use a three-letter ISO 4217 currency code like EUR, GBP or USD.');
const taxRatePct = z.coerce
  .number({ error: 'Give the tax rate as a percentage, e.g. 19.' })
  .min(0, 'A tax rate cannot be negative.')
  .max(100, 'Give the tax rate as a percentage between 0 and 100.')
  .refine((v) => Math.round(v * 100) === v * 100 || Math.abs(Math.round(v * 100) - v * 100) < 1e-6, 'Give the tax rate with at most two decimals.')
  .nullable();

export const crewSchema = z.object({
  name,
  production: production.optional().default(null),
  currency,
  taxRatePct: taxRatePct.optional().default(null),
});
export type CrewInput = z.output<typeof crewSchema>;

export const crewPatchSchema = z
  .object({ name, production, currency, taxRatePct })
  .partial()
  .refine((p) => Object.values(p).some((v) => v !== undefined), { message: 'Send at least one field to change.' });
export type CrewPatch = z.output<typeof crewPatchSchema>;

const crewRole = z.enum(CREW_ROLES, { error: 'Choose the crew role "lead" (manages members) or "member".' });

export const crewInvitationSchema = z.object({
  email: z
    .string({ error: 'Enter the e-mail address to invite.' })
    .trim()
    .toLowerCase()
    .max(254, 'That e-mail address is too long.')
    .pipe(z.email({ error: 'Enter an e-mail address like name@example.com.' })),
  role: crewRole.default('member'),
});
export type CrewInvitationInput = z.output<typeof crewInvitationSchema>;

export const crewMemberPatchSchema = z.object({ role: crewRole });
export type CrewMemberPatch = z.output<typeof crewMemberPatchSchema>;

const positive = (what: string) =>
  z.coerce
    .number({ error: `The ${what} must be a number.` })
    .int(`The ${what} must be a whole number.`)
    .positive(`The ${what} must be a positive number.`);

export const crewParamsSchema = z.object({ id: positive('crew id') });
export const crewMemberParamsSchema = z.object({ id: positive('crew id'), userId: positive('member id') });
export const crewInvitationParamsSchema = z.object({ id: positive('crew id'), invitationId: positive('invitation id') });
export const invitationTokenParamsSchema = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'This invitation link is not valid. Open the whole link from the mail.'),
});

/** Who sees a part: everyone on the shelf, or the members of one crew (and moderators). */
export const partVisibilitySchema = z.union([z.literal('everyone'), z.object({ crewId: positive('crew id') }).strict()], {
  error: 'Choose who sees the part: "everyone" or { "crewId": <one of your crews> }.',
});
export type PartVisibility = z.output<typeof partVisibilitySchema>;
