import type { Migration } from '../migrate.js';

/**
 * Outbound mail that is not an alarm notice (a share link sent to a client): the whole message
 * per row, with the same claim, lease, attempts and back-off as alarm_deliveries. A secret
 * the message carries (a share token) is kept only sealed, and forgotten once sent.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query(`CREATE TABLE mail_queue (
    id INT AUTO_INCREMENT PRIMARY KEY,
    purpose VARCHAR(32) NOT NULL, refId INT NULL, requestedById INT NULL,
    toAddress VARCHAR(254) NOT NULL, replyTo VARCHAR(254) NULL,
    subject VARCHAR(300) NOT NULL, textBody MEDIUMTEXT NOT NULL, htmlBody MEDIUMTEXT NOT NULL,
    messageId VARCHAR(200) NOT NULL, sealedSecret VARCHAR(500) NULL,
    status VARCHAR(16) NOT NULL, attempts INT NOT NULL DEFAULT 0, lastError VARCHAR(1000) NULL,
    nextAttemptAt DATETIME(3) NOT NULL, claimToken VARCHAR(40) NULL, claimedUntil DATETIME(3) NULL,
    sentAt DATETIME(3) NULL, createdAt DATETIME(3) NOT NULL,
    INDEX mail_queue_due (status, nextAttemptAt),
    INDEX mail_queue_requester (requestedById, createdAt),
    CONSTRAINT mail_queue_requester_fk FOREIGN KEY (requestedById) REFERENCES users (id) ON DELETE SET NULL
  )`);
};

/** Drops the outbound mail queue. */
export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE IF EXISTS mail_queue');
};
