// A member's camera builds: the body, the mount standards and the key sizes of a rig they work on.
import { z } from 'zod';
import type { MountSlug } from '../catalogue';
import { resolveMount } from '../search/aliases';

export const MAX_BUILDS = 20;
export const MAX_BUILD_MOUNTS = 12;
export const MAX_BUILD_SIZES = 10;

/** A key size of a rig, e.g. monitor width 180 ± 1 mm or lens barrel 80 ± 0.5 mm. */
export const buildSizeSchema = z.object({
  name: z
    .string({ error: 'Name the size, e.g. "lens barrel" or "monitor width".' })
    .trim()
    .min(2, 'Name the size, e.g. "lens barrel" or "monitor width".')
    .max(60, 'Keep the size’s name under 60 characters.'),
  valueMm: z.coerce
    .number({ error: 'Give the size in millimetres.' })
    .positive('A size must be more than 0 mm.')
    .max(2000, 'That is more than 2 m; check the unit (sizes are in millimetres).'),
  tolMm: z.coerce
    .number({ error: 'Give the tolerance in millimetres.' })
    .min(0, 'A tolerance cannot be negative.')
    .max(50, 'Keep the tolerance at 50 mm or less.')
    .default(0),
});
export type BuildSize = z.output<typeof buildSizeSchema>;

/** Mount standards by slug or by the names crews use ("LWS", "V-style", "1/4\""), each once. */
export const buildMountsSchema = z
  .array(z.string({ error: 'Name each mount standard as text.' }), { error: 'Send the mounts as a list.' })
  .max(MAX_BUILD_MOUNTS, `List at most ${MAX_BUILD_MOUNTS} mount standards.`)
  .transform((values, ctx) => {
    const out: MountSlug[] = [];
    for (const value of values) {
      const slug = resolveMount(value);
      if (!slug)
        ctx.addIssue({
          code: 'custom',
          message: `Unknown mount standard "${value}". Choose one from the list (e.g. 15 mm rods at 60 mm, V-style battery plate, 1/4-20).`,
        });
      else if (!out.includes(slug)) out.push(slug);
    }
    return out;
  });

export const buildNameSchema = z
  .string({ error: 'Name the build, e.g. "A-camera, car week".' })
  .trim()
  .min(2, 'Name the build, e.g. "A-camera, car week".')
  .max(80, 'Keep the build’s name under 80 characters.');

/** Body by slug, "maker model" or an alias, as the vocabulary lists them; null for none. */
export const buildBodySchema = z
  .string({ error: 'Choose the camera body from the list.' })
  .trim()
  .max(120, 'Choose the camera body from the list.')
  .nullable()
  .transform((v) => (v ? v : null));

export const buildSchema = z.object({
  name: buildNameSchema,
  body: buildBodySchema.optional().transform((v) => v ?? null),
  mounts: buildMountsSchema.default([]),
  keySizes: z.array(buildSizeSchema).max(MAX_BUILD_SIZES, `List at most ${MAX_BUILD_SIZES} key sizes.`).default([]),
});
export type BuildInput = z.input<typeof buildSchema>;
export type BuildData = z.output<typeof buildSchema>;

export const buildPatchSchema = z
  .strictObject(
    {
      name: buildNameSchema.optional(),
      body: buildBodySchema.optional(),
      mounts: buildMountsSchema.optional(),
      keySizes: z.array(buildSizeSchema).max(MAX_BUILD_SIZES, `List at most ${MAX_BUILD_SIZES} key sizes.`).optional(),
    },
    {
      error: (issue) =>
        issue.code === 'unrecognized_keys' ? `A build has name, body, mounts and keySizes; "${issue.keys.join('", "')}" is not one of them.` : undefined,
    },
  )
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one of name, body, mounts or keySizes to change.' });
export type BuildPatch = z.input<typeof buildPatchSchema>;
export type BuildPatchData = z.output<typeof buildPatchSchema>;

/** `build=<id>` on GET /api/search. */
export const buildIdSchema = z.coerce
  .number({ error: 'Give the build as its number, like build=3 (see your builds).' })
  .int('Give the build as its number, like build=3 (see your builds).')
  .positive('Give the build as its number, like build=3 (see your builds).');
