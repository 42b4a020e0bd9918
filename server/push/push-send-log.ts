import { QueryTypes, type Sequelize } from 'sequelize';
import { utcDateTime } from '../db/utc-datetime.js';

/** The push_delivery_sends table: which browsers (subscriptions) already have a delivery. */
export class PushSendLog {
  constructor(private readonly sequelize: Sequelize) {}

  /** Subscription ids that already have this delivery. */
  async reached(deliveryId: number): Promise<Set<number>> {
    const rows = await this.sequelize.query<{ subscriptionId: number }>('SELECT subscriptionId FROM push_delivery_sends WHERE deliveryId = ?',
      { replacements: [deliveryId], type: QueryTypes.SELECT });
    return new Set(rows.map((r) => r.subscriptionId));
  }

  /** Notes that the push service accepted this delivery for this browser. */
  async add(deliveryId: number, subscriptionId: number, at: Date): Promise<void> {
    await this.sequelize.query('INSERT IGNORE INTO push_delivery_sends (deliveryId, subscriptionId, sentAt) VALUES (?, ?, ?)',
      { replacements: [deliveryId, subscriptionId, utcDateTime(at)] });
  }
}
