import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import type { AlarmChannels, AlarmDelivery } from './alarm-channel.js';
import type { AlarmRepo } from './alarm-repo.js';
import type { ClaimedDelivery, DeliveryQueue } from './delivery-queue.js';
import { BadAddressError } from './mail-message.js';
import type { Logger } from '../log/logger.js';
import { LeaseWorker } from '../queue/lease-worker.js';

/** How often the worker looks for due rows when nothing kicked it. */
export const DELIVERY_POLL_MS = 500;
/** How long a claim holds a row: longer than any one send may take (SMTP times out at 10 s). */
export const DELIVERY_LEASE_MS = 60_000;
/** Rows claimed per turn. */
const CLAIM_BATCH = 50;
/** The channels in the order a turn asks for them. */
const CHANNEL_NAMES = ['in-app', 'email', 'push'] as const;

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
 * Takes due rows from the queue and hands each to its channel, off the recording path, as a
 * lease worker (server/queue/lease-worker.ts): it runs on its own timer, and kick() only
 * schedules a turn. A failure is recorded on the row and retried with back-off; one failing
 * row never stops the others.
 */
export class DeliveryWorker extends LeaseWorker<ClaimedDelivery> {
  constructor(deps: DeliveryWorkerDeps) {
    const { queue, channels } = deps;
    super({
      name: 'alarm delivery',
      claim: (now, leaseMs, limit) => queue.claimDue(CHANNEL_NAMES.filter((n) => channels.has(n)), now, leaseMs, limit),
      handle: async (row) => {
        const delivery = await describeDelivery(deps, row);
        if (!delivery) return { error: 'the alarm, its run or the person no longer exists', permanent: true };
        const channel = channels.get(row.channel);
        if (!channel) return { error: `no ${row.channel} channel on this server`, permanent: false };
        await channel.deliver(delivery);
      },
      markSent: (row, now) => queue.markSent(row, now),
      markFailed: (row, error, now, permanent) => queue.markFailed(row, error, now, permanent),
      isPermanent: (err) => err instanceof BadAddressError,
      describe: (row) => `alarm delivery ${row.id} (${row.channel})`,
      pollMs: DELIVERY_POLL_MS, leaseMs: DELIVERY_LEASE_MS, claimBatch: CLAIM_BATCH,
      nowMs: deps.nowMs, log: deps.log,
    });
  }
}

/** Everything a channel needs for one row, or null when something it names is gone. */
async function describeDelivery(deps: DeliveryWorkerDeps, row: ClaimedDelivery): Promise<AlarmDelivery | null> {
  const { repo } = deps;
  const alarm = await repo.get(row.alarmId);
  if (!alarm) return null;
  const [context, users, lab] = await Promise.all([repo.runContext(alarm.runId), repo.users([row.userId]), deps.labSettings()]);
  const user = users.get(row.userId);
  if (!context || !user) return null;
  const base = deps.publicUrl();
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
