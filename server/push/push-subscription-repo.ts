import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { PushSubscriptionInput } from '../../shared/schemas/push.js';
import { utcDateTime } from '../db/utc-datetime.js';

/** Most browsers one user may register (old ones beyond it are dropped, oldest first). */
export const MAX_SUBSCRIPTIONS_PER_USER = 20;
const MAX_USER_AGENT_CHARS = 300;

/** One stored browser subscription. */
export interface StoredPushSubscription {
  id: number;
  userId: number;
  endpoint: string;
  keys: { p256dh: string; auth: string };
}

const hashOf = (endpoint: string) => createHash('sha256').update(endpoint).digest('hex');

/** The push_subscriptions table: each browser's PushSubscription per user. */
export class PushSubscriptionRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Stores (or moves to this user) the browser's subscription, keyed by its endpoint. */
  async save(userId: number, sub: PushSubscriptionInput, userAgent: string | undefined, at: Date): Promise<void> {
    await this.sequelize.query(
      `INSERT INTO push_subscriptions (userId, endpoint, endpointHash, p256dh, auth, userAgent, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?)
       ON DUPLICATE KEY UPDATE userId = VALUES(userId), p256dh = VALUES(p256dh), auth = VALUES(auth), userAgent = VALUES(userAgent)`,
      { replacements: [userId, sub.endpoint, hashOf(sub.endpoint), sub.keys.p256dh, sub.keys.auth, userAgent?.slice(0, MAX_USER_AGENT_CHARS) ?? null, utcDateTime(at)] },
    );
    const rows = await this.sequelize.query<{ id: number }>(
      'SELECT id FROM push_subscriptions WHERE userId = ? ORDER BY createdAt DESC, id DESC LIMIT 1000 OFFSET ?',
      { replacements: [userId, MAX_SUBSCRIPTIONS_PER_USER], type: QueryTypes.SELECT },
    );
    if (rows.length > 0) await this.sequelize.query('DELETE FROM push_subscriptions WHERE id IN (?)', { replacements: [rows.map((r) => r.id)] });
  }

  /** Removes the user's subscription with that endpoint; true when there was one. */
  async removeOwn(userId: number, endpoint: string): Promise<boolean> {
    const [, meta] = await this.sequelize.query('DELETE FROM push_subscriptions WHERE userId = ? AND endpointHash = ?', { replacements: [userId, hashOf(endpoint)] });
    return ((meta as { affectedRows?: number }).affectedRows ?? 0) > 0;
  }

  /** Removes a subscription the push service says is gone (404/410). */
  async remove(id: number): Promise<void> {
    await this.sequelize.query('DELETE FROM push_subscriptions WHERE id = ?', { replacements: [id] });
  }

  /** The user's browsers. */
  async ofUser(userId: number): Promise<StoredPushSubscription[]> {
    const rows = await this.sequelize.query<{ id: number; userId: number; endpoint: string; p256dh: string; auth: string }>(
      'SELECT id, userId, endpoint, p256dh, auth FROM push_subscriptions WHERE userId = ? ORDER BY id',
      { replacements: [userId], type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ id: r.id, userId: r.userId, endpoint: r.endpoint, keys: { p256dh: r.p256dh, auth: r.auth } }));
  }
}
