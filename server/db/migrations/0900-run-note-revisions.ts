import type { Migration } from '../migrate.js';

/**
 * Every edit and removal of a note on a run, with the text before and after, who and when:
 * the run's notes can change, their history cannot.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE run_note_revisions (
    id INT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL,
    eventId INT NOT NULL,
    action VARCHAR(16) NOT NULL,
    previousText TEXT NOT NULL,
    newText TEXT NULL,
    t DOUBLE NOT NULL,
    changedById INT NULL,
    changedByName VARCHAR(200) NOT NULL,
    changedAt DATETIME(3) NOT NULL,
    KEY run_note_revisions_run (runId, id),
    CONSTRAINT run_note_revisions_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE run_note_revisions');
};
