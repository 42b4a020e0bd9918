import { randomBytes } from 'node:crypto';
import mariadb from 'mariadb';
import { inject } from 'vitest';
import type { DatabaseConfig } from '../../../server/config/config.js';

async function adminQuery(sql: string): Promise<void> {
  const info = inject('mariadb');
  const connection = await mariadb.createConnection({ host: info.host, port: info.port, user: info.user, password: info.password });
  try {
    await connection.query(sql);
  } finally {
    await connection.end();
  }
}

/** Creates an empty database on the test MariaDB with a unique name; returns how to reach it. */
export async function createTestDatabase(): Promise<DatabaseConfig> {
  const info = inject('mariadb');
  const database = `kp_t_${randomBytes(5).toString('hex')}`;
  await adminQuery(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  return { host: info.host, port: info.port, user: info.user, password: info.password, database };
}

/** Drops a database made by createTestDatabase. */
export async function dropTestDatabase(database: string): Promise<void> {
  if (!/^kp_t_[0-9a-f]+$/.test(database)) throw new Error(`Refusing to drop ${database}: not a test database`);
  await adminQuery(`DROP DATABASE IF EXISTS \`${database}\``);
}
