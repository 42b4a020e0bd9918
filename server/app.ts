import express, { type Express } from 'express';
import type { AppContext } from './app-context.js';
import { securityHeaders } from './http/security-headers.js';
import { hostCheck } from './http/host-check.js';
import { csrfProtection } from './http/csrf.js';
import { apiNotFound, createErrorHandler } from './http/error-handler.js';
import { serveClient } from './http/client-static.js';
import { databaseGate, healthRoute } from './http/database-gate.js';
import { createAuthRouter } from './http/routes/auth-routes.js';
import { requireSignedIn } from './auth/guards.js';
import { createUsersRouter } from './http/routes/users-routes.js';
import { createBatteriesRouter } from './http/routes/batteries-routes.js';
import { createSettingsRouter } from './http/routes/settings-routes.js';
import { createBenchesRouter } from './http/routes/benches-routes.js';
import { createRunsRouter } from './http/routes/runs-routes.js';
import { createInspectionRouter } from './http/routes/inspection-routes.js';
import { createPhotosRouter } from './http/routes/photos-routes.js';
import { createAlarmsRouter } from './http/routes/alarms-routes.js';
import { createPushRouter, pushAcknowledgeRoute } from './http/routes/push-routes.js';
import { createSignoffRouter } from './http/routes/signoff-routes.js';
import { createShareLinksRouter } from './http/routes/share-links-routes.js';
import { createSharedRouter } from './http/routes/shared-routes.js';
import { createProgrammesRouter } from './http/routes/programmes-routes.js';
import { createInstrumentsRouter } from './http/routes/instruments-routes.js';
import { createGatewaysRouter } from './http/routes/gateways-routes.js';
import { createLogger } from './log/logger.js';

/**
 * The Express app (no listen). Order matters: security headers, the health endpoint, a 503
 * while the database is away, JSON body (size-limited),
 * session + passport, CSRF on every state-changing /api request, the routers, 404 for unknown
 * /api paths, the client, and last the one error handler.
 */
export function createApp(ctx: AppContext): Express {
  const app = express();
  app.disable('x-powered-by');
  // Whose X-Forwarded-For/-Proto to believe: the sign-in limits key on the client's address.
  app.set('trust proxy', ctx.config.trustProxy);
  app.use(hostCheck(ctx.config.allowedHosts));
  app.use(securityHeaders(ctx.config.cookieSecure));
  // Health first: it needs no session, so it answers even while the database is away.
  app.get('/api/health', healthRoute(ctx));
  app.use('/api', databaseGate(ctx));
  // Shared reports: public and read-only, before the session so no cookie counts; nothing under
  // /api/shared falls through to the signed-in API.
  app.use('/api/shared', createSharedRouter(ctx));
  app.use('/api', express.json({ limit: ctx.config.bodyLimit }));
  // The push notification's Acknowledge action: authorised by its signed token, not a session, so before CSRF.
  app.post('/api/push/acknowledge', pushAcknowledgeRoute(ctx));
  app.use('/api', ctx.sessionMiddleware, ctx.passport.initialize(), ctx.passport.session(), csrfProtection);

  app.use('/api/auth', createAuthRouter(ctx));
  app.use('/api/users', createUsersRouter(ctx));
  app.use('/api/batteries', createBatteriesRouter(ctx));
  app.use('/api/settings', createSettingsRouter(ctx));
  // Each area's router lives in server/http/routes; every route is guarded with requireRole(...)
  // from ./auth/guards.js, and CSRF is already enforced above.
  app.use('/api/benches', createBenchesRouter(ctx));
  app.use('/api/runs', createRunsRouter(ctx));
  app.use('/api', createInspectionRouter(ctx));
  app.use('/api', createPhotosRouter(ctx));
  app.use('/api/alarms', createAlarmsRouter(ctx));
  app.use('/api/push', createPushRouter(ctx));
  app.use('/api', createSignoffRouter(ctx));
  app.use('/api/share-links', createShareLinksRouter(ctx));
  app.use('/api', createProgrammesRouter(ctx));
  app.use('/api', createInstrumentsRouter(ctx));
  app.use('/api/gateways', createGatewaysRouter(ctx));

  app.use('/api', apiNotFound);
  serveClient(app, ctx.config.clientDir, [ctx.sessionMiddleware, ctx.passport.initialize(), ctx.passport.session(), requireSignedIn]);
  app.use(createErrorHandler(createLogger('http', ctx.log)));
  return app;
}
