import type { Migration } from '../migrate.js';

/** The controllable instruments of a bench (at most one load and one supply), as driver settings. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE bench_instruments (
    benchId INT NOT NULL,
    role VARCHAR(16) NOT NULL,
    driver JSON NOT NULL,
    updatedAt DATETIME(3) NOT NULL,
    PRIMARY KEY (benchId, role)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE bench_instruments');
};
