import { z } from 'zod';
import { api } from '../../../lib/api-client';

/** The alarm service worker's URL (built by vite.config.ts at the site's root). */
export const ALARM_SW_URL = '/alarm-sw.js';

/** Whether this browser can get alarm pushes, and if not, why. */
export type PushSupport = 'ready' | 'insecure' | 'unsupported' | 'denied';

/** The parts of the browser this module uses (passed in so tests can describe any browser). */
export interface PushBrowser {
  isSecureContext: boolean;
  serviceWorker: ServiceWorkerContainer | undefined;
  hasPushManager: boolean;
  notificationPermission: NotificationPermission | undefined;
  requestPermission: () => Promise<NotificationPermission>;
}

/** The real browser. */
export function thisBrowser(): PushBrowser {
  const hasNotification = typeof Notification !== 'undefined';
  return {
    isSecureContext: window.isSecureContext,
    serviceWorker: 'serviceWorker' in navigator ? navigator.serviceWorker : undefined,
    hasPushManager: 'PushManager' in window,
    notificationPermission: hasNotification ? Notification.permission : undefined,
    requestPermission: () => (hasNotification ? Notification.requestPermission() : Promise.resolve('denied')),
  };
}

/** Push needs a secure context (https, or loopback), a service worker, the Push API and permission. */
export function pushSupport(b: PushBrowser): PushSupport {
  if (!b.isSecureContext) return 'insecure';
  if (!b.serviceWorker || !b.hasPushManager || b.notificationPermission === undefined) return 'unsupported';
  if (b.notificationPermission === 'denied') return 'denied';
  return 'ready';
}

/** What to tell the person for each state that stops push. */
export const PUSH_SUPPORT_MESSAGE: Record<Exclude<PushSupport, 'ready'>, string> = {
  insecure: 'This page is not served over https, and browsers allow push only on secure pages. Ask your admin to serve Kneepoint behind a TLS reverse proxy (see the README), then open it by its https address.',
  unsupported: 'This browser cannot receive push notifications (no service worker or Push API). E-mail still reaches you.',
  denied: 'Notifications are blocked for this site in the browser\'s settings. Allow them there, then try again.',
};

const KeySchema = z.object({ publicKey: z.string() });
/** How long the browser's push service may take to hand out a subscription before we say it did not answer. */
export const SUBSCRIBE_TIMEOUT_MS = 20_000;

/** Rejects with `message` when `work` has not settled within `ms`. */
function within<T>(work: Promise<T>, ms: number, message: string): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(message)), ms);
    work.then((v) => (clearTimeout(timer), resolve(v)), (e: unknown) => (clearTimeout(timer), reject(e instanceof Error ? e : new Error(String(e)))));
  });
}

function keyBytes(base64url: string): Uint8Array<ArrayBuffer> {
  const b64 = base64url.replace(/-/g, '+').replace(/_/g, '/');
  const raw = atob(b64 + '='.repeat((4 - (b64.length % 4)) % 4));
  const out = new Uint8Array(new ArrayBuffer(raw.length));
  for (let i = 0; i < raw.length; i++) out[i] = raw.charCodeAt(i);
  return out;
}

/** This browser's current push subscription, if it has one. */
export async function currentPushSubscription(b: PushBrowser): Promise<PushSubscription | null> {
  if (pushSupport(b) !== 'ready') return null;
  const reg = await b.serviceWorker!.getRegistration(ALARM_SW_URL);
  return (await reg?.pushManager.getSubscription()) ?? null;
}

/**
 * Asks permission, registers the alarm service worker, subscribes with the server's VAPID key
 * and stores the subscription on the server for the signed-in user. Resolves to the state:
 * 'ready' when subscribed, else why not.
 */
export async function subscribeThisBrowser(b: PushBrowser, timeoutMs = SUBSCRIBE_TIMEOUT_MS): Promise<PushSupport> {
  const support = pushSupport(b);
  if (support !== 'ready') return support;
  if ((await b.requestPermission()) !== 'granted') return 'denied';
  const reg = await b.serviceWorker!.register(ALARM_SW_URL, { scope: '/' });
  await b.serviceWorker!.ready;
  const { publicKey } = await api('/api/push/key', { schema: KeySchema });
  // A browser whose push service cannot be reached (no network to it, or none built in) may never answer.
  const sub = await within(
    reg.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: keyBytes(publicKey) }),
    timeoutMs,
    'This browser\'s push service did not answer, so push cannot reach it. E-mail still does.',
  );
  await api('/api/push/subscriptions', { method: 'POST', body: sub.toJSON() });
  return 'ready';
}

/** Stops push to this browser: removes it on the server and unsubscribes. */
export async function unsubscribeThisBrowser(b: PushBrowser): Promise<void> {
  const sub = await currentPushSubscription(b);
  if (!sub) return;
  await api('/api/push/subscriptions', { method: 'DELETE', body: { endpoint: sub.endpoint } });
  await sub.unsubscribe();
}
