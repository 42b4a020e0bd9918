import type { RequestHandler } from 'express';
import type { Sequelize } from 'sequelize';
import type { AppConfig } from './config/config.js';
import { defineCoreModels, type CoreModels } from './db/models/index.js';
import { createPassport, type PassportInstance } from './auth/passport-setup.js';
import { createSession, type SessionParts } from './auth/session.js';
import { redactingLogger } from './http/redact-tokens.js';
import { consoleLogger, type Logger } from './log/logger.js';

/**
 * Services other areas hang on the context (bench manager, live hub, ...). Add yours from your
 * own file without editing this one:
 *   declare module '../app-context.js' { interface AppServices { benchManager: BenchManager } }
 * then set `ctx.services.benchManager = ...` in your attachment or router factory.
 */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface AppServices {}

/** The server's logger shape (server/log/logger.ts); tests pass a quiet one. */
export type { Logger };

/** Everything a router or attachment needs, created once per server. */
export interface AppContext {
  config: AppConfig;
  sequelize: Sequelize;
  models: CoreModels;
  passport: PassportInstance;
  /** The same session middleware Express uses: run it on a WebSocket upgrade request to read the session. */
  sessionMiddleware: RequestHandler;
  sessionStore: SessionParts['store'];
  services: Partial<AppServices>;
  log: Logger;
  /** Registers cleanup to run when the server closes (last registered runs first). */
  onClose(cleanup: () => Promise<void> | void): void;
  /** Runs the registered cleanups; called by the server's close(). */
  runCloseHandlers(): Promise<void>;
}

/** The console logger used outside tests. */
export { consoleLogger };

/** Builds the context: models, passport and sessions on an already migrated database; its logger redacts share tokens. */
export function createAppContext(config: AppConfig, sequelize: Sequelize, rawLog: Logger = consoleLogger): AppContext {
  // Every line any part of the server logs goes through here: no share token may reach the log.
  const log = redactingLogger(rawLog);
  const models = defineCoreModels(sequelize);
  const session = createSession(config, sequelize);
  const cleanups: Array<() => Promise<void> | void> = [() => session.store.stopExpiringSessions()];
  return {
    config,
    sequelize,
    models,
    passport: createPassport(models),
    sessionMiddleware: session.middleware,
    sessionStore: session.store,
    services: {},
    log,
    onClose: (cleanup) => void cleanups.push(cleanup),
    runCloseHandlers: async () => {
      for (const cleanup of cleanups.splice(0).reverse()) {
        try {
          await cleanup();
        } catch (error) {
          log.error('Cleanup failed', error);
        }
      }
    },
  };
}
