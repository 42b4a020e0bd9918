import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { HttpError } from './http-error.js';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

/** Header the client sends the token in. */
export const CSRF_HEADER = 'x-csrf-token';
const TOKEN_BYTES = 32;
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Returns the session's synchronizer token, creating it on first use. */
export function issueCsrfToken(req: Request): string {
  req.session.csrfToken ??= randomBytes(TOKEN_BYTES).toString('base64url');
  return req.session.csrfToken;
}

function tokensMatch(sent: string, expected: string): boolean {
  const a = Buffer.from(sent);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * Synchronizer-token CSRF check for every state-changing method: the X-CSRF-Token header must
 * equal the token kept in the session (GET /api/auth/csrf hands it out). A cross-site page can
 * neither read the token nor set the header, and SameSite=Lax already withholds the cookie.
 */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  const sent = req.get(CSRF_HEADER);
  const expected = req.session?.csrfToken;
  if (!sent || !expected || !tokensMatch(sent, expected)) {
    return next(new HttpError(403, 'Missing or invalid CSRF token: fetch GET /api/auth/csrf and send it in the X-CSRF-Token header'));
  }
  next();
};
