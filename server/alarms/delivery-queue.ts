import { QueryTypes, type Sequelize } from 'sequelize';
import type { AlarmChannelName } from '../../shared/schemas/alarm.js';
import { utcDateTime } from '../db/utc-datetime.js';
import { claimLeased, IN_DOUBT_ERROR, MAX_ERROR_CHARS, RELEASE_CLAIM, type LeasedRow } from '../queue/lease-claim.js';
import { afterFailure, type RetryPolicy } from '../queue/retry-policy.js';

/** The in-doubt note, where the alarm queue's callers have always found it. */
export { IN_DOUBT_ERROR };

/** A queue row's state: `cancelled` = its alarm was acknowledged before it went out. */
export type DeliveryStatus = 'pending' | 'sent' | 'failed' | 'cancelled';

/** One row to add: this alarm, to this person, by this channel, at this escalation step. */
export interface DeliveryKey {
  alarmId: number;
  userId: number;
  channel: AlarmChannelName;
  step: number;
}

/** A claimed row, with the token that proves this worker holds it. */
export interface ClaimedDelivery extends DeliveryKey, LeasedRow {}

/** One row as the API shows it (the admin's delivery log). */
export interface DeliveryRow extends DeliveryKey {
  id: number;
  status: DeliveryStatus;
  attempts: number;
  lastError: string | null;
  nextAttemptAt: string;
  sentAt: string | null;
}

/**
 * The durable delivery queue (table alarm_deliveries). Rows are unique per alarm, person,
 * channel and step, so raising or escalating twice adds nothing. A worker claims due rows
 * with one UPDATE that stamps its token and a lease: two workers, or a restarted server,
 * never take the same row while the lease runs. Delivery is at least once: a holder that
 * dies after handing a message over but before marking it sent leaves the row to be sent
 * again when the lease ends (channels make such a repeat recognisable; docs/api.md, Delivery).
 */
export class DeliveryQueue {
  constructor(private readonly sequelize: Sequelize, private readonly policy: RetryPolicy) {}

  private async exec(sql: string, replacements: unknown[]): Promise<number> {
    const [result] = await this.sequelize.query(sql, { replacements });
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }

  /** Adds rows due at `at` (a row already there is left as it is); returns how many were new. */
  async enqueue(keys: readonly DeliveryKey[], at: Date): Promise<number> {
    let added = 0;
    for (const k of keys)
      added += await this.exec(
        `INSERT IGNORE INTO alarm_deliveries (alarmId, userId, channel, step, status, attempts, nextAttemptAt, createdAt) VALUES (?, ?, ?, ?, 'pending', 0, ?, ?)`,
        [k.alarmId, k.userId, k.channel, k.step, utcDateTime(at), utcDateTime(at)]);
    return added;
  }

  /** Claims up to `limit` due rows of these channels for `leaseMs` (server/queue/lease-claim.ts: attempts, in-doubt note). */
  async claimDue(channels: readonly AlarmChannelName[], now: Date, leaseMs: number, limit: number): Promise<ClaimedDelivery[]> {
    if (channels.length === 0) return [];
    return claimLeased<ClaimedDelivery>(this.sequelize, {
      table: 'alarm_deliveries', columns: 'id, alarmId, userId, channel, step, attempts, claimToken',
      where: { sql: 'channel IN (?)', replacements: [channels] },
    }, now, leaseMs, limit);
  }

  /** The row went out. */
  async markSent(row: ClaimedDelivery, now: Date): Promise<void> {
    // An in-doubt note stays on the sent row: the admin's log then shows it may have gone twice.
    await this.exec(`UPDATE alarm_deliveries SET status = 'sent', sentAt = ?, lastError = CASE WHEN lastError = ? THEN lastError ELSE NULL END, ${RELEASE_CLAIM}`,
      [utcDateTime(now), IN_DOUBT_ERROR, row.id, row.claimToken]);
  }

  /** The attempt failed: retry later with back-off, or give up (`permanent`, or out of attempts). */
  async markFailed(row: ClaimedDelivery, error: string, now: Date, permanent = false): Promise<DeliveryStatus> {
    const { status, nextAttemptAt } = afterFailure(this.policy, row.attempts, now, permanent);
    // A row cancelled while this attempt ran stays cancelled.
    await this.exec(`UPDATE alarm_deliveries SET status = CASE WHEN status = 'cancelled' THEN status ELSE ? END, lastError = ?, nextAttemptAt = ?, ${RELEASE_CLAIM}`,
      [status, error.slice(0, MAX_ERROR_CHARS), utcDateTime(nextAttemptAt), row.id, row.claimToken]);
    return status;
  }

  /** Cancels an alarm's rows not yet sent (it was acknowledged); returns how many. */
  async cancelForAlarm(alarmId: number): Promise<number> {
    return this.exec(`UPDATE alarm_deliveries SET status = 'cancelled' WHERE alarmId = ? AND status = 'pending'`, [alarmId]);
  }

  /** The rows of one alarm (or the newest ones of all), for the delivery log. */
  async list(alarmId?: number): Promise<DeliveryRow[]> {
    const rows = await this.sequelize.query<Omit<DeliveryRow, 'nextAttemptAt' | 'sentAt'> & { nextAttemptAt: Date; sentAt: Date | null }>(
      `SELECT id, alarmId, userId, channel, step, status, attempts, lastError, nextAttemptAt, sentAt FROM alarm_deliveries ${alarmId !== undefined ? 'WHERE alarmId = ?' : ''} ORDER BY id DESC LIMIT 500`,
      { replacements: alarmId !== undefined ? [alarmId] : [], type: QueryTypes.SELECT });
    return rows.map((r) => ({ ...r, nextAttemptAt: new Date(r.nextAttemptAt).toISOString(), sentAt: r.sentAt ? new Date(r.sentAt).toISOString() : null }));
  }

  /** The in-app deliveries of one user: alarm ids, newest first. */
  async inAppAlarmIds(userId: number, limit: number): Promise<number[]> {
    const rows = await this.sequelize.query<{ alarmId: number }>(
      `SELECT DISTINCT alarmId FROM alarm_deliveries WHERE userId = ? AND channel = 'in-app' ORDER BY alarmId DESC LIMIT ${Math.floor(limit)}`,
      { replacements: [userId], type: QueryTypes.SELECT });
    return rows.map((r) => r.alarmId);
  }
}
