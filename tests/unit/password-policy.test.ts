import { describe, expect, it } from 'vitest';
import { PASSWORD_MAX, PASSWORD_MIN, passwordCore, passwordProblem, unpredictableCharacters } from '@shared/password-policy';
import { registerSchema } from '@shared/schemas/auth';
import { isCommonPassword, passwordRefusal } from '../../server/security/password-policy';

describe('password policy · length (NIST SP 800-63B §5.1.1.2)', () => {
  it('password policy · minimum and maximum · at least 8 as the standard asks (we keep 10), and room for 64+ character passphrases', () => {
    // §5.1.1.2: "at least 8 characters in length"; verifiers "SHOULD permit ... at least 64 characters"
    expect(PASSWORD_MIN).toBeGreaterThanOrEqual(8);
    expect(PASSWORD_MAX).toBeGreaterThanOrEqual(64);
    expect(passwordProblem('short one')).toMatch(/at least 10/);
    expect(passwordProblem('w'.repeat(PASSWORD_MAX + 1))).toMatch(/at most/);
    expect(passwordProblem('the quick grip hauls sandbags past the dolly track at dawn again!')).toBeNull();
  });

  it('password policy · composition · no rules: all lower case, no digits, spaces and non-ASCII are fine', () => {
    // §5.1.1.2: "SHOULD NOT impose other composition rules"; spaces and Unicode characters accepted
    expect(passwordProblem('gaffer moves quietly')).toBeNull();
    expect(passwordProblem('Kühlschrank öffnen bitte')).toBeNull();
  });
});

describe('password policy · easy to guess (NIST SP 800-63B §5.1.1.2)', () => {
  it('password policy · repetitive or sequential characters · refused, after the standard\'s examples "aaaaaa" and "1234abcd"', () => {
    // §5.1.1.2 lists "Repetitive or sequential characters (e.g. 'aaaaaa', '1234abcd')"
    for (const p of ['aaaaaaaaaa', ' '.repeat(10), '1234567890', '0987654321', 'abcdefghij', '1234abcd12', 'aaaaa12345', 'ababababab', 'zzzzzzzzz9']) {
      expect(passwordProblem(p), JSON.stringify(p)).toMatch(/repeated or consecutive/);
    }
    // our counting rule (common practice): 1 for the first character, +1 for each jump of more than one code point
    expect(unpredictableCharacters('aaaaaaaaaa')).toBe(1);
    expect(unpredictableCharacters('1234abcd')).toBe(2);
    expect(unpredictableCharacters('gaffer')).toBe(4); // g, a, f (f→f and f→e follow on), r
  });

  it("password policy · context-specific words · the service name, the account's address and its name part are refused", () => {
    // §5.1.1.2 lists "Context-specific words, such as the name of the service, the username, and derivatives thereof"
    expect(passwordProblem('rigshelf2026')).toMatch(/name of the shelf/);
    expect(passwordProblem('nia.loader@crew.test', 'nia.loader@crew.test')).toMatch(/e-mail address/);
    expect(passwordProblem('nialoader-1987', 'Nia.Loader@crew.test')).toMatch(/e-mail address/);
    expect(passwordProblem('my name is nia.loader ok', 'nia.loader@crew.test')).toMatch(/e-mail address/);
    expect(passwordProblem('correct horse battery', 'nia.loader@crew.test')).toBeNull();
  });

  it('password policy · common passwords · refused on the server, also with digits and symbols around them', () => {
    // §5.1.1.2 lists "Passwords obtained from previous breach corpuses"; the list is @zxcvbn-ts/language-common's
    expect(isCommonPassword('password12')).toBe(true);
    expect(isCommonPassword('Sunshine!2024')).toBe(true);
    expect(isCommonPassword('qwertyuiop')).toBe(true);
    expect(isCommonPassword('gaffer moves quietly')).toBe(false);
    expect(passwordRefusal('password12')).toMatch(/common passwords/);
    expect(passwordRefusal('gaffer moves quietly', 'nia@crew.test')).toBeNull();
    expect(passwordCore('!!Sunshine2024')).toBe('sunshine');
  });

  it("password policy · register schema · refuses the account's own address on the password field (shared with the form)", () => {
    const result = registerSchema.safeParse({ email: ' Nia.Loader@Crew.test', password: 'nia.loader@crew.test', displayName: 'Nia' });
    expect(result.success).toBe(false);
    expect(result.error!.issues.find((i) => i.path[0] === 'password')?.message).toMatch(/e-mail address/);
    const ok = registerSchema.safeParse({ email: ' Nia.Loader@Crew.test ', password: 'correct horse battery', displayName: 'Nia' });
    expect(ok.success && ok.data.email).toBe('nia.loader@crew.test');
  });
});
