import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import { createLogger, quietLogger, type Logger } from '../log/logger.js';

/** Umzug's own warnings and errors. */
const migrateLog = createLogger('migrate');

/** What every migration receives: `export const up: Migration = async ({ context }) => …`. */
export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}
/** The type of a migration's `up` and `down` exports. */
export type Migration = (params: { name: string; context: MigrationContext }) => Promise<void>;

const MIGRATIONS_DIR = join(dirname(fileURLToPath(import.meta.url)), 'migrations');

/**
 * Builds the umzug migrator over server/db/migrations/NNNN-name.{ts,js}. Names drop the
 * extension so the compiled (.js) and source (.ts) runs record the same history.
 */
export function createMigrator(sequelize: Sequelize, log: Logger = quietLogger) {
  return new Umzug<MigrationContext>({
    migrations: {
      glob: ['[0-9][0-9][0-9][0-9]-*.{ts,js}', { cwd: MIGRATIONS_DIR, ignore: ['**/*.d.ts', '**/*.test.ts'] }],
      resolve: ({ name, path, context }) => {
        const load = async () => (await import(pathToFileURL(path!).href)) as { up: Migration; down?: Migration };
        const migrationName = name.replace(/\.(ts|js)$/, '');
        return {
          name: migrationName,
          up: async () => (await load()).up({ name: migrationName, context }),
          down: async () => (await load()).down?.({ name: migrationName, context }),
        };
      },
    },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: { info: (e) => log.info(String(e.event ?? '') + ' ' + String(e.name ?? '')), warn: (e) => migrateLog.warn(JSON.stringify(e)), error: (e) => migrateLog.error(JSON.stringify(e)), debug: () => {} },
  });
}

/** Applies every pending migration in order; returns the names applied. */
export async function migrate(sequelize: Sequelize, log?: Logger): Promise<string[]> {
  const applied = await createMigrator(sequelize, log).up();
  return applied.map((migration) => migration.name);
}
