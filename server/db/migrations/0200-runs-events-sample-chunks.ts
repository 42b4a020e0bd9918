import type { Migration } from '../migrate.js';

/**
 * Runs, their events, and their readings stored as chunks of gzip'd Float64 columns
 * (docs/archive.md has the measurements behind that choice). Written as SQL because the
 * chunk table needs a composite primary key and LONGBLOB.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE runs (
    id INT AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(200) NOT NULL,
    tags TEXT NOT NULL,
    origin VARCHAR(16) NOT NULL,
    benchId INT NULL,
    batteryId INT NULL,
    kind VARCHAR(32) NOT NULL,
    state VARCHAR(16) NOT NULL,
    config TEXT NOT NULL,
    readingsCount INT NOT NULL DEFAULT 0,
    summary TEXT NULL,
    pipelineState MEDIUMTEXT NULL,
    startedAt DATETIME(3) NULL,
    endedAt DATETIME(3) NULL,
    createdById INT NULL,
    createdAt DATETIME(3) NOT NULL,
    updatedAt DATETIME(3) NOT NULL,
    KEY runs_state (state),
    KEY runs_bench (benchId),
    KEY runs_battery (batteryId),
    KEY runs_created (createdAt),
    CONSTRAINT runs_battery_fk FOREIGN KEY (batteryId) REFERENCES batteries (id),
    CONSTRAINT runs_user_fk FOREIGN KEY (createdById) REFERENCES users (id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE run_events (
    id INT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL,
    eventSeq INT NULL,
    type VARCHAR(32) NOT NULL,
    t DOUBLE NOT NULL,
    data TEXT NOT NULL,
    createdById INT NULL,
    createdAt DATETIME(3) NOT NULL,
    UNIQUE KEY run_events_seq (runId, eventSeq),
    CONSTRAINT run_events_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE run_sample_chunks (
    runId INT NOT NULL,
    firstSeq INT NOT NULL,
    count INT NOT NULL,
    firstElapsed DOUBLE NOT NULL,
    lastElapsed DOUBLE NOT NULL,
    layout TEXT NOT NULL,
    data LONGBLOB NOT NULL,
    PRIMARY KEY (runId, firstSeq),
    CONSTRAINT run_sample_chunks_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE run_sample_chunks');
  await sequelize.query('DROP TABLE run_events');
  await sequelize.query('DROP TABLE runs');
};
