import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { utcDateTime } from '../db/utc-datetime.js';
import { claimLeased, IN_DOUBT_ERROR, MAX_ERROR_CHARS, RELEASE_CLAIM, type LeasedRow } from '../queue/lease-claim.js';
import { afterFailure, type RetryPolicy } from '../queue/retry-policy.js';
/**
 * Stands in the stored text for the one secret a message may carry (a share link's token):
 * it holds a NUL, which no text a person typed can reach (the schemas refuse control characters).
 */
export const SECRET_PLACEHOLDER = '\u0000secret\u0000';

/** Why a mail is sent: a share link e-mailed to a client. */
export type MailPurpose = 'share-link';

/** A message to queue. `text` and `html` may hold SECRET_PLACEHOLDER, filled from `sealedSecret` at send time. */
export interface NewMail {
  purpose: MailPurpose;
  refId: number | null;
  requestedById: number | null;
  to: string;
  replyTo: string | null;
  subject: string;
  text: string;
  html: string;
  sealedSecret: string | null;
}

/** A claimed row with its message. */
export interface ClaimedMail extends LeasedRow {
  toAddress: string;
  replyTo: string | null;
  subject: string;
  textBody: string;
  htmlBody: string;
  messageId: string;
  sealedSecret: string | null;
}

/** One row as the API shows it (never the body or the secret). */
export interface MailRow {
  id: number;
  purpose: MailPurpose;
  refId: number | null;
  toAddress: string;
  status: 'pending' | 'sent' | 'failed';
  attempts: number;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
}

/**
 * The outbound mail queue (table mail_queue): the same durable delivery as the alarm queue,
 * for messages that are not alarm notices. A worker claims due rows with one UPDATE that
 * stamps its token and a lease and counts the attempt; a send that fails is retried with
 * back-off. At least once, like the alarm queue: a server that dies between SMTP's
 * acceptance and the `sent` mark sends again after the lease, with the same Message-ID.
 * The sealed secret is wiped once the row is sent or given up.
 */
export class MailQueue {
  constructor(private readonly sequelize: Sequelize, private readonly policy: RetryPolicy) {}

  private async exec(sql: string, replacements: unknown[]): Promise<number> {
    const [result] = await this.sequelize.query(sql, { replacements });
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }

  /**
   * Adds a message due at `at` unless its requester already queued `limit.count` since
   * `limit.since`; returns the row id, or null when over the limit. The requester's user row
   * is locked for the count and the insert, so parallel requests cannot all slip under it.
   */
  async enqueue(mail: NewMail, at: Date, limit?: { count: number; since: Date }): Promise<number | null> {
    return this.sequelize.transaction(async (transaction) => {
      if (limit && mail.requestedById !== null) {
        await this.sequelize.query('SELECT id FROM users WHERE id = ? FOR UPDATE', { replacements: [mail.requestedById], type: QueryTypes.SELECT, transaction });
        const [row] = await this.sequelize.query<{ n: number | string }>('SELECT COUNT(*) AS n FROM mail_queue WHERE requestedById = ? AND createdAt > ?',
          { replacements: [mail.requestedById, utcDateTime(limit.since)], type: QueryTypes.SELECT, transaction });
        if (Number(row?.n ?? 0) >= limit.count) return null;
      }
      const [id] = await this.sequelize.query(
        `INSERT INTO mail_queue (purpose, refId, requestedById, toAddress, replyTo, subject, textBody, htmlBody, messageId, sealedSecret, status, attempts, nextAttemptAt, createdAt)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'pending', 0, ?, ?)`,
        {
          replacements: [mail.purpose, mail.refId, mail.requestedById, mail.to, mail.replyTo, mail.subject, mail.text, mail.html,
            `<mail-${randomUUID()}@kneepoint.invalid>`, mail.sealedSecret, utcDateTime(at), utcDateTime(at)],
          type: QueryTypes.INSERT, transaction,
        });
      return Number(id);
    });
  }

  /** Claims up to `limit` due rows for `leaseMs` (server/queue/lease-claim.ts: attempts, in-doubt note). */
  async claimDue(now: Date, leaseMs: number, limit: number): Promise<ClaimedMail[]> {
    return claimLeased<ClaimedMail>(this.sequelize, {
      table: 'mail_queue', columns: 'id, attempts, claimToken, toAddress, replyTo, subject, textBody, htmlBody, messageId, sealedSecret',
    }, now, leaseMs, limit);
  }

  /** The message went out: the secret is wiped. */
  async markSent(row: ClaimedMail, now: Date): Promise<void> {
    await this.exec(`UPDATE mail_queue SET status = 'sent', sentAt = ?, sealedSecret = NULL, lastError = CASE WHEN lastError = ? THEN lastError ELSE NULL END, ${RELEASE_CLAIM}`,
      [utcDateTime(now), IN_DOUBT_ERROR, row.id, row.claimToken]);
  }

  /** The attempt failed: retry later with back-off, or give up (`permanent`, or out of attempts; the secret is then wiped). */
  async markFailed(row: ClaimedMail, error: string, now: Date, permanent = false): Promise<'pending' | 'failed'> {
    const { status, nextAttemptAt } = afterFailure(this.policy, row.attempts, now, permanent);
    await this.exec(`UPDATE mail_queue SET status = ?, lastError = ?, nextAttemptAt = ?, sealedSecret = CASE WHEN ? = 'failed' THEN NULL ELSE sealedSecret END, ${RELEASE_CLAIM}`,
      [status, error.slice(0, MAX_ERROR_CHARS), utcDateTime(nextAttemptAt), status, row.id, row.claimToken]);
    return status;
  }

  /** Rows for one purpose and reference (e.g. the mails of one share link), newest first. */
  async list(purpose: MailPurpose, refId: number): Promise<MailRow[]> {
    const rows = await this.sequelize.query<Omit<MailRow, 'createdAt' | 'sentAt'> & { createdAt: Date; sentAt: Date | null }>(
      'SELECT id, purpose, refId, toAddress, status, attempts, lastError, createdAt, sentAt FROM mail_queue WHERE purpose = ? AND refId = ? ORDER BY id DESC LIMIT 200',
      { replacements: [purpose, refId], type: QueryTypes.SELECT });
    return rows.map((r) => ({ ...r, createdAt: new Date(r.createdAt).toISOString(), sentAt: r.sentAt ? new Date(r.sentAt).toISOString() : null }));
  }
}
