import type { Migration } from '../migrate.js';

/**
 * One vocabulary in storage too: the chunk table holds readings and its run-time columns say
 * their unit. Renames keep every row (no copy). Blocks already stored inside keep their own
 * column names; the archive maps them when it reads (server/archive/column-block.ts).
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('RENAME TABLE run_sample_chunks TO run_reading_chunks'); // vocab-rename: keep
  await sequelize.query('ALTER TABLE run_reading_chunks DROP FOREIGN KEY run_sample_chunks_run_fk'); // vocab-rename: keep
  await sequelize.query('ALTER TABLE run_reading_chunks RENAME COLUMN firstElapsed TO firstElapsedSeconds, RENAME COLUMN lastElapsed TO lastElapsedSeconds'); // vocab-rename: keep
  await sequelize.query('ALTER TABLE run_reading_chunks ADD CONSTRAINT run_reading_chunks_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE run_reading_chunks DROP FOREIGN KEY run_reading_chunks_run_fk');
  await sequelize.query('ALTER TABLE run_reading_chunks RENAME COLUMN firstElapsedSeconds TO firstElapsed, RENAME COLUMN lastElapsedSeconds TO lastElapsed'); // vocab-rename: keep
  await sequelize.query('ALTER TABLE run_reading_chunks ADD CONSTRAINT run_sample_chunks_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE'); // vocab-rename: keep
  await sequelize.query('RENAME TABLE run_reading_chunks TO run_sample_chunks'); // vocab-rename: keep
};
