import type { Migration } from '../migrate.js';

/**
 * Bench gateways (registered by admins; `passwordHash` is the broker's salted hash of the
 * password shown once, never the password) and which gateway runs a bench (null: this server).
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE gateways (
    id INT NOT NULL AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(40) NOT NULL,
    passwordHash VARCHAR(255) NOT NULL,
    revokedAt DATETIME NULL,
    createdAt DATETIME NOT NULL,
    updatedAt DATETIME NOT NULL,
    UNIQUE KEY gateways_name (name)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query('ALTER TABLE benches ADD COLUMN gatewayId INT NULL, ADD CONSTRAINT benches_gateway FOREIGN KEY (gatewayId) REFERENCES gateways (id) ON DELETE SET NULL');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE benches DROP FOREIGN KEY benches_gateway, DROP COLUMN gatewayId');
  await sequelize.query('DROP TABLE gateways');
};
