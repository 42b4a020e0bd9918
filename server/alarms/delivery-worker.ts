import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import type { AlarmChannels, AlarmDelivery } from './alarm-channel.js';
import type { AlarmRepo } from './alarm-repo.js';
import type { ClaimedDelivery, DeliveryQueue } from './delivery-queue.js';
import { BadAddressError } from './mail-message.js';
import type { Logger } from '../log/logger.js';

/** How often the worker looks for due rows when nothing kicked it. */
export const DELIVERY_POLL_MS = 500;
/** How long a claim holds a row: longer than any one send may take (SMTP times out at 10 s). */
export const DELIVERY_LEASE_MS = 60_000;
/** Rows claimed per turn. */
const CLAIM_BATCH = 50;

/** What the worker needs. */
export interface DeliveryWorkerDeps {
  queue: DeliveryQueue;
  repo: AlarmRepo;
  channels: AlarmChannels;
  /** The lab's name and units for messages. */
  labSettings: () => Promise<LabSettings>;
  /** Base of links, e.g. https://lab.example (no trailing slash). */
  publicUrl: () => string;
  nowMs?: () => number;
  log: Logger;
}

/**
 * Takes due rows from the queue and hands each to its channel, off the recording path:
 * it runs on its own timer, and kick() only schedules a turn. A failure is recorded on the
 * row and retried with back-off; one failing row never stops the others.
 */
export class DeliveryWorker {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private again = false;
  private stopped = false;

  constructor(private readonly deps: DeliveryWorkerDeps) {}

  /** Starts the poll timer. */
  start(): void {
    this.stopped = false;
    this.timer = setInterval(() => this.kick(), DELIVERY_POLL_MS);
    this.timer.unref();
    this.kick();
  }

  /** Runs a turn soon (after a row was added); turns never overlap. */
  kick(): void {
    if (this.stopped) return;
    if (this.running) {
      this.again = true;
      return;
    }
    this.running = this.turn()
      .catch((err: unknown) => this.deps.log.error('alarm delivery pass failed', err))
      .finally(() => {
        this.running = null;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }

  /** Stops the timer and waits for the sends under way. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }

  private now(): Date {
    return new Date((this.deps.nowMs ?? Date.now)());
  }

  private async turn(): Promise<void> {
    const names = (['in-app', 'email', 'push'] as const).filter((n) => this.deps.channels.has(n));
    for (;;) {
      const rows = await this.deps.queue.claimDue(names, this.now(), DELIVERY_LEASE_MS, CLAIM_BATCH);
      if (rows.length === 0) return;
      await Promise.all(rows.map((row) => this.deliverOne(row)));
      if (this.stopped) return;
    }
  }

  private async deliverOne(row: ClaimedDelivery): Promise<void> {
    const { queue } = this.deps;
    try {
      const delivery = await this.describe(row);
      if (!delivery) return void (await queue.markFailed(row, 'the alarm, its run or the person no longer exists', this.now(), true));
      const channel = this.deps.channels.get(row.channel);
      if (!channel) return void (await queue.markFailed(row, `no ${row.channel} channel on this server`, this.now()));
      await channel.deliver(delivery);
      await queue.markSent(row, this.now());
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      const status = await queue.markFailed(row, message, this.now(), err instanceof BadAddressError);
      this.deps.log.warn(`alarm delivery ${row.id} (${row.channel}) failed, ${status === 'failed' ? 'given up' : 'will retry'}`, err);
    }
  }

  /** Everything a channel needs for one row, or null when something it names is gone. */
  private async describe(row: ClaimedDelivery): Promise<AlarmDelivery | null> {
    const { repo } = this.deps;
    const alarm = await repo.get(row.alarmId);
    if (!alarm) return null;
    const [context, users, lab] = await Promise.all([repo.runContext(alarm.runId), repo.users([row.userId]), this.deps.labSettings()]);
    const user = users.get(row.userId);
    if (!context || !user) return null;
    const base = this.deps.publicUrl();
    return {
      deliveryId: row.id, step: row.step, user, alarm,
      run: { id: context.runId, name: context.runName },
      bench: context.benchId !== null ? { id: context.benchId, name: context.benchName ?? `Bench ${context.benchId}` } : null,
      pack: context.packLabel !== null ? { label: context.packLabel, brand: context.packBrand } : null,
      units: { temperatureUnit: lab.temperatureUnit, energyUnit: lab.energyUnit },
      labName: lab.labName,
      runUrl: `${base}/runs/${alarm.runId}`,
      ackUrl: `${base}/alarms/${alarm.id}`,
      ackApiUrl: `${base}/api/alarms/${alarm.id}/acknowledge`,
    };
  }
}
