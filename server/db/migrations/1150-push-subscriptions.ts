import type { Migration } from '../migrate.js';

/** Web Push: each browser's PushSubscription, per user (one row per push endpoint). */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE push_subscriptions (
    id INT AUTO_INCREMENT PRIMARY KEY,
    userId INT NOT NULL,
    endpoint VARCHAR(1000) NOT NULL, endpointHash CHAR(64) NOT NULL,
    p256dh VARCHAR(200) NOT NULL, auth VARCHAR(100) NOT NULL,
    userAgent VARCHAR(300) NULL, createdAt DATETIME(3) NOT NULL,
    UNIQUE KEY push_subscriptions_endpoint (endpointHash),
    INDEX push_subscriptions_user (userId),
    CONSTRAINT push_subscriptions_user_fk FOREIGN KEY (userId) REFERENCES users (id) ON DELETE CASCADE
  )`);
};

/** Drops the push subscriptions. */
export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE IF EXISTS push_subscriptions');
};
