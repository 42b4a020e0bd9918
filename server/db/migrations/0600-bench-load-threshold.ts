import type { Migration } from '../migrate.js';

/** A bench's load threshold (A): discharge current at or above it counts as a load. Null = the core's default. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE benches ADD COLUMN loadOnAmps DOUBLE NULL');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE benches DROP COLUMN loadOnAmps');
};
