import type { Transporter } from 'nodemailer';
import type { Sequelize } from 'sequelize';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import type { AlarmDeliveryConfig } from '../config/config.js';
import type { Logger } from '../log/logger.js';
import { AlarmChannels, inAppChannel } from './alarm-channel.js';
import { AlarmRepo } from './alarm-repo.js';
import { AlarmService, type AlarmServiceDeps } from './alarm-service.js';
import { DeliveryQueue } from './delivery-queue.js';
import { DeliveryWorker } from './delivery-worker.js';
import { createSmtpTransport, emailChannel } from './email-channel.js';
import { FakeSmtpServer } from './fake-smtp.js';

/** Alarm delivery when the config names none (a config built by hand, as tests do). */
export const DEFAULT_ALARM_DELIVERY: AlarmDeliveryConfig = {
  smtpUrl: null, smtpRequireTls: false, mailFrom: 'alarms@kneepoint.invalid', publicUrl: null,
  fakeSmtpPort: 0, retryFirstMs: 5000, retryMaxMs: 300_000, maxAttempts: 60,
};

/** What the alarms area needs from the composition root. */
export interface AlarmSystemDeps {
  sequelize: Sequelize;
  config: AlarmDeliveryConfig;
  /** Without an SMTP URL, a server outside production starts the local fake SMTP server. */
  production: boolean;
  log: Logger;
  /** The clock of the alarm service and the delivery worker (tests move it on to make escalations due). */
  nowMs?: () => number;
  /** The lab's name and units for messages. */
  labSettings: () => Promise<LabSettings>;
  /** Base of links, e.g. https://lab.example (no trailing slash). */
  publicUrl: () => string;
  /** Notes an acknowledgement on the run's timeline (the root hands it to the recorder). */
  recordRunEvent: AlarmServiceDeps['recordRunEvent'];
}

/** The alarms area, built: the service, its channels and delivery worker, and the SMTP they send through. */
export interface AlarmSystem {
  service: AlarmService;
  channels: AlarmChannels;
  worker: DeliveryWorker;
  /** The local fake SMTP server, when it runs. */
  fake: FakeSmtpServer | undefined;
  /** The SMTP transport alarm mail goes out by (null: no e-mail on this server); other mail may share it. */
  smtp: Transporter | null;
  /** Starts the service's timers and the delivery worker. */
  start(): void;
  /** Stops the service and the worker, waiting for sends under way (the fake SMTP server stays up: see closeSmtp). */
  stop(): Promise<void>;
  /** Stops the fake SMTP server, once nothing sends to it any more. */
  closeSmtp(): Promise<void>;
}

/**
 * Builds the alarms area: the delivery queue and its worker, the channels (in-app, e-mail
 * over SMTP or, outside production without an SMTP URL, the local fake SMTP server whose
 * mail lands in the outbox) and the alarm service. It is fed by the composition root
 * (server/compose/alarms-root.ts), which also connects it to the run recorder.
 */
export async function createAlarmSystem(deps: AlarmSystemDeps): Promise<AlarmSystem> {
  const { config: cfg, log, nowMs } = deps;
  const repo = new AlarmRepo(deps.sequelize);
  const queue = new DeliveryQueue(deps.sequelize, { firstMs: cfg.retryFirstMs, maxMs: cfg.retryMaxMs, maxAttempts: cfg.maxAttempts });
  const channels = new AlarmChannels();
  channels.register(inAppChannel);
  let smtpUrl = cfg.smtpUrl;
  let fake: FakeSmtpServer | undefined;
  if (!smtpUrl && !deps.production) {
    fake = new FakeSmtpServer({ port: cfg.fakeSmtpPort, onMail: (m) => repo.addOutbox(m), log });
    await fake.start();
    smtpUrl = fake.url;
    log.info(`Alarm mail goes to the local fake SMTP server at ${fake.url} (read it under Alarms, Outbox)`);
  }
  let smtp: Transporter | null = null;
  if (smtpUrl) {
    smtp = createSmtpTransport({ url: smtpUrl, requireTls: cfg.smtpRequireTls, from: cfg.mailFrom });
    channels.register(emailChannel(smtp, cfg.mailFrom));
  }
  const worker = new DeliveryWorker({ queue, repo, channels, log, nowMs, labSettings: deps.labSettings, publicUrl: deps.publicUrl });
  const service = new AlarmService({ repo, queue, channels, log, nowMs, kick: () => worker.kick(), recordRunEvent: deps.recordRunEvent });
  return {
    service, channels, worker, fake, smtp,
    start() {
      service.start();
      worker.start();
    },
    async stop() {
      await service.stop();
      await worker.stop();
    },
    async closeSmtp() {
      await fake?.stop();
    },
  };
}
