import { rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type { AppConfig } from '../config/config.js';

/**
 * Counts failed sign-ins per client address; after `loginMaxFailures` in the window, answers 429
 * until the window passes. Successful sign-ins do not count.
 */
export function createLoginRateLimit(config: Pick<AppConfig, 'loginMaxFailures' | 'loginWindowMs'>): RequestHandler {
  return rateLimit({
    windowMs: config.loginWindowMs,
    limit: config.loginMaxFailures,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res, _next, options) => {
      res.status(options.statusCode).json({ error: { message: 'Too many failed sign-ins: wait a few minutes and try again' } });
    },
  });
}
