import type { RequestHandler } from 'express';
import type { AppContext } from '../app-context.js';
import type { ErrorBody } from './error-handler.js';
import type { Health } from '../../shared/schemas/health.js';
import '../backup/attach-backups.js';
import { DATABASE_RETRY_AFTER_S } from './error-handler.js';

/**
 * Answers 503 at once, before the session is read, while the database is known to be away
 * or stalled: nothing that needs it could answer, and waiting would only pile requests up.
 */
export function databaseGate(ctx: AppContext): RequestHandler {
  return (_req, res, next) => {
    const health = ctx.services.databaseHealth;
    if (!health || health.available()) return next();
    res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
    res.status(503).json({ error: { message: health.unavailableMessage() } } satisfies ErrorBody);
  };
}

/**
 * GET /api/health: the server answers, the database's state, last restart and restart count,
 * and whether scheduled backups are failing. No sign-in needed, so nothing in it names a path.
 */
export function healthRoute(ctx: AppContext): RequestHandler {
  return (_req, res) => {
    const database = ctx.services.databaseHealth?.status() ?? null;
    const b = ctx.services.backupStatus;
    const backups = b ? { everyHours: b.everyHours, lastAt: b.lastAt, failing: b.lastError !== null } : null;
    res.set('Cache-Control', 'no-store');
    res.status(database && database.state !== 'up' ? 503 : 200).json({ ok: !database || database.state === 'up', database, backups } satisfies Health);
  };
}
