// Password rules shared by the forms and the server, after NIST SP 800-63B §5.1.1.2 (memorized
// secrets): a minimum length, long passphrases allowed, every character allowed, no composition rules
// (no "one digit and one symbol"), and a refusal of secrets that are easy to guess: repetitive or
// sequential characters, and context-specific words (the service's name, the account's address).
// The check against a list of common passwords needs the list, so it runs on the server only
// (server/security/password-policy.ts).

/** SP 800-63B asks for at least 8; we keep 10, which the shelf has always asked for. */
export const PASSWORD_MIN = 10;
/** SP 800-63B asks verifiers to allow at least 64 characters. */
export const PASSWORD_MAX = 200;
/** Fewer distinct characters than this reads as repetition ("aaaaaaaaaa", "abababab", ten spaces). */
const MIN_DISTINCT = 4;
/** Fewer unpredictable characters than this reads as a run ("1234567890", "aaaaa12345", "abcdefgh12"). */
const MIN_UNPREDICTABLE = 4;

const SERVICE_WORDS = ['rigshelf'];

export const PASSWORD_MESSAGES = {
  short: `Use at least ${PASSWORD_MIN} characters. A short phrase of a few unrelated words works well.`,
  long: `Use at most ${PASSWORD_MAX} characters.`,
  repetitive:
    'That password is mostly repeated or consecutive characters (like "aaaa" or "1234"), which are guessed first. Choose another; a few unrelated words work well.',
  personal: 'Do not use your e-mail address, its name part or the name of the shelf in your password. Choose another.',
  common: 'That password is on a list of common passwords that attackers try first. Choose another; a few unrelated words work well.',
} as const;

/**
 * Counts the characters that do not follow from the one before: a character that repeats the
 * previous one, or is its neighbour in code-point order (a→b, 3→2), is predictable. Our rule
 * (common practice), made to catch NIST's examples "aaaaaa" and "1234abcd".
 */
export function unpredictableCharacters(password: string): number {
  const chars = [...password.toLowerCase()];
  let count = chars.length ? 1 : 0;
  for (let i = 1; i < chars.length; i++) {
    const step = chars[i].codePointAt(0)! - chars[i - 1].codePointAt(0)!;
    if (Math.abs(step) > 1) count += 1;
  }
  return count;
}

function letters(s: string): string {
  return s.toLowerCase().replace(/[^\p{L}\p{N}]+/gu, '');
}

/** The password without leading and trailing digits and symbols ("Sunshine!2024" → "sunshine"). */
export function passwordCore(password: string): string {
  return password
    .toLowerCase()
    .trim()
    .replace(/^[^\p{L}]+|[^\p{L}]+$/gu, '');
}

/** Why a password is refused by the shared rules, or null when they accept it. */
export function passwordProblem(password: string, email?: string): string | null {
  const length = [...password].length;
  if (length < PASSWORD_MIN) return PASSWORD_MESSAGES.short;
  if (length > PASSWORD_MAX) return PASSWORD_MESSAGES.long;
  if (new Set(password.toLowerCase()).size < MIN_DISTINCT || unpredictableCharacters(password) < MIN_UNPREDICTABLE) {
    return PASSWORD_MESSAGES.repetitive;
  }
  const plain = letters(password);
  const core = letters(passwordCore(password));
  const context = [...SERVICE_WORDS];
  if (email) {
    const address = email.trim().toLowerCase();
    context.push(letters(address), letters(address.split('@')[0] ?? ''));
  }
  for (const word of context.filter((w) => w.length >= 3)) {
    if (plain === word || core === word || (word.length >= 4 && plain.includes(word))) return PASSWORD_MESSAGES.personal;
  }
  return null;
}
