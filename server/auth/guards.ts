import type { RequestHandler } from 'express';
import { roleAtLeast, type Role } from '../../shared/schemas/user.js';
import { HttpError } from '../http/http-error.js';
import './session-user.js';

/** 401 unless signed in. */
export const requireSignedIn: RequestHandler = (req, _res, next) => {
  next(req.user ? undefined : new HttpError(401, 'Sign in first'));
};

/** 401 unless signed in, 403 unless the user's role is at least `minRole` (admin ⊇ technician ⊇ viewer). */
export function requireRole(minRole: Role): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) return next(new HttpError(401, 'Sign in first'));
    if (!roleAtLeast(req.user.role, minRole)) return next(new HttpError(403, `This needs the ${minRole} role or higher`));
    next();
  };
}
