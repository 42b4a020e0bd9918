import type { Server } from 'node:http';
import type { AppContext } from '../app-context.js';
import { isSameOrigin, sessionUserFromRequest } from '../auth/upgrade-auth.js';
import '../auth/end-sessions.js';
import type { LiveHub } from './live-hub.js';
import { attachWsServer } from './ws-server.js';
import { createLogger } from '../log/logger.js';

/**
 * Opens the WebSocket at /ws onto a hub for signed-in, same-origin browsers, and lets the
 * auth area close a user's or a session's sockets. Returns the endpoint's close.
 */
export function openLiveEndpoint(httpServer: Server, ctx: AppContext, hub: LiveHub): () => Promise<void> {
  const ws = attachWsServer(httpServer, {
    hub,
    authenticate: (req) => sessionUserFromRequest(ctx, req),
    checkOrigin: (req) => isSameOrigin(req, ctx.config),
    log: createLogger('live', ctx.log),
  });
  ctx.services.closeUserSockets = ws.closeUser;
  ctx.services.closeSessionSockets = ws.closeSession;
  return async () => {
    delete ctx.services.closeUserSockets;
    delete ctx.services.closeSessionSockets;
    await ws.close();
  };
}
