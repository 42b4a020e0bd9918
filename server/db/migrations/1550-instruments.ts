import type { Migration } from '../migrate.js';

/**
 * The lab's instruments (meters, loads, supplies) with their calibration (dates, certificate
 * file, per-channel gain and offset as JSON), and which instruments each run used, frozen with
 * their calibration state when the run started.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE instruments (
    id INT AUTO_INCREMENT PRIMARY KEY,
    kind VARCHAR(16) NOT NULL,
    make VARCHAR(120) NOT NULL,
    model VARCHAR(120) NOT NULL,
    serialNumber VARCHAR(80) NOT NULL,
    calibratedOn DATE NULL,
    calibrationDueOn DATE NULL,
    benchId INT NULL,
    channels TEXT NOT NULL,
    notes TEXT NOT NULL,
    certificateFile VARCHAR(80) NULL,
    certificateName VARCHAR(200) NULL,
    certificateType VARCHAR(80) NULL,
    certificateBytes INT NULL,
    certificateUploadedAt DATETIME(3) NULL,
    createdAt DATETIME(3) NOT NULL,
    updatedAt DATETIME(3) NOT NULL,
    KEY instruments_bench (benchId),
    CONSTRAINT instruments_bench_fk FOREIGN KEY (benchId) REFERENCES benches (id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE run_instruments (
    id INT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL,
    instrumentId INT NOT NULL,
    snapshot TEXT NOT NULL,
    createdAt DATETIME(3) NOT NULL,
    UNIQUE KEY run_instruments_pair (runId, instrumentId),
    CONSTRAINT run_instruments_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE run_instruments');
  await sequelize.query('DROP TABLE instruments');
};
