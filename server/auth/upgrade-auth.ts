import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Request, Response } from 'express';
import type { AppContext } from '../app-context.js';
import { toPublicUser } from '../db/models/user.js';
import type { SessionUser } from './session-user.js';

/**
 * Reads the signed-in user of a raw request (a WebSocket upgrade) through the same session
 * cookie and store as the HTTP API. Resolves null when signed out or disabled.
 */
export function sessionUserFromRequest(ctx: AppContext, req: IncomingMessage): Promise<SessionUser | null> {
  return new Promise((resolve, reject) => {
    // express-session only needs headers on req and the writeHead hook on res.
    const res = {} as ServerResponse;
    ctx.sessionMiddleware(req as Request, res as Response, (error?: unknown) => {
      if (error) return reject(error);
      const session = (req as Request).session as (Request['session'] & { passport?: { user?: unknown } }) | undefined;
      const id = Number(session?.passport?.user);
      if (!Number.isInteger(id) || id <= 0) return resolve(null);
      ctx.models.User.findByPk(id)
        .then((row) => resolve(row && !row.disabled ? toPublicUser(row) : null))
        .catch(reject);
    });
  });
}

/** True when the upgrade's Origin header is this server's own origin (blocks cross-site WebSocket hijacking). */
export function isSameOrigin(req: IncomingMessage): boolean {
  const origin = req.headers.origin;
  if (!origin) return false;
  try {
    return new URL(origin).host === req.headers.host;
  } catch {
    return false;
  }
}
