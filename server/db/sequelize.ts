import { Sequelize } from 'sequelize';
import type { DatabaseConfig } from '../config/config.js';

const POOL_MAX_CONNECTIONS = 10;
/** A request waits at most this long for a free pooled connection, then answers 503. */
export const POOL_ACQUIRE_TIMEOUT_MS = 1500;
/** Opening a connection to 127.0.0.1 takes milliseconds; longer means the server is stalled. */
export const CONNECT_TIMEOUT_MS = 1000;

/** Creates the Sequelize instance for the app database (mariadb dialect, 127.0.0.1 over TCP, UTC). */
export function createSequelize(db: DatabaseConfig, logging: false | ((sql: string) => void) = false): Sequelize {
  return new Sequelize(db.database, db.user, db.password, {
    dialect: 'mariadb',
    host: db.host,
    port: db.port,
    logging,
    timezone: '+00:00',
    pool: { max: POOL_MAX_CONNECTIONS, min: 0, idle: 10_000, acquire: POOL_ACQUIRE_TIMEOUT_MS },
    dialectOptions: { connectTimeout: CONNECT_TIMEOUT_MS },
    define: { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  });
}
