import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { AppContext } from '../app-context.js';
import { alarmSink } from '../alarms/alarm-sink.js';
import { createAlarmSystem, DEFAULT_ALARM_DELIVERY } from '../alarms/alarm-system.js';
import '../alarms/alarms-services.js';
import { createOutboundMail } from '../mail/outbound-mail.js';
import '../mail/mail-services.js';
import type { MailWorker } from '../mail/mail-worker.js';
import '../runs/runs-services.js';
import { getLabSettings } from '../settings/settings-service.js';
import { createLogger } from '../log/logger.js';

export { DEFAULT_ALARM_DELIVERY };

function serverUrl(httpServer: Server, host: string): string {
  const address = httpServer.address() as AddressInfo | null;
  const h = host.includes(':') ? `[${host}]` : host;
  return `http://${h}:${address?.port ?? 0}`;
}

/** Options for the alarms attachment. */
export interface AlarmsAttachmentOptions {
  /** The clock of the alarm service and the delivery worker (tests move it on to make escalations due). */
  nowMs?: () => number;
}

/** The alarms attachment with options (tests pass a clock); the server runs `attachAlarms`. */
export function alarmsAttachment(options: AlarmsAttachmentOptions = {}) {
  return (httpServer: Server, ctx: AppContext) => attachAlarmsWith(options, httpServer, ctx);
}

/** The alarms attachment as the server runs it (the system clock). */
export const attachAlarms = alarmsAttachment();

/**
 * The composition root of alarms: builds the alarms area, connects it as a sink of the run
 * recorder (readings, events, run changes) and hands acknowledgements back to the recorder,
 * and builds outbound mail (share links) on the alarms' SMTP transport and retry policy.
 * Neither area imports the recorder or the other. Runs after the recording attachment,
 * whose recorder it listens to.
 */
async function attachAlarmsWith(options: AlarmsAttachmentOptions, httpServer: Server, ctx: AppContext): Promise<() => Promise<void>> {
  const { nowMs } = options;
  const cfg = ctx.config.alarms ?? DEFAULT_ALARM_DELIVERY;
  const log = createLogger('alarms', ctx.log);
  const publicUrl = () => cfg.publicUrl ?? serverUrl(httpServer, ctx.config.host);
  const alarms = await createAlarmSystem({
    sequelize: ctx.sequelize, config: cfg, production: ctx.config.mode === 'production', log, nowMs, publicUrl,
    labSettings: () => getLabSettings(ctx.models),
    recordRunEvent: async (runId, event, userId) => {
      const recorder = ctx.services.runRecorder;
      if (recorder) await recorder.addStoredEvent(runId, event, userId);
      else log.warn(`alarm acknowledged on run ${runId}, but live recording is not running here to note it`);
    },
  });
  if (alarms.fake) ctx.services.fakeSmtp = alarms.fake;

  let mailWorker: MailWorker | undefined;
  if (alarms.smtp) {
    // Outbound mail that is not an alarm (share links) takes the same transport and retry policy.
    const outbound = createOutboundMail({
      sequelize: ctx.sequelize, transport: alarms.smtp, from: cfg.mailFrom, serverSecret: ctx.config.sessionSecret,
      policy: { firstMs: cfg.retryFirstMs, maxMs: cfg.retryMaxMs, maxAttempts: cfg.maxAttempts },
      publicUrl, nowMs, log: createLogger('mail', ctx.log),
    });
    mailWorker = outbound.worker;
    ctx.services.outboundMail = outbound.mail;
  } else ctx.log.warn('Alarms: KNEEPOINT_SMTP_URL is not set, so no alarm e-mail (and no share link by e-mail) goes out');

  const offs: (() => void)[] = [];
  const recorder = ctx.services.runRecorder;
  if (recorder) {
    const sink = alarmSink(alarms.service, (runId) => {
      const session = recorder.session(runId);
      return session ? { kind: session.run.kind, config: session.pipeline.config } : null;
    });
    for (const listener of sink.readingListeners) offs.push(recorder.readings.add(listener));
    for (const listener of sink.eventListeners) offs.push(recorder.events.add((runId, e) => listener(runId, e.event)));
    for (const listener of sink.runChangeListeners) offs.push(recorder.runChanges.add(listener));
  } else ctx.log.warn('Alarms: no run recorder, so no alarm is raised');
  ctx.services.alarms = alarms.service;
  ctx.services.alarmChannels = alarms.channels;
  ctx.services.alarmDelivery = alarms.worker;
  alarms.start();
  mailWorker?.start();
  return async () => {
    for (const off of offs) off();
    await alarms.stop();
    await mailWorker?.stop();
    delete ctx.services.outboundMail;
    await alarms.closeSmtp();
    delete ctx.services.alarms;
    delete ctx.services.alarmChannels;
    delete ctx.services.alarmDelivery;
    delete ctx.services.fakeSmtp;
  };
}
