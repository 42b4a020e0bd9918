import type { Migration } from '../migrate.js';

/**
 * The last feed `seq` the server took per gateway bench, so a QoS 1 redelivery after a server
 * restart is still recognised and dropped. No foreign key: a row of a deleted bench is
 * harmless (bench ids are never reused) and a save must not fail on it.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE gateway_feed_seqs (
    benchId INT NOT NULL PRIMARY KEY,
    lastSeq BIGINT NOT NULL,
    updatedAt DATETIME(3) NOT NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE gateway_feed_seqs');
};
