import type { PushPayload } from '../../shared/schemas/push';

/** What a notification carries to its click handler. */
export interface AlarmNotificationData {
  alarmId: number;
  runUrl: string;
  ackApiUrl: string;
  ackToken: string;
}

/** A notification to show: its title and options (the Notification API's own shape). */
export interface AlarmNotification {
  title: string;
  options: {
    body: string;
    tag: string;
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
  if (!p || typeof p.alarmId !== 'number' || ![p.title, p.body, p.runUrl, p.ackApiUrl, p.ackToken, p.priority].every(str)) return null;
  return p as PushPayload;
}

/**
 * The notification for an alarm push: one per alarm (a reminder replaces the first notice),
 * staying on screen until handled when critical, with Acknowledge and Open actions. A push
 * that cannot be read still shows a notice, since the browser requires one for every push.
 */
export function alarmNotification(text: string): AlarmNotification {
  const p = parseAlarmPush(text);
  if (!p) {
    return { title: 'Kneepoint alarm', options: { body: 'An alarm was raised: open Kneepoint to see it.', tag: 'alarm-unknown', requireInteraction: true, data: null, actions: [] } };
  }
  return {
    title: p.title,
    options: {
      body: p.body,
      tag: `alarm-${p.alarmId}`,
      requireInteraction: p.priority === 'critical',
      data: { alarmId: p.alarmId, runUrl: p.runUrl, ackApiUrl: p.ackApiUrl, ackToken: p.ackToken },
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
  if (action !== ACK_ACTION) {
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
      await deps.notify({ title: 'Alarm acknowledged', options: { body: 'Recorded on the run with your name.', tag: `alarm-${data.alarmId}`, requireInteraction: false, data: null, actions: [] } });
      return;
    }
    status = res.status;
  } catch {
    status = 0;
  }
  await deps.notify({
    title: 'Not acknowledged',
    options: { body: status ? `The server refused (${status}): acknowledge on the run page.` : 'Kneepoint could not be reached: acknowledge on the run page.', tag: `alarm-${data.alarmId}`, requireInteraction: true, data, actions: [] },
  });
  await deps.openWindow(data.runUrl);
}
