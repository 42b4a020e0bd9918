import type { Migration } from '../migrate.js';

/**
 * Which browsers already have each push delivery: a retry (by this server or, after a restart,
 * another) skips them, so one browser that failed never makes the others get the alarm twice.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE push_delivery_sends (
    deliveryId INT NOT NULL, subscriptionId INT NOT NULL, sentAt DATETIME(3) NOT NULL,
    PRIMARY KEY (deliveryId, subscriptionId),
    CONSTRAINT push_delivery_sends_delivery_fk FOREIGN KEY (deliveryId) REFERENCES alarm_deliveries (id) ON DELETE CASCADE,
    CONSTRAINT push_delivery_sends_subscription_fk FOREIGN KEY (subscriptionId) REFERENCES push_subscriptions (id) ON DELETE CASCADE
  )`);
};

/** Drops the push send log. */
export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE IF EXISTS push_delivery_sends');
};
