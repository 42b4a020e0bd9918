import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Request, Response } from 'express';
import type { AppContext } from '../app-context.js';
import type { AppConfig } from '../config/config.js';
import { isAllowedHost, requestScheme } from '../http/host-check.js';
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

/**
 * True when the upgrade's Origin is this server's own origin, scheme included (blocks
 * cross-site WebSocket hijacking, and a page served over plain http reaching an https
 * install), and its Host is one of the server's names (DNS rebinding).
 */
export function isSameOrigin(req: IncomingMessage, config: Pick<AppConfig, 'trustProxy' | 'allowedHosts'>): boolean {
  const origin = req.headers.origin;
  if (!origin || !isAllowedHost(req.headers.host, config.allowedHosts)) return false;
  try {
    const url = new URL(origin);
    return url.host === req.headers.host && url.protocol === `${requestScheme(req, config.trustProxy)}:`;
  } catch {
    return false;
  }
}
