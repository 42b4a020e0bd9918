import { QueryTypes, type Sequelize } from 'sequelize';
import {
  AlarmSettingsSchema, AlarmValuesSchema, type Alarm, type AlarmChannelName, type AlarmKind, type AlarmPriority,
  type AlarmSettings, type AlarmShelf, type AlarmSubscription, type AlarmValues, type OutboxMessage,
} from '../../shared/schemas/alarm.js';
import { utcDateTime } from '../db/utc-datetime.js';
import { alarmState } from './alarm-rules.js';

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());
const SETTINGS_ROW_ID = 1;
/** Most alarms one list answer holds. */
export const ALARM_LIST_LIMIT = 200;
/** Most outbox messages one answer holds. */
export const OUTBOX_LIST_LIMIT = 200;

/** A row of `alarms`. */
interface AlarmRow {
  id: number; runId: number; benchId: number | null; kind: AlarmKind; priority: AlarmPriority; message: string; elapsedSeconds: number;
  valuesJson: string; shelved: number | boolean; raisedAt: Date; acknowledgedAt: Date | null; acknowledgedById: number | null;
  ackName: string | null; clearedAt: Date | null; escalationStep: number;
}

const ALARM_SELECT = `SELECT a.*, u.name AS ackName FROM alarms a LEFT JOIN users u ON u.id = a.acknowledgedById`;

function toAlarm(r: AlarmRow): Alarm {
  const values = AlarmValuesSchema.safeParse(JSON.parse(r.valuesJson));
  return {
    id: r.id, runId: r.runId, benchId: r.benchId, kind: r.kind, priority: r.priority,
    state: alarmState(r.acknowledgedAt !== null, r.clearedAt !== null),
    message: r.message, elapsedSeconds: r.elapsedSeconds,
    values: values.success ? values.data : { volts: null, amps: null, dischargeWh: null, dischargeAh: null, tempCelsius: null, runSeconds: null },
    shelved: Boolean(r.shelved), raisedAt: iso(r.raisedAt)!, acknowledgedAt: iso(r.acknowledgedAt),
    acknowledgedBy: r.acknowledgedById !== null ? { id: r.acknowledgedById, name: r.ackName ?? '' } : null,
    clearedAt: iso(r.clearedAt), escalationStep: r.escalationStep,
  };
}

/** What an alarm message says about its run: names of the run, bench and pack. */
export interface RunContext {
  runId: number; runName: string; benchId: number | null; benchName: string | null; packLabel: string | null; packBrand: string | null;
}

/** A new alarm's row. */
export interface NewAlarm {
  runId: number; benchId: number | null; kind: AlarmKind; priority: AlarmPriority; message: string; elapsedSeconds: number;
  values: AlarmValues; shelved: boolean; raisedAt: Date; nextEscalationAt: Date | null;
}

/** Alarms, subscriptions, on-call lists, shelving, settings and the outbox in MariaDB. */
export class AlarmRepo {
  constructor(private readonly sequelize: Sequelize) {}

  private select<T extends object>(sql: string, replacements: unknown[] = []): Promise<T[]> {
    return this.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
  }

  private async exec(sql: string, replacements: unknown[]): Promise<number> {
    const [result] = await this.sequelize.query(sql, { replacements });
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }

  /** Stores a new alarm; returns it. */
  async insert(a: NewAlarm): Promise<Alarm> {
    const [id] = await this.sequelize.query(
      `INSERT INTO alarms (runId, benchId, kind, priority, message, elapsedSeconds, valuesJson, shelved, raisedAt, escalationStep, nextEscalationAt)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, 0, ?)`,
      { replacements: [a.runId, a.benchId, a.kind, a.priority, a.message.slice(0, 500), a.elapsedSeconds, JSON.stringify(a.values), a.shelved, utcDateTime(a.raisedAt), utcDateTime(a.nextEscalationAt)], type: QueryTypes.INSERT },
    );
    return (await this.get(Number(id)))!;
  }

  /** One alarm, or null. */
  async get(id: number): Promise<Alarm | null> {
    const rows = await this.select<AlarmRow>(`${ALARM_SELECT} WHERE a.id = ?`, [id]);
    return rows[0] ? toAlarm(rows[0]) : null;
  }

  /** True when the run has an alarm of this kind that has not returned to normal. */
  async hasOpen(runId: number, kind: AlarmKind): Promise<boolean> {
    return (await this.select('SELECT id FROM alarms WHERE runId = ? AND kind = ? AND clearedAt IS NULL LIMIT 1', [runId, kind])).length > 0;
  }

  /** Marks open alarms of these kinds on the run as returned to normal; returns their ids. */
  async clear(runId: number, kinds: readonly AlarmKind[], at: Date): Promise<number[]> {
    if (kinds.length === 0) return [];
    const rows = await this.select<{ id: number }>(`SELECT id FROM alarms WHERE runId = ? AND kind IN (?) AND clearedAt IS NULL`, [runId, kinds]);
    if (rows.length > 0) await this.exec('UPDATE alarms SET clearedAt = ? WHERE id IN (?) AND clearedAt IS NULL', [utcDateTime(at), rows.map((r) => r.id)]);
    return rows.map((r) => r.id);
  }

  /**
   * Acknowledges once: true when this call did it (a second acknowledge changes nothing).
   * Stops escalation; a latched alarm returns to normal with its acknowledgement.
   */
  async acknowledge(id: number, userId: number, at: Date, latching: boolean): Promise<boolean> {
    const when = utcDateTime(at);
    return (await this.exec(
      `UPDATE alarms SET acknowledgedAt = ?, acknowledgedById = ?, nextEscalationAt = NULL,
         clearedAt = CASE WHEN ? THEN COALESCE(clearedAt, ?) ELSE clearedAt END
       WHERE id = ? AND acknowledgedAt IS NULL`,
      [when, userId, latching, when, id],
    )) === 1;
  }

  /** Alarms, newest first: of one run, or every alarm not yet settled (unacknowledged or still active). */
  async list(filter: { runId?: number; open?: boolean }): Promise<Alarm[]> {
    const where: string[] = [];
    const args: unknown[] = [];
    if (filter.runId !== undefined) {
      where.push('a.runId = ?');
      args.push(filter.runId);
    }
    if (filter.open) where.push('(a.acknowledgedAt IS NULL OR a.clearedAt IS NULL)');
    const rows = await this.select<AlarmRow>(`${ALARM_SELECT} ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY a.id DESC LIMIT ${ALARM_LIST_LIMIT}`, args);
    return rows.map(toAlarm);
  }

  /** Unacknowledged alarms whose next escalation is due. */
  async dueEscalations(now: Date): Promise<{ id: number; step: number }[]> {
    const rows = await this.select<{ id: number; escalationStep: number }>(
      'SELECT id, escalationStep FROM alarms WHERE nextEscalationAt IS NOT NULL AND nextEscalationAt <= ? AND acknowledgedAt IS NULL ORDER BY id', [utcDateTime(now)]);
    return rows.map((r) => ({ id: r.id, step: r.escalationStep }));
  }

  /** Moves an alarm from `fromStep` to the next step; false when another worker (or an acknowledge) got there first. */
  async advanceEscalation(id: number, fromStep: number, nextAt: Date | null): Promise<boolean> {
    return (await this.exec('UPDATE alarms SET escalationStep = ?, nextEscalationAt = ? WHERE id = ? AND escalationStep = ? AND acknowledgedAt IS NULL',
      [fromStep + 1, utcDateTime(nextAt), id, fromStep])) === 1;
  }

  /** Names of the run, its bench and its pack. */
  async runContext(runId: number): Promise<RunContext | null> {
    const rows = await this.select<RunContext>(
      `SELECT r.id AS runId, r.name AS runName, r.benchId, b.name AS benchName, p.label AS packLabel, p.brand AS packBrand
       FROM runs r LEFT JOIN benches b ON b.id = r.benchId LEFT JOIN batteries p ON p.id = r.batteryId WHERE r.id = ?`, [runId]);
    return rows[0] ?? null;
  }

  /** Who wants this kind on this bench, by which channel. */
  async subscribers(benchId: number | null, kind: AlarmKind): Promise<{ userId: number; channel: AlarmChannelName }[]> {
    return this.select('SELECT DISTINCT userId, channel FROM alarm_subscriptions WHERE kind = ? AND (benchId IS NULL OR benchId = ?)', [kind, benchId]);
  }

  /** One user's subscriptions. */
  async subscriptionsOf(userId: number): Promise<AlarmSubscription[]> {
    return this.select('SELECT benchId, kind, channel FROM alarm_subscriptions WHERE userId = ? ORDER BY benchId, kind, channel', [userId]);
  }

  /** Replaces one user's subscriptions (duplicates folded), in one transaction. */
  async replaceSubscriptions(userId: number, subs: readonly AlarmSubscription[]): Promise<AlarmSubscription[]> {
    const unique = [...new Map(subs.map((s) => [`${s.benchId}|${s.kind}|${s.channel}`, s])).values()];
    await this.sequelize.transaction(async (transaction) => {
      await this.sequelize.query('DELETE FROM alarm_subscriptions WHERE userId = ?', { replacements: [userId], transaction });
      for (const s of unique)
        await this.sequelize.query('INSERT INTO alarm_subscriptions (userId, benchId, kind, channel) VALUES (?, ?, ?, ?)', { replacements: [userId, s.benchId, s.kind, s.channel], transaction });
    });
    return this.subscriptionsOf(userId);
  }

  /** Bench ids among these that do not exist. */
  async missingBenches(ids: readonly number[]): Promise<number[]> {
    if (ids.length === 0) return [];
    const found = new Set((await this.select<{ id: number }>('SELECT id FROM benches WHERE id IN (?)', [ids])).map((r) => r.id));
    return ids.filter((id) => !found.has(id));
  }

  /** User ids among these that do not exist. */
  async missingUsers(ids: readonly number[]): Promise<number[]> {
    if (ids.length === 0) return [];
    const found = new Set((await this.select<{ id: number }>('SELECT id FROM users WHERE id IN (?)', [ids])).map((r) => r.id));
    return ids.filter((id) => !found.has(id));
  }

  /** A bench's on-call list, in calling order. */
  async onCall(benchId: number): Promise<{ userId: number; name: string }[]> {
    return this.select('SELECT o.userId, u.name FROM bench_on_call o JOIN users u ON u.id = o.userId WHERE o.benchId = ? ORDER BY o.position', [benchId]);
  }

  /** Replaces a bench's on-call list. */
  async setOnCall(benchId: number, userIds: readonly number[]): Promise<void> {
    await this.sequelize.transaction(async (transaction) => {
      await this.sequelize.query('DELETE FROM bench_on_call WHERE benchId = ?', { replacements: [benchId], transaction });
      for (const [position, userId] of userIds.entries())
        await this.sequelize.query('INSERT INTO bench_on_call (benchId, position, userId) VALUES (?, ?, ?)', { replacements: [benchId, position, userId], transaction });
    });
  }

  /** Names and addresses of users. */
  async users(ids: readonly number[]): Promise<Map<number, { id: number; name: string; email: string }>> {
    if (ids.length === 0) return new Map();
    const rows = await this.select<{ id: number; name: string; email: string }>('SELECT id, name, email FROM users WHERE id IN (?)', [ids]);
    return new Map(rows.map((r) => [r.id, r]));
  }

  /** True when the kind is shelved on the bench at `at`. */
  async isShelved(benchId: number | null, kind: AlarmKind, at: Date): Promise<boolean> {
    if (benchId === null) return false;
    return (await this.select('SELECT id FROM alarm_shelves WHERE benchId = ? AND kind = ? AND endedAt IS NULL AND until > ? LIMIT 1', [benchId, kind, utcDateTime(at)])).length > 0;
  }

  /** Logs a shelving; returns its id. */
  async shelve(s: { benchId: number; kind: AlarmKind; reason: string; userId: number; at: Date; until: Date }): Promise<number> {
    const [id] = await this.sequelize.query('INSERT INTO alarm_shelves (benchId, kind, reason, shelvedById, shelvedAt, until) VALUES (?, ?, ?, ?, ?, ?)',
      { replacements: [s.benchId, s.kind, s.reason, s.userId, utcDateTime(s.at), utcDateTime(s.until)], type: QueryTypes.INSERT });
    return Number(id);
  }

  /** Ends a shelving early (logged with who); false when there is no such shelving still running. */
  async unshelve(id: number, userId: number, at: Date): Promise<boolean> {
    return (await this.exec('UPDATE alarm_shelves SET endedAt = ?, endedById = ? WHERE id = ? AND endedAt IS NULL', [utcDateTime(at), userId, id])) === 1;
  }

  /** The shelving log, newest first. */
  async shelves(): Promise<AlarmShelf[]> {
    const rows = await this.select<{ id: number; benchId: number; kind: AlarmKind; reason: string; shelvedById: number | null; byName: string | null; shelvedAt: Date; until: Date; endedAt: Date | null; endedById: number | null; endName: string | null }>(
      `SELECT s.*, a.name AS byName, e.name AS endName FROM alarm_shelves s LEFT JOIN users a ON a.id = s.shelvedById LEFT JOIN users e ON e.id = s.endedById ORDER BY s.id DESC LIMIT ${ALARM_LIST_LIMIT}`);
    return rows.map((r) => ({
      id: r.id, benchId: r.benchId, kind: r.kind, reason: r.reason,
      shelvedBy: r.shelvedById !== null ? { id: r.shelvedById, name: r.byName ?? '' } : null,
      shelvedAt: iso(r.shelvedAt)!, until: iso(r.until)!, endedAt: iso(r.endedAt),
      endedBy: r.endedById !== null ? { id: r.endedById, name: r.endName ?? '' } : null,
    }));
  }

  /** The lab's alarm settings (defaults for what was never set). */
  async settings(): Promise<AlarmSettings> {
    const rows = await this.select<{ data: string }>('SELECT data FROM alarm_settings WHERE id = ?', [SETTINGS_ROW_ID]);
    const parsed = AlarmSettingsSchema.safeParse(rows[0] ? JSON.parse(rows[0].data) : {});
    return parsed.success ? parsed.data : AlarmSettingsSchema.parse({});
  }

  /** Replaces the lab's alarm settings. */
  async saveSettings(settings: AlarmSettings): Promise<AlarmSettings> {
    await this.exec('INSERT INTO alarm_settings (id, data, updatedAt) VALUES (?, ?, NOW(3)) ON DUPLICATE KEY UPDATE data = VALUES(data), updatedAt = VALUES(updatedAt)', [SETTINGS_ROW_ID, JSON.stringify(settings)]);
    return settings;
  }

  /** Keeps one message the fake SMTP server received. */
  async addOutbox(m: { from: string; to: string[]; subject: string; text: string; html: string | null; receivedAt: Date }): Promise<void> {
    await this.exec('INSERT INTO mail_outbox (sender, recipients, subject, textBody, htmlBody, receivedAt) VALUES (?, ?, ?, ?, ?, ?)',
      [m.from.slice(0, 320), JSON.stringify(m.to), m.subject.slice(0, 1000), m.text, m.html, utcDateTime(m.receivedAt)]);
  }

  /** The outbox, newest first. */
  async outbox(): Promise<OutboxMessage[]> {
    const rows = await this.select<{ id: number; sender: string; recipients: string; subject: string; textBody: string; htmlBody: string | null; receivedAt: Date }>(
      `SELECT * FROM mail_outbox ORDER BY id DESC LIMIT ${OUTBOX_LIST_LIMIT}`);
    return rows.map((r) => ({ id: r.id, from: r.sender, to: JSON.parse(r.recipients) as string[], subject: r.subject, text: r.textBody, html: r.htmlBody, receivedAt: iso(r.receivedAt)! }));
  }
}
