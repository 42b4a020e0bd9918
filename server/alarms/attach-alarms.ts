import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { AppContext } from '../app-context.js';
import type { AlarmDeliveryConfig } from '../config/config.js';
import { getLabSettings } from '../settings/settings-service.js';
import { AlarmChannels, inAppChannel } from './alarm-channel.js';
import { AlarmRepo } from './alarm-repo.js';
import { AlarmService } from './alarm-service.js';
import './alarms-services.js';
import { DeliveryQueue } from './delivery-queue.js';
import { DeliveryWorker } from './delivery-worker.js';
import { createSmtpTransport, emailChannel } from './email-channel.js';
import { FakeSmtpServer } from './fake-smtp.js';
import { RunEndEstimates } from './run-end-estimates.js';
import { MailQueue } from '../mail/mail-queue.js';
import '../mail/mail-services.js';
import { MailWorker } from '../mail/mail-worker.js';
import { sealingKey, sealSecret } from '../mail/sealed-secret.js';
import { createLogger } from '../log/logger.js';

/** Alarm delivery when the config names none (a config built by hand, as tests do). */
export const DEFAULT_ALARM_DELIVERY: AlarmDeliveryConfig = {
  smtpUrl: null, smtpRequireTls: false, mailFrom: 'alarms@kneepoint.invalid', publicUrl: null,
  fakeSmtpPort: 0, retryFirstMs: 5000, retryMaxMs: 300_000, maxAttempts: 60,
};

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
 * Server attachment for alarms: the delivery queue and its worker, the channels (in-app,
 * e-mail over SMTP or, outside production without KNEEPOINT_SMTP_URL, the local fake SMTP
 * server whose mail lands in the outbox), and the alarm service as a sink of the run
 * recorder. Runs after the live attachment, whose recorder it listens to.
 */
async function attachAlarmsWith(options: AlarmsAttachmentOptions, httpServer: Server, ctx: AppContext): Promise<() => Promise<void>> {
  const { nowMs } = options;
  const cfg = ctx.config.alarms ?? DEFAULT_ALARM_DELIVERY;
  const log = createLogger('alarms', ctx.log);
  const repo = new AlarmRepo(ctx.sequelize);
  const queue = new DeliveryQueue(ctx.sequelize, { firstMs: cfg.retryFirstMs, maxMs: cfg.retryMaxMs, maxAttempts: cfg.maxAttempts });
  const channels = new AlarmChannels();
  channels.register(inAppChannel);
  let smtpUrl = cfg.smtpUrl;
  let fake: FakeSmtpServer | undefined;
  if (!smtpUrl && ctx.config.mode !== 'production') {
    fake = new FakeSmtpServer({ port: cfg.fakeSmtpPort, onMail: (m) => repo.addOutbox(m), log });
    await fake.start();
    smtpUrl = fake.url;
    ctx.services.fakeSmtp = fake;
    ctx.log.info(`Alarm mail goes to the local fake SMTP server at ${fake.url} (read it under Alarms, Outbox)`);
  }
  const publicUrl = () => cfg.publicUrl ?? serverUrl(httpServer, ctx.config.host);
  let mailWorker: MailWorker | undefined;
  if (smtpUrl) {
    const transport = createSmtpTransport({ url: smtpUrl, requireTls: cfg.smtpRequireTls, from: cfg.mailFrom });
    channels.register(emailChannel(transport, cfg.mailFrom));
    // Outbound mail that is not an alarm (share links) takes the same transport and retry policy.
    const mailQueue = new MailQueue(ctx.sequelize, { firstMs: cfg.retryFirstMs, maxMs: cfg.retryMaxMs, maxAttempts: cfg.maxAttempts });
    const secretKey = sealingKey(ctx.config.sessionSecret);
    const worker = new MailWorker({ queue: mailQueue, transport, from: cfg.mailFrom, secretKey, nowMs, log: createLogger('mail', ctx.log) });
    mailWorker = worker;
    ctx.services.outboundMail = {
      queue: mailQueue, from: cfg.mailFrom, publicUrl,
      seal: (secret) => sealSecret(secretKey, secret),
      send: async (mail, limit) => {
        const id = await mailQueue.enqueue(mail, new Date((nowMs ?? Date.now)()), limit);
        if (id !== null) worker.kick();
        return id;
      },
    };
  } else ctx.log.warn('Alarms: KNEEPOINT_SMTP_URL is not set, so no alarm e-mail (and no share link by e-mail) goes out');

  const worker = new DeliveryWorker({
    queue, repo, channels, log, nowMs,
    labSettings: () => getLabSettings(ctx.models),
    publicUrl,
  });
  const service = new AlarmService({
    repo, queue, channels, log, nowMs, kick: () => worker.kick(),
    recordRunEvent: async (runId, event, userId) => {
      const recorder = ctx.services.runRecorder;
      if (recorder) await recorder.addStoredEvent(runId, event, userId);
      else log.warn(`alarm acknowledged on run ${runId}, but live recording is not running here to note it`);
    },
  });
  const offs: (() => void)[] = [];
  const recorder = ctx.services.runRecorder;
  if (recorder) {
    // The near-end alarm fires on the time to the end voltage the live page shows: the
    // estimate is fed first, then the alarm service reads it for the same reading.
    const estimates = new RunEndEstimates((runId) => {
      const session = recorder.session(runId);
      return session ? { kind: session.run.kind, config: session.pipeline.config } : null;
    });
    service.setEndEstimator((runId) => estimates.minutesToEnd(runId));
    offs.push(recorder.readings.add((runId, reading) => estimates.onReading(runId, reading)));
    offs.push(recorder.runChanges.add((run) => {
      if (run.state === 'finished' || run.state === 'aborted') estimates.forget(run.id);
    }));
    offs.push(recorder.readings.add((runId, reading) => service.onReading(runId, reading)));
    offs.push(recorder.events.add((runId, e) => service.onRunEvent(runId, e.event)));
    offs.push(recorder.runChanges.add((run) => service.onRunChange(run)));
  } else ctx.log.warn('Alarms: no run recorder, so no alarm is raised');
  ctx.services.alarms = service;
  ctx.services.alarmChannels = channels;
  ctx.services.alarmDelivery = worker;
  service.start();
  worker.start();
  mailWorker?.start();
  return async () => {
    for (const off of offs) off();
    await service.stop();
    await worker.stop();
    await mailWorker?.stop();
    delete ctx.services.outboundMail;
    await fake?.stop();
    delete ctx.services.alarms;
    delete ctx.services.alarmChannels;
    delete ctx.services.alarmDelivery;
    delete ctx.services.fakeSmtp;
  };
}
