import session, { type Store } from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import type { RequestHandler } from 'express';
import type { Sequelize } from 'sequelize';
import type { AppConfig } from '../config/config.js';

/** Name of the session cookie. */
export const SESSION_COOKIE = 'kneepoint.sid';
const EXPIRED_SESSION_SWEEP_MS = 15 * 60_000;

/** The session middleware and its store (stop the store's sweep timer on close). */
export interface SessionParts {
  middleware: RequestHandler;
  store: Store & { stopExpiringSessions(): void };
}

/**
 * Sessions kept in MariaDB (`sessions` table, created by migration 0001, never synced here).
 * Cookie: HttpOnly, SameSite=Lax, Secure when KNEEPOINT_COOKIE_SECURE is set.
 */
export function createSession(config: AppConfig, sequelize: Sequelize): SessionParts {
  const SequelizeStore = connectSessionSequelize(session.Store);
  const store = new SequelizeStore({
    db: sequelize,
    tableName: 'sessions',
    modelKey: 'Session',
    checkExpirationInterval: EXPIRED_SESSION_SWEEP_MS,
    expiration: config.sessionMaxAgeMs,
  });
  const middleware = session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    cookie: { httpOnly: true, sameSite: 'lax', secure: config.cookieSecure, maxAge: config.sessionMaxAgeMs },
  });
  return { middleware, store };
}
