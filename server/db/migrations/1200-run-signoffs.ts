import type { Migration } from '../migrate.js';

/**
 * Every ready-for-review mark and every sign-off of a run, never updated or removed: who, when,
 * their comment, the frozen snapshot of the run they signed and its SHA-256.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE run_signoffs (
    id INT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL,
    action VARCHAR(16) NOT NULL,
    comment TEXT NOT NULL,
    snapshot LONGTEXT NOT NULL,
    contentHash CHAR(64) NOT NULL,
    byId INT NULL,
    byName VARCHAR(200) NOT NULL,
    byRole VARCHAR(16) NOT NULL,
    createdAt DATETIME(3) NOT NULL,
    KEY run_signoffs_run (runId, id),
    CONSTRAINT run_signoffs_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE run_signoffs');
};
