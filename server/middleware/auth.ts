import type { RequestHandler } from 'express';
import type { Role } from '@shared/types';
import type { User } from '../db/models';
import { AppError } from '../errors';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport attaches our model instance
    interface User {
      id: number;
    }
  }
}

export function currentUser(req: { user?: Express.User }): User | undefined {
  return req.user as User | undefined;
}

export const requireAuth: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(AppError.unauthorized());
  next();
};

const rank: Record<Role, number> = { member: 0, moderator: 1, admin: 2 };

/** Allows the given role and every role above it (admin ⊃ moderator ⊃ member). */
export function requireRole(role: Role): RequestHandler {
  return (req, _res, next) => {
    const user = currentUser(req);
    if (!user) return next(AppError.unauthorized());
    if (rank[user.role as Role] < rank[role]) return next(AppError.forbidden(`Only ${role === 'admin' ? 'an admin' : 'a moderator'} can do that.`));
    next();
  };
}

declare module 'express-session' {
  interface SessionData {
    /** When the person signed in (ms since the epoch); the session ends a fixed time after it. */
    signedInAt?: number;
  }
}

/**
 * Ends a signed-in session `maxHours` after its sign-in, however active it has been (the cookie
 * itself rolls with every request). A session from before sign-in times were kept gets one now.
 */
export function absoluteSessionLifetime(maxHours: number): RequestHandler {
  const maxMs = maxHours * 3600_000;
  return (req, _res, next) => {
    if (!req.user || !req.session) return next();
    const signedInAt = req.session.signedInAt;
    if (typeof signedInAt !== 'number') {
      req.session.signedInAt = Date.now();
      return next();
    }
    if (Date.now() - signedInAt <= maxMs) return next();
    // passport's logout drops the stored session and starts an empty one, so the request goes on signed out
    req.logout((err) => next(err));
  };
}
