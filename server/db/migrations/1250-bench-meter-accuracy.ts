import type { Migration } from '../migrate.js';

/** A bench meter's stated accuracy (JSON of MeterAccuracy: ±(% of reading + offset) for V and A). Null = not stated. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE benches ADD COLUMN meterAccuracy TEXT NULL');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE benches DROP COLUMN meterAccuracy');
};
