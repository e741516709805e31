import { z } from 'zod';

export const cameraBodySchema = z.object({
  maker: z.string({ error: 'Name the maker.' }).trim().min(1, 'Name the maker.').max(80, 'Keep the maker under 80 characters.'),
  model: z.string({ error: 'Name the model.' }).trim().min(1, 'Name the model.').max(80, 'Keep the model under 80 characters.'),
  aliases: z.array(z.string().trim().min(1).max(60)).max(20, 'List at most 20 other names.').default([]),
});
export type CameraBodyInput = z.infer<typeof cameraBodySchema>;

export const cameraBodyPatchSchema = cameraBodySchema
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one field to change.' });

export const slugParamSchema = z.object({
  slug: z.string().regex(/^[a-z0-9-]{1,80}$/, 'That is not a camera-body slug.'),
});
