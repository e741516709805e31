// The server's half of the password rules: the shared ones (shared/password-policy.ts) plus a list
// of common passwords, the list of the zxcvbn-ts project (@zxcvbn-ts/language-common, about 49,000
// passwords seen in breaches), kept on the server because it is too large to send to every browser.
import { dictionary } from '@zxcvbn-ts/language-common';
import { PASSWORD_MESSAGES, passwordCore, passwordProblem } from '@shared/password-policy';
import { AppError } from '../errors';

let common: Set<string> | undefined;

/** True when the password, or its core without leading/trailing digits and symbols, is on the list. */
export function isCommonPassword(password: string): boolean {
  common ??= new Set(dictionary['passwords-common'].map((p) => p.toLowerCase()));
  const lower = password.toLowerCase().trim();
  const core = passwordCore(password);
  return common.has(lower) || common.has(lower.replace(/\s+/g, '')) || (core.length >= 4 && common.has(core));
}

/** Why the password is refused, or null. */
export function passwordRefusal(password: string, email?: string): string | null {
  return passwordProblem(password, email) ?? (isCommonPassword(password) ? PASSWORD_MESSAGES.common : null);
}

/** Throws a 422 with a field message on `password` when the password is refused. */
export async function assertPasswordAllowed(password: string, email?: string): Promise<void> {
  const problem = passwordRefusal(password, email);
  if (problem) throw AppError.field('password', problem);
}
