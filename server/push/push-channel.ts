import type { Agent } from 'node:https';
import webpush, { WebPushError } from 'web-push';
import type { AlarmChannel } from '../alarms/alarm-channel.js';
import { ACK_TOKEN_LIFETIME_MS, makeAckToken } from './ack-token.js';
import { buildPushPayload } from './push-payload.js';
import type { PushSendLog } from './push-send-log.js';
import type { PushSubscriptionRepo, StoredPushSubscription } from './push-subscription-repo.js';
import type { VapidKeys } from './vapid-keys.js';
import type { Logger } from '../log/logger.js';

/** How long the push service keeps an undelivered message for an offline browser (seconds). */
const PUSH_TTL_SECONDS = 6 * 60 * 60;
/** How long one POST to a push service may take before it counts as failed (the queue retries). */
const PUSH_TIMEOUT_MS = 10_000;
/**
 * The Topic of one alarm's step (RFC 8030 §5.4: at most 32 base64url characters): a push
 * service that still holds a message with the same topic for an offline browser replaces it.
 */
export function pushTopic(alarmId: number, step: number): string {
  return `a${alarmId}s${step}`;
}

/** Push-service answers meaning the subscription is gone for good (RFC 8030 §7.3). */
const GONE_STATUSES = new Set([404, 410]);

/** What the push channel needs. */
export interface PushChannelDeps {
  repo: Pick<PushSubscriptionRepo, 'ofUser' | 'remove'>;
  /** Which browsers already have each delivery (kept in the database, so restarts do not forget). */
  sends: Pick<PushSendLog, 'reached' | 'add'>;
  vapid: VapidKeys;
  /** VAPID subject: a mailto: or https: contact for the push service's operator. */
  subject: string;
  /** Secret the acknowledge tokens are signed with. */
  ackSecret: string;
  nowMs?: () => number;
  log: Logger;
  /** HTTPS agent for the push services (tests trust their local push service's certificate with it). */
  agent?: Agent;
}

/**
 * The Web Push channel: encrypts the alarm (aes128gcm, RFC 8291) for every browser the person
 * registered and POSTs it to each push service with VAPID (RFC 8292), all browsers at once.
 * A 404/410 removes that subscription; any other failure throws so the queue retries. Each
 * browser the push service accepted is noted in the database at once, so a retry (by this
 * server or, after a restart, by another) skips it. What stays at least once: a server that
 * dies between the push service's 201 and that note sends to that browser again; the same
 * Topic (a waiting copy is replaced) and notification tag (a shown one is replaced quietly)
 * keep the repeat from adding a second notice.
 */
export function pushChannel(deps: PushChannelDeps): AlarmChannel {
  const now = deps.nowMs ?? Date.now;
  return {
    name: 'push',
    deliver: async (d) => {
      const [subs, done] = await Promise.all([deps.repo.ofUser(d.user.id), deps.sends.reached(d.deliveryId)]);
      const token = makeAckToken(deps.ackSecret, { alarmId: d.alarm.id, userId: d.user.id, expiresAtMs: now() + ACK_TOKEN_LIFETIME_MS });
      const payload = JSON.stringify(buildPushPayload(d, token));
      const failures: string[] = [];
      await Promise.all(subs.filter((s) => !done.has(s.id)).map(async (sub) => {
        const error = await sendOne(sub, payload, d.alarm.priority === 'critical', pushTopic(d.alarm.id, d.step));
        if (error === null) await deps.sends.add(d.deliveryId, sub.id, new Date(now()));
        else if (error === 'gone') {
          await deps.repo.remove(sub.id);
          deps.log.warn(`the push service no longer knows subscription ${sub.id} of user ${sub.userId}; removed`);
        } else failures.push(error);
      }));
      if (failures.length > 0) throw new Error(`push: ${failures.length} of ${subs.length} browsers not reached: ${failures[0]}`);
    },
  };

  async function sendOne(sub: StoredPushSubscription, payload: string, urgent: boolean, topic: string): Promise<string | 'gone' | null> {
    try {
      await webpush.sendNotification({ endpoint: sub.endpoint, keys: sub.keys }, payload, {
        vapidDetails: { subject: deps.subject, publicKey: deps.vapid.publicKey, privateKey: deps.vapid.privateKey },
        TTL: PUSH_TTL_SECONDS, contentEncoding: 'aes128gcm', urgency: urgent ? 'high' : 'normal', topic, timeout: PUSH_TIMEOUT_MS,
        ...(deps.agent ? { agent: deps.agent } : {}),
      });
      return null;
    } catch (err) {
      if (err instanceof WebPushError && GONE_STATUSES.has(err.statusCode)) return 'gone';
      if (err instanceof WebPushError) return `status ${err.statusCode} ${err.body.slice(0, 200)}`;
      return err instanceof Error ? err.message : String(err);
    }
  }
}
