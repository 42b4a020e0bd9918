import type { Migration } from '../migrate.js';

/**
 * Run time has one name in storage as in the API: the `t` columns of run events, alarms and
 * note revisions (seconds since the run's origin) become `elapsedSeconds`. Renames keep every
 * row and index. Event JSON stored before the API rename keeps its keys and is mapped when
 * read (shared/schemas/legacy-keys.ts).
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  for (const table of ['run_events', 'alarms', 'run_note_revisions']) {
    await sequelize.query(`ALTER TABLE ${table} RENAME COLUMN t TO elapsedSeconds`);
  }
};

export const down: Migration = async ({ context: { sequelize } }) => {
  for (const table of ['run_events', 'alarms', 'run_note_revisions']) {
    await sequelize.query(`ALTER TABLE ${table} RENAME COLUMN elapsedSeconds TO t`); // vocab-rename: keep
  }
};
