/**
 * The alarm service worker (built to /alarm-sw.js): shows each alarm push as a notification
 * even with no Kneepoint tab open, and handles its Acknowledge and Open actions.
 * The DOM typings do not describe a worker's global, so the few parts used are typed here.
 */
import {
  alarmNotification, alarmTag, onAlarmNotificationClick, parseAlarmPush, shownNotices, type AlarmNotification, type AlarmNotificationData,
} from './alarm-notification';

interface ExtendableEvent { waitUntil(p: Promise<unknown>): void }
interface PushEventLike extends ExtendableEvent { data: { text(): string } | null }
interface NotificationClickLike extends ExtendableEvent { action: string; notification: { data: AlarmNotificationData | null; close(): void } }
interface WorkerGlobal {
  addEventListener(type: 'push', fn: (e: PushEventLike) => void): void;
  addEventListener(type: 'notificationclick', fn: (e: NotificationClickLike) => void): void;
  addEventListener(type: 'install' | 'activate', fn: (e: ExtendableEvent) => void): void;
  skipWaiting(): Promise<void>;
  registration: {
    showNotification(title: string, options: AlarmNotification['options']): Promise<void>;
    getNotifications(filter: { tag: string }): Promise<{ data?: unknown }[]>;
  };
  clients: { claim(): Promise<void>; openWindow(url: string): Promise<unknown> };
}

const sw = self as unknown as WorkerGlobal;
const show = (n: AlarmNotification) => sw.registration.showNotification(n.title, n.options);

sw.addEventListener('install', (e) => e.waitUntil(sw.skipWaiting()));
sw.addEventListener('activate', (e) => e.waitUntil(sw.clients.claim()));
/** Shows a push, knowing what is already on screen for its alarm (so a repeat does not alert twice). */
async function onPush(text: string): Promise<void> {
  const p = parseAlarmPush(text);
  const shown = p ? shownNotices(await sw.registration.getNotifications({ tag: alarmTag(p.alarmId) })) : [];
  await show(alarmNotification(text, shown));
}

sw.addEventListener('push', (e) => e.waitUntil(onPush(e.data?.text() ?? '')));
sw.addEventListener('notificationclick', (e) => {
  e.notification.close();
  e.waitUntil(onAlarmNotificationClick(e.action, e.notification.data, {
    fetch: (url, init) => fetch(url, init),
    openWindow: (url) => sw.clients.openWindow(url),
    notify: show,
  }));
});
