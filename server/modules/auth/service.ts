import { UniqueConstraintError } from 'sequelize';
import type { RegisterInput } from '@shared/schemas/auth';
import type { Config } from '../../config';
import { User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { dummyHash, hashPassword, verifyPassword } from '../../security/password';
import type { TokenService } from './tokens';

export type SignInResult = { ok: true; user: User } | { ok: false; reason: 'credentials' | 'suspended' };

export function createAuthService(config: Config, tokens: Pick<TokenService, 'sendVerification'>) {
  const logN = config.PASSWORD_SCRYPT_LOG_N;

  return {
    /** Creates the account and queues its confirmation mail in the same transaction. */
    async register(input: RegisterInput): Promise<User> {
      const passwordHash = await hashPassword(input.password, logN);
      try {
        return await transact(User.sequelize!, async (transaction) => {
          const user = await User.create(
            { email: input.email, displayName: input.displayName, passwordHash, crewRole: null },
            { transaction },
          );
          await tokens.sendVerification(user, transaction);
          return user;
        });
      } catch (err) {
        if (err instanceof UniqueConstraintError) {
          throw new AppError(409, 'email_taken', 'An account with that e-mail address already exists. Sign in instead.', {
            email: 'An account with that e-mail address already exists.',
          });
        }
        throw err;
      }
    },

    async checkCredentials(email: string, password: string): Promise<SignInResult> {
      const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
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
