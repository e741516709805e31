// Single-use account tokens sent by mail: confirming an e-mail address and resetting a password.
// The mail carries 32 random bytes (base64url); the database keeps only their sha256, so a copy of
// the database does not hold working links.
import { createHash, randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import type { Config } from '../../config';
import { AccountToken, Session, User } from '../../db/models';
import { transact } from '../../db/transaction';
import type { TokenPurpose } from '../../db/models/account-token';
import { AppError } from '../../errors';
import { hashPassword } from '../../security/password';
import { assertPasswordAllowed } from '../../security/password-policy';
import type { Mailer } from '../mail/outbox';
import { mailTemplates } from '../mail/templates';

export type { TokenPurpose };

export const TOKEN_LIFETIME_MS: Readonly<Record<TokenPurpose, number>> = {
  verify_email: 48 * 3600_000,
  password_reset: 60 * 60_000,
};

const MESSAGES: Record<TokenPurpose, { invalid: string; expired: string; used: string }> = {
  verify_email: {
    invalid: 'This confirmation link is not valid. Open the whole link from the newest mail, or ask for a new one from your account page.',
    expired: 'This link has expired. Ask for a new one from your account page.',
    used: 'This confirmation link was already used, so your e-mail address is confirmed. Sign in to carry on.',
  },
  password_reset: {
    invalid: 'This reset link is not valid. Open the whole link from the newest mail, or ask for a new one from the sign-in page.',
    expired: 'This reset link has expired or a newer one was sent. Ask for a new one from the sign-in page and use the newest mail.',
    used: 'This reset link was already used. If you still cannot sign in, ask for a new one from the sign-in page.',
  },
};

export interface IssuedToken {
  /** The value for the mail's link; never stored. */
  token: string;
  expiresAt: Date;
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** A fresh random token and its hash. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

/** Ends the unused reset links of an account (they read as expired from now on). */
async function retireResetTokens(userId: number, transaction?: Transaction) {
  const now = new Date();
  await AccountToken.update({ expiresAt: now }, { where: { userId, purpose: 'password_reset', usedAt: null, expiresAt: { [Op.gt]: now } }, transaction });
}

async function saveToken(userId: number, purpose: TokenPurpose, made: { token: string; hash: string }, transaction?: Transaction) {
  const expiresAt = new Date(Date.now() + TOKEN_LIFETIME_MS[purpose]);
  await AccountToken.create({ userId, purpose, tokenHash: made.hash, expiresAt, usedAt: null }, { transaction });
  return { token: made.token, expiresAt };
}

/** Stores a new token for the user; a new reset token ends the older unused ones. */
export async function issueToken(userId: number, purpose: TokenPurpose, transaction?: Transaction): Promise<IssuedToken> {
  if (purpose === 'password_reset') await retireResetTokens(userId, transaction);
  return saveToken(userId, purpose, newToken(), transaction);
}

/** The stored token, or a 400 token_invalid / token_used / token_expired a person can act on. */
export async function checkToken(token: string, purpose: TokenPurpose, transaction?: Transaction): Promise<AccountToken> {
  const row = await AccountToken.findOne({
    where: { tokenHash: hashToken(token), purpose },
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  const messages = MESSAGES[purpose];
  if (!row) throw new AppError(400, 'token_invalid', messages.invalid);
  if (row.usedAt) throw new AppError(400, 'token_used', messages.used);
  if (row.expiresAt.getTime() <= Date.now()) throw new AppError(400, 'token_expired', messages.expired);
  return row;
}

/** Checks the token under a row lock and marks it used, so two requests cannot both spend it. */
export async function consumeToken(token: string, purpose: TokenPurpose, transaction: Transaction): Promise<AccountToken> {
  const row = await checkToken(token, purpose, transaction);
  await row.update({ usedAt: new Date() }, { transaction });
  return row;
}

export const RESET_REQUESTED_MESSAGE =
  'If an account uses that address, a reset link is on its way. It works for 60 minutes; check your spam folder if it does not arrive.';

export function createTokenService({ config, mailer }: { config: Config; mailer: Mailer }) {
  const logN = config.PASSWORD_SCRYPT_LOG_N;
  const link = (path: string, token: string) => `${config.PUBLIC_URL}${path}?token=${encodeURIComponent(token)}`;
  const db = () => User.sequelize!;

  async function sendVerification(user: User, transaction?: Transaction): Promise<void> {
    const { token } = await issueToken(user.id, 'verify_email', transaction);
    const content = mailTemplates.verifyEmail({
      displayName: user.displayName,
      link: link('/verify-email', token),
      expiresHours: TOKEN_LIFETIME_MS.verify_email / 3600_000,
    });
    await mailer.enqueue(user.email, content, transaction);
  }

  return {
    /** Queues a confirmation mail for the account (inside the caller's transaction when given). */
    sendVerification,

    /** Someone tried to sign up with an address that already has an account: tell its owner. */
    async sendAlreadyRegistered(user: User, transaction?: Transaction): Promise<void> {
      const content = mailTemplates.alreadyRegistered({
        displayName: user.displayName,
        signInLink: `${config.PUBLIC_URL}/sign-in`,
        resetLink: `${config.PUBLIC_URL}/forgot-password`,
      });
      await mailer.enqueue(user.email, content, transaction);
    },

    /** Signed in, not yet confirmed: a new confirmation mail (older links keep working until they expire). */
    async resendVerification(user: User): Promise<void> {
      if (user.emailVerifiedAt) {
        throw new AppError(409, 'already_verified', 'Your e-mail address is already confirmed; there is nothing to resend.');
      }
      await transact(db(), (transaction) => sendVerification(user, transaction));
    },

    async verifyEmail(token: string): Promise<User> {
      return transact(db(), async (transaction) => {
        const row = await consumeToken(token, 'verify_email', transaction);
        const user = await User.findByPk(row.userId, { transaction });
        if (!user) throw new AppError(400, 'token_invalid', MESSAGES.verify_email.invalid);
        if (!user.emailVerifiedAt) await user.update({ emailVerifiedAt: new Date() }, { transaction });
        return user;
      });
    },

    /**
     * Queues a reset mail when an active account uses the address. Both paths make a token and run
     * the same lookups, and the caller answers the same either way, so the answer does not tell
     * whether an account exists; delivery happens later, outside the request.
     */
    async requestPasswordReset(email: string): Promise<void> {
      const made = newToken();
      await transact(db(), async (transaction) => {
        const user = await User.findOne({ where: { email }, transaction });
        const target = user && user.status === 'active' ? user : null;
        await retireResetTokens(target?.id ?? 0, transaction);
        if (!target) return;
        const { token } = await saveToken(target.id, 'password_reset', made, transaction);
        const content = mailTemplates.passwordReset({
          displayName: target.displayName,
          link: link('/reset-password', token),
          expiresMinutes: TOKEN_LIFETIME_MS.password_reset / 60_000,
        });
        await mailer.enqueue(target.email, content, transaction);
      });
    },

    /**
     * Spends the token, sets the new password and ends every session of the account. The link came
     * through the mailbox, so the address counts as confirmed too.
     */
    async resetPassword(token: string, password: string): Promise<User> {
      // a wrong link fails before the slow hash, a refused password before the link is spent
      const found = await checkToken(token, 'password_reset');
      const owner = await User.findByPk(found.userId);
      await assertPasswordAllowed(password, owner?.email);
      const passwordHash = await hashPassword(password, logN);
      return transact(db(), async (transaction) => {
        const row = await consumeToken(token, 'password_reset', transaction);
        const user = await User.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE });
        if (!user) throw new AppError(400, 'token_invalid', MESSAGES.password_reset.invalid);
        await user.update({ passwordHash, emailVerifiedAt: user.emailVerifiedAt ?? new Date() }, { transaction });
        await Session.destroy({ where: { userId: user.id }, transaction });
        await retireResetTokens(user.id, transaction);
        return user;
      });
    },
  };
}

export type TokenService = ReturnType<typeof createTokenService>;
