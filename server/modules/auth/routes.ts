import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import { rateLimit, type Store } from 'express-rate-limit';
import { slowDown } from 'express-slow-down';
import type { createPassport } from './passport';
import { loginSchema, passwordResetRequestSchema, passwordResetSchema, registerSchema, verifyEmailSchema } from '@shared/schemas/auth';
import type { Sequelize } from 'sequelize';
import type { Config } from '../../config';
import type { User } from '../../db/models';
import { AppError } from '../../errors';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler, validate, validatedBody } from '../../middleware/validate';
import { MariaDbRateStore } from './rate-store';
import type { AuthService } from './service';
import { ACCOUNT_ANSWER_FLOOR_MS, evenTiming, registrationMessage } from './service';
import { RESET_REQUESTED_MESSAGE, TOKEN_LIFETIME_MS, type TokenService } from './tokens';

interface Deps {
  config: Config;
  auth: AuthService;
  passport: ReturnType<typeof createPassport>;
  csrfToken: (req: Request, overwrite?: boolean) => string;
  tokens: TokenService;
  /** Where the counters live: in MariaDB (shared by every instance) when given, else in this process. */
  sequelize?: Sequelize;
}

/** Each failed sign-in from a network address past the free allowance waits this much longer… */
export const LOGIN_DELAY_STEP_MS = 250;
/** …up to this. */
export const LOGIN_DELAY_MAX_MS = 5_000;

function tooMany(message: string) {
  return (_req: Request, _res: Response, next: NextFunction) => next(new AppError(429, 'too_many_attempts', message));
}

function signIn(req: Request, user: User): Promise<void> {
  // passport regenerates the session id here, so a session fixed before sign-in is worthless after it
  return new Promise((resolve, reject) =>
    req.login(user, (err) => {
      if (err) return reject(err);
      req.session.signedInAt = Date.now();
      resolve();
    }),
  );
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

export function authRoutes({ config, auth, passport, csrfToken, tokens, sequelize }: Deps) {
  const router = Router();
  const windowMs = config.LOGIN_LIMIT_WINDOW_MIN * 60_000;
  const minutes = `${config.LOGIN_LIMIT_WINDOW_MIN} minutes`;

  const store = (name: string): { store?: Store } => (sequelize ? { store: new MariaDbRateStore(sequelize, `${name}:`) } : {});

  /** One counter per key (the IP address unless `key` says otherwise), answering 429 with `message`. */
  const limiter = (
    name: string,
    limit: number,
    message: string,
    options: { key?: (req: Request, res: Response) => string; onlyFailures?: boolean; handler?: RequestHandler } = {},
  ) =>
    rateLimit({
      ...store(name),
      windowMs,
      limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      skipSuccessfulRequests: options.onlyFailures ?? false,
      ...(options.key && { keyGenerator: options.key }),
      handler: options.handler ?? tooMany(message),
    });
  // the address as the shared schema normalised it (trimmed, lower case), so " Name@x" and "name@x" share a counter
  const emailOf = (res: Response) => {
    const body = validatedBody(res);
    return body && typeof body === 'object' && 'email' in body ? String(body.email) : '';
  };

  // Sign-in. Per account: strict, failures only. Per network address: failures only, generous and
  // progressive: past a tenth of the limit each further failure waits longer (up to a few seconds);
  // past the limit, an attempt is only checked when its account has no recent failures, and any
  // refusal there (wrong password, or an account already under attack) is the same 429, so the
  // answer never tells a correct password apart from a wrong one.
  const signInRefused = `Too many sign-in attempts from this network. Wait ${minutes} and try again.`;
  const perIpDelay = slowDown({
    ...store('login-delay'),
    windowMs,
    delayAfter: Math.max(1, Math.floor(config.LOGIN_LIMIT_PER_IP / 10)),
    delayMs: (used, req) => (used - req.slowDown.limit) * LOGIN_DELAY_STEP_MS,
    maxDelayMs: LOGIN_DELAY_MAX_MS,
    skipSuccessfulRequests: true,
  });
  const perIp = limiter('login-ip', config.LOGIN_LIMIT_PER_IP, signInRefused, {
    onlyFailures: true,
    handler: (_req, res, next) => {
      res.locals.ipOverLimit = true;
      next();
    },
  });
  const perAccount = limiter(
    'login-account',
    config.LOGIN_LIMIT_PER_ACCOUNT,
    `Too many failed sign-ins for this account. Wait ${minutes} or reset your password.`,
    {
      key: (_req, res) => `account:${emailOf(res)}`,
      onlyFailures: true,
    },
  );
  /** Over the network limit: true when the account has failed sign-ins in this window (besides this attempt). */
  const accountUnderAttack = async (res: Response) => ((await perAccount.getKey(`account:${emailOf(res)}`))?.totalHits ?? 0) > 1;

  // mail-sending routes (registration, reset requests): per network address and per target address
  const mailPerIp = (name: string, what: string) =>
    limiter(name, config.MAIL_LIMIT_PER_IP, `Too many ${what} from this network. Wait ${minutes} and try again.`);
  const perAddress = (prefix: string, message: string) =>
    limiter(`${prefix}-address`, config.LOGIN_LIMIT_PER_ACCOUNT, message, { key: (_req, res) => `${prefix}:${emailOf(res)}` });
  const registerPerIp = mailPerIp('register-ip', 'new accounts');
  const registerPerAddress = perAddress('register', `Too many sign-ups were tried with this address. Wait ${minutes}, then use the newest mail.`);
  const resetPerIp = mailPerIp('reset-ip', 'password-reset attempts');
  const resetPerAddress = perAddress('reset', `Too many reset links were asked for this address. Wait ${minutes}, then use the newest mail.`);
  const resendPerAccount = limiter(
    'resend',
    config.LOGIN_LIMIT_PER_ACCOUNT,
    `Too many confirmation mails were asked for. Wait ${minutes}, then use the newest mail.`,
    {
      key: (req) => `resend:${currentUser(req)?.id ?? ''}`,
    },
  );

  router.get('/csrf', (req, response) => {
    response.json({ csrfToken: csrfToken(req) });
  });

  const register = validate({ body: registerSchema });
  router.post('/register', registerPerIp, register, registerPerAddress, async (_req, response) => {
    const input = register.input(response).body;
    await evenTiming(ACCOUNT_ANSWER_FLOOR_MS, () => auth.register(input));
    // the same answer whether the address is new or already has an account (its owner gets a mail saying so)
    response.status(202).json({ message: registrationMessage(input.email) });
  });

  router.post('/login', validate({ body: loginSchema }), perIpDelay, perIp, perAccount, async (req, response, next) => {
    const overLimit = response.locals.ipOverLimit === true;
    if (overLimit && (await accountUnderAttack(response))) return next(new AppError(429, 'too_many_attempts', signInRefused));
    passport.authenticate('local', { session: false }, (err: unknown, user: User | false, info?: { message?: string }) => {
      if (err) return next(err);
      if (overLimit && (!user || info?.message === 'suspended')) return next(new AppError(429, 'too_many_attempts', signInRefused));
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

  router.post(
    '/verify-email',
    handler({ body: verifyEmailSchema }, async ({ body }, _req, response) => {
      const user = await tokens.verifyEmail(body.token);
      response.json({ user: user.toPublic() });
    }),
  );

  router.post('/verify-email/resend', requireAuth, resendPerAccount, async (req, response) => {
    const user = currentUser(req)!;
    await tokens.resendVerification(user);
    const hours = TOKEN_LIFETIME_MS.verify_email / 3600_000;
    response.status(202).json({ message: `A new confirmation link is on its way to ${user.email}. It works for ${hours} hours.` });
  });

  const resetRequest = validate({ body: passwordResetRequestSchema });
  router.post('/password-reset/request', resetPerIp, resetRequest, resetPerAddress, async (_req, response) => {
    const { email } = resetRequest.input(response).body;
    await evenTiming(ACCOUNT_ANSWER_FLOOR_MS, () => tokens.requestPasswordReset(email));
    // the same answer whether or not an account uses the address
    response.status(202).json({ message: RESET_REQUESTED_MESSAGE });
  });

  router.post(
    '/password-reset',
    resetPerIp,
    handler({ body: passwordResetSchema }, async ({ body }, req, response) => {
      const user = await tokens.resetPassword(body.token, body.password);
      if (currentUser(req)?.id === user.id) await endSession(req, response);
      response.json({ message: 'Your password is changed and you are signed out everywhere. Sign in with the new password.' });
    }),
  );

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
