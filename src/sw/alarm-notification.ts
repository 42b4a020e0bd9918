import type { PushPayload } from '../../shared/schemas/push';

/** What a notification carries to its click handler. */
export interface AlarmNotificationData {
  alarmId: number;
  /** The escalation step of the push shown (0 = the first notice). */
  step: number;
  runUrl: string;
  ackApiUrl: string;
  ackToken: string;
  /** Set on the notice that replaced it after Acknowledge worked. */
  acknowledged?: true;
}

/** What a notification already on screen for the same alarm says (read from its data). */
export interface ShownAlarmNotice {
  step: number;
  acknowledged: boolean;
}

/** A notification to show: its title and options (the Notification API's own shape). */
export interface AlarmNotification {
  title: string;
  options: {
    body: string;
    tag: string;
    /** Alert again although it replaces a notification with the same tag. */
    renotify: boolean;
    requireInteraction: boolean;
    data: AlarmNotificationData | null;
    actions: { action: string; title: string }[];
  };
}

/** The notification's action that acknowledges the alarm. */
export const ACK_ACTION = 'acknowledge';
/** The notification's action that opens the run. */
export const OPEN_ACTION = 'open';

const str = (v: unknown): v is string => typeof v === 'string';

/** Reads a push message's JSON (as the server's push channel writes it); null when it is not one. */
export function parseAlarmPush(text: string): PushPayload | null {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return null;
  }
  const p = json as Partial<PushPayload> | null;
  if (!p || typeof p.alarmId !== 'number' || typeof p.step !== 'number' || ![p.title, p.body, p.runUrl, p.ackApiUrl, p.ackToken, p.priority].every(str)) return null;
  return p as PushPayload;
}

/** The tag of an alarm's notifications: one on screen per alarm, a later one replaces it. */
export const alarmTag = (alarmId: number) => `alarm-${alarmId}`;

/** What the notifications on screen for an alarm say, from their data (anything else is ignored). */
export function shownNotices(notifications: readonly { data?: unknown }[]): ShownAlarmNotice[] {
  return notifications.flatMap((n) => {
    const d = n.data as Partial<AlarmNotificationData> | null | undefined;
    return d && typeof d.step === 'number' ? [{ step: d.step, acknowledged: d.acknowledged === true }] : [];
  });
}

/** The quiet notice that replaces an alarm's notification once Acknowledge worked. */
function acknowledgedNotice(data: AlarmNotificationData): AlarmNotification {
  return {
    title: 'Alarm acknowledged',
    options: { body: 'Recorded on the run with your name.', tag: alarmTag(data.alarmId), renotify: false, requireInteraction: false, data: { ...data, acknowledged: true }, actions: [] },
  };
}

/**
 * The notification for an alarm push: one per alarm (a reminder replaces the first notice),
 * staying on screen until handled when critical, with Acknowledge and Open actions. A push
 * that cannot be read still shows a notice, since the browser requires one for every push.
 * The server sends at least once, so the same step can arrive twice: given what is already
 * on screen for the alarm, a repeat replaces it without alerting again, a reminder (a later
 * step) alerts, and an alarm acknowledged here keeps its "acknowledged" notice.
 */
export function alarmNotification(text: string, shown: readonly ShownAlarmNotice[] = []): AlarmNotification {
  const p = parseAlarmPush(text);
  if (!p) {
    return { title: 'Kneepoint alarm', options: { body: 'An alarm was raised: open Kneepoint to see it.', tag: 'alarm-unknown', renotify: false, requireInteraction: true, data: null, actions: [] } };
  }
  const data: AlarmNotificationData = { alarmId: p.alarmId, step: p.step, runUrl: p.runUrl, ackApiUrl: p.ackApiUrl, ackToken: p.ackToken };
  if (shown.some((n) => n.acknowledged)) return acknowledgedNotice(data);
  const highestShown = Math.max(-1, ...shown.map((n) => n.step));
  return {
    title: p.title,
    options: {
      body: p.body,
      tag: alarmTag(p.alarmId),
      renotify: shown.length > 0 && p.step > highestShown,
      requireInteraction: p.priority === 'critical',
      data,
      actions: [{ action: ACK_ACTION, title: 'Acknowledge' }, { action: OPEN_ACTION, title: 'Open the run' }],
    },
  };
}

/** What the click handler may do (the service worker's fetch, clients.openWindow, showNotification). */
export interface ClickDeps {
  fetch: (url: string, init: { method: string; headers: Record<string, string>; body: string; credentials: 'omit' }) => Promise<{ ok: boolean; status: number }>;
  openWindow: (url: string) => Promise<unknown>;
  notify: (n: AlarmNotification) => Promise<void>;
}

/**
 * Handles a click on an alarm notification. Acknowledge POSTs the notification's signed token
 * (no cookie, no CSRF token: the token alone authorises it) and says whether it worked; on a
 * failure it opens the run so the person can acknowledge there. A click anywhere else opens the run.
 */
export async function onAlarmNotificationClick(action: string, data: AlarmNotificationData | null, deps: ClickDeps): Promise<void> {
  if (!data) {
    await deps.openWindow('/');
    return;
  }
  if (action !== ACK_ACTION || data.acknowledged) {
    await deps.openWindow(data.runUrl);
    return;
  }
  let status = 0;
  try {
    const res = await deps.fetch(data.ackApiUrl, {
      method: 'POST', headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ alarmId: data.alarmId, token: data.ackToken }), credentials: 'omit',
    });
    if (res.ok) {
      await deps.notify(acknowledgedNotice(data));
      return;
    }
    status = res.status;
  } catch {
    status = 0;
  }
  await deps.notify({
    title: 'Not acknowledged',
    options: { body: status ? `The server refused (${status}): acknowledge on the run page.` : 'Kneepoint could not be reached: acknowledge on the run page.', tag: alarmTag(data.alarmId), renotify: false, requireInteraction: true, data, actions: [] },
  });
  await deps.openWindow(data.runUrl);
}
