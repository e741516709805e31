import { Router, type NextFunction, type Request, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { createPassport } from './passport';
import {
  loginSchema,
  passwordResetRequestSchema,
  passwordResetSchema,
  registerSchema,
  verifyEmailSchema,
  type LoginInput,
  type PasswordResetInput,
  type PasswordResetRequestInput,
  type RegisterInput,
  type VerifyEmailInput,
} from '@shared/schemas/auth';
import type { Config } from '../../config';
import type { User } from '../../db/models';
import { AppError } from '../../errors';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import type { AuthService } from './service';
import { RESET_REQUESTED_MESSAGE, TOKEN_LIFETIME_MS, type TokenService } from './tokens';

interface Deps {
  config: Config;
  auth: AuthService;
  passport: ReturnType<typeof createPassport>;
  csrfToken: (req: Request, overwrite?: boolean) => string;
  tokens: TokenService;
}

function tooMany(message: string) {
  return (_req: Request, _res: Response, next: NextFunction) => next(new AppError(429, 'too_many_attempts', message));
}

function signIn(req: Request, user: User): Promise<void> {
  // passport regenerates the session id here, so a session fixed before sign-in is worthless after it
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

/** Ends the session of this request (after a password reset of the account it is signed in to). */
function endSession(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) =>
    req.session.destroy((err) => {
      if (err) return reject(err);
      res.clearCookie('rigshelf.sid', { path: '/' });
      resolve();
    }),
  );
}

export function authRoutes({ config, auth, passport, csrfToken, tokens }: Deps) {
  const router = Router();
  const windowMs = config.LOGIN_LIMIT_WINDOW_MIN * 60_000;
  const minutes = `${config.LOGIN_LIMIT_WINDOW_MIN} minutes`;

  /** One counter per key (the IP address unless `key` says otherwise), answering 429 with `message`. */
  const limiter = (limit: number, message: string, options: { key?: (req: Request) => string; onlyFailures?: boolean } = {}) =>
    rateLimit({
      windowMs,
      limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      skipSuccessfulRequests: options.onlyFailures ?? false,
      ...(options.key && { keyGenerator: options.key }),
      handler: tooMany(message),
    });
  const emailOf = (req: Request) => String((req.body as Partial<LoginInput>)?.email ?? '').toLowerCase();

  const perIp = limiter(config.LOGIN_LIMIT_PER_IP, `Too many sign-in attempts from this network. Wait ${minutes} and try again.`);
  const perAccount = limiter(config.LOGIN_LIMIT_PER_ACCOUNT, `Too many failed sign-ins for this account. Wait ${minutes} or reset your password.`, {
    key: (req) => `account:${emailOf(req)}`,
    onlyFailures: true,
  });
  // mail-sending and link-spending routes: their own counters, the same limits as sign-in
  const resetPerIp = limiter(config.LOGIN_LIMIT_PER_IP, `Too many password-reset attempts from this network. Wait ${minutes} and try again.`);
  const resetPerAddress = limiter(config.LOGIN_LIMIT_PER_ACCOUNT, `Too many reset links were asked for this address. Wait ${minutes}, then use the newest mail.`, {
    key: (req) => `reset:${emailOf(req)}`,
  });
  const resendPerAccount = limiter(config.LOGIN_LIMIT_PER_ACCOUNT, `Too many confirmation mails were asked for. Wait ${minutes}, then use the newest mail.`, {
    key: (req) => `resend:${currentUser(req)?.id ?? ''}`,
  });

  router.get('/csrf', (req, response) => {
    response.json({ csrfToken: csrfToken(req) });
  });

  router.post('/register', validate('body', registerSchema), async (req, response) => {
    const input = response.locals.body as RegisterInput;
    const user = await auth.register(input);
    await signIn(req, user);
    response.status(201).json({ user: user.toPublic() });
  });

  router.post('/login', perIp, validate('body', loginSchema), perAccount, (req, response, next) => {
    passport.authenticate('local', { session: false }, (err: unknown, user: User | false, info?: { message?: string }) => {
      if (err) return next(err);
      if (!user) {
        if (info?.message === 'suspended') {
          return next(new AppError(403, 'account_suspended', 'This account is suspended. Ask a Rigshelf admin to restore it.'));
        }
        return next(new AppError(401, 'invalid_credentials', 'That e-mail and password do not match an account.'));
      }
      signIn(req, user)
        .then(() => response.json({ user: user.toPublic() }))
        .catch(next);
    })(req, response, next);
  });

  router.post('/verify-email', validate('body', verifyEmailSchema), async (_req, response) => {
    const { token } = response.locals.body as VerifyEmailInput;
    const user = await tokens.verifyEmail(token);
    response.json({ user: user.toPublic() });
  });

  router.post('/verify-email/resend', requireAuth, resendPerAccount, async (req, response) => {
    const user = currentUser(req)!;
    await tokens.resendVerification(user);
    const hours = TOKEN_LIFETIME_MS.verify_email / 3600_000;
    response.status(202).json({ message: `A new confirmation link is on its way to ${user.email}. It works for ${hours} hours.` });
  });

  router.post('/password-reset/request', resetPerIp, validate('body', passwordResetRequestSchema), resetPerAddress, async (_req, response) => {
    const { email } = response.locals.body as PasswordResetRequestInput;
    await tokens.requestPasswordReset(email);
    // the same answer whether or not an account uses the address
    response.status(202).json({ message: RESET_REQUESTED_MESSAGE });
  });

  router.post('/password-reset', resetPerIp, validate('body', passwordResetSchema), async (req, response) => {
    const { token, password } = response.locals.body as PasswordResetInput;
    const user = await tokens.resetPassword(token, password);
    if (currentUser(req)?.id === user.id) await endSession(req, response);
    response.json({ message: 'Your password is changed and you are signed out everywhere. Sign in with the new password.' });
  });

  router.get('/me', requireAuth, (req, response) => {
    response.json({ user: currentUser(req)!.toPublic() });
  });

  router.post('/logout', (req, response, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        response.clearCookie('rigshelf.sid', { path: '/' });
        response.status(204).end();
      });
    });
  });

  return router;
}
