import type { Transporter } from 'nodemailer';
import type { Sequelize } from 'sequelize';
import type { Logger } from '../log/logger.js';
import type { RetryPolicy } from '../queue/retry-policy.js';
import { MailQueue } from './mail-queue.js';
import type { OutboundMail } from './mail-services.js';
import { MailWorker } from './mail-worker.js';
import { sealingKey, sealSecret } from './sealed-secret.js';

/** What outbound mail needs from the composition root. */
export interface OutboundMailDeps {
  sequelize: Sequelize;
  /** The SMTP transport it sends by (the alarms' one). */
  transport: Pick<Transporter, 'sendMail'>;
  from: string;
  policy: RetryPolicy;
  /** The server's session secret, from which the key that seals share tokens is derived. */
  serverSecret: string;
  publicUrl: () => string;
  nowMs?: () => number;
  log: Logger;
}

/** Builds the outbound mail queue, its worker and the service routes use; the root starts and stops the worker. */
export function createOutboundMail(deps: OutboundMailDeps): { mail: OutboundMail; worker: MailWorker } {
  const queue = new MailQueue(deps.sequelize, deps.policy);
  const secretKey = sealingKey(deps.serverSecret);
  const worker = new MailWorker({ queue, transport: deps.transport, from: deps.from, secretKey, nowMs: deps.nowMs, log: deps.log });
  const mail: OutboundMail = {
    queue, from: deps.from, publicUrl: deps.publicUrl,
    seal: (secret) => sealSecret(secretKey, secret),
    send: async (message, limit) => {
      const id = await queue.enqueue(message, new Date((deps.nowMs ?? Date.now)()), limit);
      if (id !== null) worker.kick();
      return id;
    },
  };
  return { mail, worker };
}
