import type { AppContext } from '../app-context.js';
import { UnavailableError } from '../domain/domain-errors.js';
import type { AlarmChannels } from './alarm-channel.js';
import type { AlarmService } from './alarm-service.js';
import type { DeliveryWorker } from './delivery-worker.js';
import type { FakeSmtpServer } from './fake-smtp.js';

declare module '../app-context.js' {
  interface AppServices {
    /** Raises, acknowledges and escalates alarms; set by the alarms root (server/compose/alarms-root.ts). */
    alarms: AlarmService;
    /** The channels alarms are delivered by: a Web Push channel registers itself here. */
    alarmChannels: AlarmChannels;
    /** Hands queued notices to their channels. */
    alarmDelivery: DeliveryWorker;
    /** The local fake SMTP server (demo, development, tests), when it runs. */
    fakeSmtp: FakeSmtpServer;
  }
}

/** The alarm service, or an UnavailableError when the server runs without the alarms attachment. */
export function alarmsOf(ctx: AppContext): AlarmService {
  const service = ctx.services.alarms;
  if (!service) throw new UnavailableError('Alarms are not running on this server');
  return service;
}
