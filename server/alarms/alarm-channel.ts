import type { Alarm, AlarmChannelName } from '../../shared/schemas/alarm.js';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';

/** Everything a channel needs to tell one person about one alarm. */
export interface AlarmDelivery {
  /** The queue row: stable across retries and restarts (use it to make sends idempotent). */
  deliveryId: number;
  /** 0 = the first notice; 1, 2, … = escalations. */
  step: number;
  user: { id: number; name: string; email: string };
  alarm: Alarm;
  run: { id: number; name: string };
  bench: { id: number; name: string } | null;
  pack: { label: string; brand: string | null } | null;
  /** The lab's units for the message. */
  units: Pick<LabSettings, 'temperatureUnit' | 'energyUnit'>;
  labName: string;
  /** Absolute link to the run page. */
  runUrl: string;
  /** Absolute link to the alarm's acknowledge page (sign-in first, then it works). */
  ackUrl: string;
  /** Absolute URL of POST /api/alarms/:id/acknowledge (for a push notification's action). */
  ackApiUrl: string;
}

/**
 * One way of reaching a person (in the app, e-mail, Web Push). `deliver` resolves when the
 * message is handed over and throws to have the queue retry it later with back-off.
 * A channel registers itself with the AlarmChannels registry; the queue never knows which
 * channels exist.
 */
export interface AlarmChannel {
  readonly name: AlarmChannelName;
  deliver(delivery: AlarmDelivery): Promise<void>;
}

/** The channels this server can deliver by; a channel not registered gets no queue rows. */
export class AlarmChannels {
  private readonly byName = new Map<AlarmChannelName, AlarmChannel>();

  /** Adds (or replaces) a channel; returns a function that removes it. */
  register(channel: AlarmChannel): () => void {
    this.byName.set(channel.name, channel);
    return () => {
      if (this.byName.get(channel.name) === channel) this.byName.delete(channel.name);
    };
  }

  /** The channel of that name, if registered. */
  get(name: AlarmChannelName): AlarmChannel | undefined {
    return this.byName.get(name);
  }

  /** True when deliveries by that channel can go out here. */
  has(name: AlarmChannelName): boolean {
    return this.byName.has(name);
  }
}

/**
 * The in-app channel: the person's alarm list (GET /api/alarms/inbox) and the banner read
 * the delivery rows themselves, so handing over is storing, which the queue has done.
 */
export const inAppChannel: AlarmChannel = {
  name: 'in-app',
  deliver: async () => {},
};
