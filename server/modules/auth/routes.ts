import { Router, type NextFunction, type Request, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { createPassport } from './passport';
import { loginSchema, registerSchema, type LoginInput, type RegisterInput } from '@shared/schemas/auth';
import type { Config } from '../../config';
import type { User } from '../../db/models';
import { AppError } from '../../errors';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import type { AuthService } from './service';

interface Deps {
  config: Config;
  auth: AuthService;
  passport: ReturnType<typeof createPassport>;
  csrfToken: (req: Request, overwrite?: boolean) => string;
}

function tooMany(message: string) {
  return (_req: Request, _res: Response, next: NextFunction) => next(new AppError(429, 'too_many_attempts', message));
}

function signIn(req: Request, user: User): Promise<void> {
  // passport regenerates the session id here, so a session fixed before sign-in is worthless after it
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

export function authRoutes({ config, auth, passport, csrfToken }: Deps) {
  const router = Router();
  const windowMs = config.LOGIN_LIMIT_WINDOW_MIN * 60_000;
  const minutes = `${config.LOGIN_LIMIT_WINDOW_MIN} minutes`;

  const perIp = rateLimit({
    windowMs,
    limit: config.LOGIN_LIMIT_PER_IP,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: tooMany(`Too many sign-in attempts from this network. Wait ${minutes} and try again.`),
  });
  const perAccount = rateLimit({
    windowMs,
    limit: config.LOGIN_LIMIT_PER_ACCOUNT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => `account:${String((req.body as Partial<LoginInput>)?.email ?? '').toLowerCase()}`,
    handler: tooMany(`Too many failed sign-ins for this account. Wait ${minutes} or reset your password.`),
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
