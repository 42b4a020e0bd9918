import { createHash } from 'node:crypto';
import type { Server } from 'node:http';
import type { Agent } from 'node:https';
import type { AppContext } from '../app-context.js';
import { DEFAULT_ALARM_DELIVERY } from '../alarms/alarm-system.js';
import { pushChannel } from './push-channel.js';
import './push-services.js';
import { PushSendLog } from './push-send-log.js';
import { PushSubscriptionRepo } from './push-subscription-repo.js';
import { loadOrCreateVapidKeys } from './vapid-keys.js';
import { createLogger } from '../log/logger.js';

/** Options for the push attachment. */
export interface PushAttachmentOptions {
  /** HTTPS agent for reaching push services (tests pass one trusting their local push service). */
  agent?: Agent;
}

/**
 * Server attachment for Web Push: loads (or makes, on first start) the VAPID keys under the
 * data directory and registers the push channel with the alarms' channel registry, so the
 * delivery queue sends to it. Runs after attachAlarms.
 */
export function pushAttachment(options: PushAttachmentOptions = {}) {
  return (httpServer: Server, ctx: AppContext) => attachPushWith(options, ctx);
}

/** The push attachment as the server runs it (the push services' own certificates, the system's CAs). */
export const attachPush = pushAttachment();

function attachPushWith(options: PushAttachmentOptions, ctx: AppContext): Promise<() => Promise<void>> {
  const channels = ctx.services.alarmChannels;
  if (!channels) {
    ctx.log.warn('Web Push: alarms are not running, so no push notice goes out');
    return Promise.resolve(async () => {});
  }
  const vapid = loadOrCreateVapidKeys(ctx.config.dataDir);
  // A key of its own for acknowledge tokens, derived so that nothing else needs storing.
  const ackSecret = createHash('sha256').update(`kneepoint push acknowledge\0${vapid.privateKey}`).digest('base64url');
  const cfg = ctx.config.alarms ?? DEFAULT_ALARM_DELIVERY;
  const off = channels.register(pushChannel({
    repo: new PushSubscriptionRepo(ctx.sequelize), sends: new PushSendLog(ctx.sequelize), vapid, ackSecret,
    subject: `mailto:${cfg.mailFrom}`,
    log: createLogger('push', ctx.log), agent: options.agent,
  }));
  ctx.services.push = { vapid, ackSecret };
  return Promise.resolve(async () => {
    off();
    delete ctx.services.push;
  });
}
