import type { Migration } from '../migrate.js';

/**
 * Links that show one run's or one pack's report to someone without an account. Only the
 * SHA-256 of each token is stored; every opening is logged (time, keyed hash of the address,
 * user agent).
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE share_links (
    id INT AUTO_INCREMENT PRIMARY KEY,
    tokenHash CHAR(64) NOT NULL,
    targetKind VARCHAR(16) NOT NULL,
    targetId INT NOT NULL,
    includePrices TINYINT(1) NOT NULL DEFAULT 0,
    recipient VARCHAR(200) NULL,
    createdById INT NULL,
    createdByName VARCHAR(200) NOT NULL,
    createdAt DATETIME(3) NOT NULL,
    expiresAt DATETIME(3) NOT NULL,
    revokedAt DATETIME(3) NULL,
    revokedByName VARCHAR(200) NULL,
    UNIQUE KEY share_links_token (tokenHash),
    KEY share_links_target (targetKind, targetId)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await sequelize.query(`CREATE TABLE share_link_openings (
    id INT AUTO_INCREMENT PRIMARY KEY,
    linkId INT NOT NULL,
    openedAt DATETIME(3) NOT NULL,
    addressHash CHAR(64) NOT NULL,
    userAgent VARCHAR(400) NOT NULL,
    KEY share_link_openings_link (linkId, id),
    CONSTRAINT share_link_openings_link_fk FOREIGN KEY (linkId) REFERENCES share_links (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE share_link_openings');
  await sequelize.query('DROP TABLE share_links');
};
