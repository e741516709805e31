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
