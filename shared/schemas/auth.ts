import { z } from 'zod';
import { passwordProblem } from '../password-policy';
import { ACCOUNT_STATUSES, ROLES } from '../types';

const email = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.com.' }));

export { PASSWORD_MAX, PASSWORD_MIN } from '../password-policy';

/** A new password: the shared rules of shared/password-policy.ts (the server adds its common-password list). */
const newPassword = z.string({ error: 'Choose a password.' }).superRefine((value, ctx) => {
  const problem = passwordProblem(value);
  if (problem) ctx.addIssue({ code: 'custom', message: problem });
});

export const registerSchema = z
  .object({
    email,
    password: newPassword,
    displayName: z
      .string({ error: 'Enter the name your crew knows you by.' })
      .trim()
      .min(2, 'Use at least 2 characters.')
      .max(80, 'Use at most 80 characters.'),
  })
  .superRefine((v, ctx) => {
    // the address's own words are refused too; the password alone was checked above
    if (typeof v.password === 'string' && typeof v.email === 'string' && passwordProblem(v.password) === null) {
      const problem = passwordProblem(v.password, v.email);
      if (problem) ctx.addIssue({ code: 'custom', path: ['password'], message: problem });
    }
  });
export type RegisterInput = z.infer<typeof registerSchema>;

export const loginSchema = z.object({
  email,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200),
});
export type LoginInput = z.infer<typeof loginSchema>;

// A token that is missing or wrong is answered by the service (400 token_invalid), not here, so a
// mangled link gets the same actionable message as a made-up one.
const linkToken = z
  .string({ error: 'The link is missing its code. Open the whole link from the mail.' })
  .trim()
  .min(1, 'The link is missing its code. Open the whole link from the mail.')
  .max(200, 'That link code is too long. Open the whole link from the mail.');

export const verifyEmailSchema = z.object({ token: linkToken });
export type VerifyEmailInput = z.infer<typeof verifyEmailSchema>;

export const passwordResetRequestSchema = z.object({ email });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

export const passwordResetSchema = z.object({ token: linkToken, password: newPassword });
export type PasswordResetInput = z.infer<typeof passwordResetSchema>;

export const adminUserPatchSchema = z
  .object({
    role: z.enum(ROLES, { error: `Role must be one of: ${ROLES.join(', ')}.` }).optional(),
    status: z.enum(ACCOUNT_STATUSES, { error: `Status must be one of: ${ACCOUNT_STATUSES.join(', ')}.` }).optional(),
  })
  .strict()
  .refine((v) => v.role !== undefined || v.status !== undefined, {
    message: 'Send a role, a status, or both.',
  });
export type AdminUserPatch = z.infer<typeof adminUserPatchSchema>;

export const idParamSchema = z.object({
  id: z.coerce.number({ error: 'The id must be a number.' }).int().positive('The id must be a positive number.'),
});
