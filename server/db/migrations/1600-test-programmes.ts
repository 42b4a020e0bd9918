import type { Migration } from '../migrate.js';

/**
 * Test programmes (saved, reused), the programme each run follows with its step results, and
 * every command exchanged with a run's instruments (the command log).
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE programmes (
    id INT AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(120) NOT NULL,
    body JSON NOT NULL,
    createdById INT NULL,
    createdAt DATETIME(3) NOT NULL,
    updatedAt DATETIME(3) NOT NULL,
    KEY programmes_name (name)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE run_programmes (
    runId INT NOT NULL PRIMARY KEY,
    programmeId INT NULL,
    programme JSON NOT NULL,
    state VARCHAR(16) NOT NULL,
    currentIndex INT NULL,
    stepStartedAtMs BIGINT NULL,
    results JSON NOT NULL,
    failReason VARCHAR(500) NULL,
    floorVolts DOUBLE NOT NULL,
    watchdogArmed JSON NOT NULL,
    cautionsAcknowledgedBy VARCHAR(200) NOT NULL,
    cautionsAcknowledgedAt DATETIME(3) NOT NULL,
    updatedAt DATETIME(3) NOT NULL,
    KEY run_programmes_state (state)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE run_command_log (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL,
    atMs BIGINT NOT NULL,
    instrumentId VARCHAR(64) NOT NULL,
    sent VARCHAR(500) NOT NULL,
    reply VARCHAR(500) NULL,
    problem VARCHAR(500) NULL,
    KEY run_command_log_run (runId, id)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE run_command_log');
  await sequelize.query('DROP TABLE run_programmes');
  await sequelize.query('DROP TABLE programmes');
};
