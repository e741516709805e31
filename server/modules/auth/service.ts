import { UniqueConstraintError } from 'sequelize';
import type { RegisterInput } from '@shared/schemas/auth';
import type { Config } from '../../config';
import { User } from '../../db/models';
import { transact } from '../../db/transaction';
import { dummyHash, hashPassword, verifyPassword } from '../../security/password';
import { assertPasswordAllowed } from '../../security/password-policy';
import type { TokenService } from './tokens';

export type SignInResult = { ok: true; user: User } | { ok: false; reason: 'credentials' | 'suspended' };

/** Registration and reset requests take at least this long, whatever the address, so timing does not tell. */
export const ACCOUNT_ANSWER_FLOOR_MS = 400;

/** Runs `work` and resolves no sooner than `floorMs` after it started (also when it fails). */
export async function evenTiming<T>(floorMs: number, work: () => Promise<T>): Promise<T> {
  const started = performance.now();
  try {
    return await work();
  } finally {
    const left = floorMs - (performance.now() - started);
    if (left > 0) await new Promise((resolve) => setTimeout(resolve, left));
  }
}

export function registrationMessage(email: string): string {
  return `Check your mail: a message is on its way to ${email}. Follow its link to confirm your address, then sign in. If nothing arrives within a few minutes, look in your spam folder.`;
}

export function createAuthService(config: Config, tokens: Pick<TokenService, 'sendVerification' | 'sendAlreadyRegistered'>) {
  const logN = config.PASSWORD_SCRYPT_LOG_N;

  return {
    /**
     * Registration answers the same whether or not the address has an account. A new address gets
     * an unconfirmed account and a confirmation mail; a known one gets a mail telling its owner that
     * someone tried to sign up with it. Both paths hash the password and write one mail, so the time
     * taken says little either; the route adds a floor on top.
     */
    async register(input: RegisterInput): Promise<void> {
      await assertPasswordAllowed(input.password, input.email);
      const passwordHash = await hashPassword(input.password, logN);
      const db = User.sequelize!;
      try {
        await transact(db, async (transaction) => {
          const existing = await User.findOne({ where: { email: input.email }, transaction });
          if (existing) return tokens.sendAlreadyRegistered(existing, transaction);
          const user = await User.create({ email: input.email, displayName: input.displayName, passwordHash, crewRole: null }, { transaction });
          await tokens.sendVerification(user, transaction);
        });
      } catch (err) {
        if (!(err instanceof UniqueConstraintError)) throw err;
        // the same address signed up twice at the same moment: the second one is told like any known address
        const existing = await User.findOne({ where: { email: input.email } });
        if (existing) await transact(db, (transaction) => tokens.sendAlreadyRegistered(existing, transaction));
      }
    },

    async checkCredentials(email: string, password: string): Promise<SignInResult> {
      // the address comes normalised by the shared schema (trimmed, lower case)
      const user = await User.findOne({ where: { email } });
      if (!user) {
        await verifyPassword(password, await dummyHash(logN));
        return { ok: false, reason: 'credentials' };
      }
      if (!(await verifyPassword(password, user.passwordHash))) return { ok: false, reason: 'credentials' };
      if (user.status !== 'active') return { ok: false, reason: 'suspended' };
      return { ok: true, user };
    },

    /** The signed-in user for a session, or null when the account is gone or suspended. */
    async activeUser(id: number): Promise<User | null> {
      const user = await User.findByPk(id);
      return user && user.status === 'active' ? user : null;
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
