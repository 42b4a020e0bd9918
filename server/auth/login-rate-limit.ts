import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { AppConfig } from '../config/config.js';

/**
 * An address may fail this many times the per-account limit (over all accounts) before it is
 * refused too: enough that a lab behind one proxy address is not locked out by one person's
 * typos, small enough that spraying guesses over many accounts stays slow.
 */
export const ADDRESS_LIMIT_FACTOR = 5;

type LimitConfig = Pick<AppConfig, 'loginMaxFailures' | 'loginWindowMs'>;

/** The client address as Express sees it (the proxy's forwarded one only when `trust proxy` allows). */
const addressKey = (req: Request) => ipKeyGenerator(req.ip ?? req.socket.remoteAddress ?? 'unknown');

/**
 * A limiter of failed attempts per key: every attempt counts from the moment it starts (so
 * parallel guesses cannot all get through before the first one fails), and a successful one
 * is taken back. Past `limit` in the window it answers 429 without checking anything.
 */
function attemptLimit(windowMs: number, limit: number, key: (req: Request) => string, message: string): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: key,
    handler: (_req, res, _next, options) => {
      res.status(options.statusCode).json({ error: { message } });
    },
  });
}

/**
 * Limits on sign-in: `loginMaxFailures` failed attempts per account and address in the
 * window, and ADDRESS_LIMIT_FACTOR times that per address. A lockout therefore refuses one
 * account from one address (even its right password, so guessing stays impossible), never
 * every user behind the same proxy address.
 */
export function createLoginRateLimit(config: LimitConfig): RequestHandler[] {
  const message = 'Too many failed sign-ins: wait a few minutes and try again';
  const account = (req: Request) => {
    const email: unknown = (req.body as { email?: unknown } | undefined)?.email;
    return `${addressKey(req)}|${typeof email === 'string' ? email.trim().toLowerCase() : ''}`;
  };
  // Account first: attempts it refuses never reach (and never use up) the address's allowance.
  return [
    attemptLimit(config.loginWindowMs, config.loginMaxFailures, account, message),
    attemptLimit(config.loginWindowMs, config.loginMaxFailures * ADDRESS_LIMIT_FACTOR, addressKey, message),
  ];
}

/**
 * Limit on changing one's password (which checks the current one with scrypt):
 * `loginMaxFailures` wrong current passwords per signed-in user in the window, so parallel
 * guesses cannot fill the scrypt pool and slow everyone's sign-in. Keyed by user, not
 * address: only a signed-in session can guess, and colleagues behind the same proxy are
 * never refused for it. Mount after the signed-in guard.
 */
export function createPasswordChangeLimit(config: LimitConfig): RequestHandler {
  const message = 'Too many wrong current passwords: wait a few minutes and try again';
  const user = (req: Request) => `user:${(req.user as { id?: number } | undefined)?.id ?? addressKey(req)}`;
  return attemptLimit(config.loginWindowMs, config.loginMaxFailures, user, message);
}
