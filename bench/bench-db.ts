/**
 * A private MariaDB for the archive and live benchmarks (own folder and port, never the
 * demo or test data), with the project's migrations applied to a fresh database.
 */
import { resolve } from 'node:path';
import type { Sequelize } from 'sequelize';
import { provisionMariaDb, type ProvisionedMariaDb } from '../server/db/provisioner.js';
import { createSequelize } from '../server/db/sequelize.js';
import { migrate } from '../server/db/migrate.js';
import { quietLogger } from '../server/log/logger.js';

export const BENCH_DB_DIR = resolve('.data/bench-mariadb');
export const BENCH_DB_PORT = Number(process.env.KNEEPOINT_BENCH_DB_PORT ?? 3329);

/** Starts (or reuses) the benchmark MariaDB, creates a fresh database and migrates it. */
export async function openBenchDb(name: string): Promise<{ mariadb: ProvisionedMariaDb; sequelize: Sequelize; close(): Promise<void> }> {
  const database = `kp_bench_${name}_${Date.now().toString(36)}`;
  const mariadb = await provisionMariaDb({
    baseDir: BENCH_DB_DIR, port: BENCH_DB_PORT, database, user: 'kp_bench', password: 'bench-only', grantAllDatabases: true, log: quietLogger,
  });
  const sequelize = createSequelize(mariadb);
  await migrate(sequelize);
  return {
    mariadb,
    sequelize,
    close: async () => {
      await sequelize.query(`DROP DATABASE IF EXISTS \`${database}\``).catch(() => undefined);
      await sequelize.close();
      await mariadb.stop();
    },
  };
}
