import type { Migration } from '../migrate.js';

/** Per-chunk min/max groups (server/archive/chunk-stats.ts) so long-run charts stay fast. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE run_sample_chunks ADD COLUMN statsLayout TEXT NULL, ADD COLUMN stats MEDIUMBLOB NULL');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE run_sample_chunks DROP COLUMN statsLayout, DROP COLUMN stats');
};
