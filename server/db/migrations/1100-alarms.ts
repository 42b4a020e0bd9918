import type { Migration } from '../migrate.js';

/**
 * Alarms that reach people: the alarms raised on runs (with their lifecycle), who wants which
 * kind by which channel, each bench's on-call list, the shelving log, the lab's alarm settings,
 * the durable delivery queue and the fake SMTP server's outbox.
 */
export const up: Migration = async ({ context: { sequelize } }) => {
  const q = (sql: string) => sequelize.query(sql);
  await q(`CREATE TABLE alarms (
    id INT AUTO_INCREMENT PRIMARY KEY,
    runId INT NOT NULL, benchId INT NULL,
    kind VARCHAR(32) NOT NULL, priority VARCHAR(16) NOT NULL,
    message VARCHAR(500) NOT NULL, t DOUBLE NOT NULL, valuesJson TEXT NOT NULL,
    shelved BOOLEAN NOT NULL DEFAULT FALSE,
    raisedAt DATETIME(3) NOT NULL,
    acknowledgedAt DATETIME(3) NULL, acknowledgedById INT NULL,
    clearedAt DATETIME(3) NULL,
    escalationStep INT NOT NULL DEFAULT 0, nextEscalationAt DATETIME(3) NULL,
    INDEX alarms_run (runId), INDEX alarms_escalation (nextEscalationAt),
    CONSTRAINT alarms_run_fk FOREIGN KEY (runId) REFERENCES runs (id) ON DELETE CASCADE,
    CONSTRAINT alarms_bench_fk FOREIGN KEY (benchId) REFERENCES benches (id) ON DELETE SET NULL,
    CONSTRAINT alarms_ack_fk FOREIGN KEY (acknowledgedById) REFERENCES users (id) ON DELETE SET NULL
  )`);
  await q(`CREATE TABLE alarm_subscriptions (
    id INT AUTO_INCREMENT PRIMARY KEY,
    userId INT NOT NULL, benchId INT NULL, kind VARCHAR(32) NOT NULL, channel VARCHAR(16) NOT NULL,
    INDEX alarm_subscriptions_user (userId),
    CONSTRAINT alarm_subscriptions_user_fk FOREIGN KEY (userId) REFERENCES users (id) ON DELETE CASCADE,
    CONSTRAINT alarm_subscriptions_bench_fk FOREIGN KEY (benchId) REFERENCES benches (id) ON DELETE CASCADE
  )`);
  await q(`CREATE TABLE bench_on_call (
    benchId INT NOT NULL, position INT NOT NULL, userId INT NOT NULL,
    PRIMARY KEY (benchId, position),
    CONSTRAINT bench_on_call_bench_fk FOREIGN KEY (benchId) REFERENCES benches (id) ON DELETE CASCADE,
    CONSTRAINT bench_on_call_user_fk FOREIGN KEY (userId) REFERENCES users (id) ON DELETE CASCADE
  )`);
  await q(`CREATE TABLE alarm_shelves (
    id INT AUTO_INCREMENT PRIMARY KEY,
    benchId INT NOT NULL, kind VARCHAR(32) NOT NULL, reason VARCHAR(500) NOT NULL,
    shelvedById INT NULL, shelvedAt DATETIME(3) NOT NULL, until DATETIME(3) NOT NULL,
    endedAt DATETIME(3) NULL, endedById INT NULL,
    INDEX alarm_shelves_bench (benchId, kind),
    CONSTRAINT alarm_shelves_bench_fk FOREIGN KEY (benchId) REFERENCES benches (id) ON DELETE CASCADE,
    CONSTRAINT alarm_shelves_by_fk FOREIGN KEY (shelvedById) REFERENCES users (id) ON DELETE SET NULL,
    CONSTRAINT alarm_shelves_end_fk FOREIGN KEY (endedById) REFERENCES users (id) ON DELETE SET NULL
  )`);
  await q(`CREATE TABLE alarm_settings (id INT PRIMARY KEY, data TEXT NOT NULL, updatedAt DATETIME(3) NOT NULL)`);
  await q(`CREATE TABLE alarm_deliveries (
    id INT AUTO_INCREMENT PRIMARY KEY,
    alarmId INT NOT NULL, userId INT NOT NULL, channel VARCHAR(16) NOT NULL, step INT NOT NULL,
    status VARCHAR(16) NOT NULL, attempts INT NOT NULL DEFAULT 0, lastError VARCHAR(1000) NULL,
    nextAttemptAt DATETIME(3) NOT NULL, claimToken VARCHAR(40) NULL, claimedUntil DATETIME(3) NULL,
    sentAt DATETIME(3) NULL, createdAt DATETIME(3) NOT NULL,
    UNIQUE KEY alarm_deliveries_once (alarmId, userId, channel, step),
    INDEX alarm_deliveries_due (status, nextAttemptAt),
    CONSTRAINT alarm_deliveries_alarm_fk FOREIGN KEY (alarmId) REFERENCES alarms (id) ON DELETE CASCADE,
    CONSTRAINT alarm_deliveries_user_fk FOREIGN KEY (userId) REFERENCES users (id) ON DELETE CASCADE
  )`);
  await q(`CREATE TABLE mail_outbox (
    id INT AUTO_INCREMENT PRIMARY KEY,
    sender VARCHAR(320) NOT NULL, recipients TEXT NOT NULL, subject VARCHAR(1000) NOT NULL,
    textBody MEDIUMTEXT NOT NULL, htmlBody MEDIUMTEXT NULL, receivedAt DATETIME(3) NOT NULL
  )`);
};

/** Drops the alarm tables. */
export const down: Migration = async ({ context: { sequelize } }) => {
  for (const table of ['mail_outbox', 'alarm_deliveries', 'alarm_settings', 'alarm_shelves', 'bench_on_call', 'alarm_subscriptions', 'alarms'])
    await sequelize.query(`DROP TABLE IF EXISTS ${table}`);
};
