import type { PushPayload } from '../../shared/schemas/push.js';
import type { AlarmDelivery } from '../alarms/alarm-channel.js';
import { valueRows } from '../alarms/mail-message.js';

/** Longest notification body we send (push services cap the payload near 4 kB). */
const MAX_BODY_CHARS = 600;

/** The push message for one delivery: the e-mail's facts and values, plus the acknowledge token. */
export function buildPushPayload(d: AlarmDelivery, ackToken: string): PushPayload {
  const a = d.alarm;
  const bench = d.bench?.name ?? 'no bench';
  const pack = d.pack ? [d.pack.brand, d.pack.label].filter(Boolean).join(' ') : 'no pack';
  const values = valueRows(d);
  const again = d.step > 0 ? ` (reminder ${d.step}, not yet acknowledged)` : '';
  const body = [`${a.message}${again}`, `${bench}, ${pack}`, values.map(([k, v]) => `${k} ${v}`).join(' · ')].join('\n').slice(0, MAX_BODY_CHARS);
  return {
    alarmId: a.id, step: d.step, kind: a.kind, priority: a.priority,
    title: `${a.priority.toUpperCase()} ${a.kind}: ${bench}`,
    body, bench, pack, run: `${d.run.name} (#${d.run.id})`, values,
    runUrl: d.runUrl, ackUrl: d.ackUrl, ackApiUrl: pushAckApiUrl(d.runUrl), ackToken,
  };
}

/** The token acknowledge route on the same origin as the run link. */
export function pushAckApiUrl(runUrl: string): string {
  return new URL('/api/push/acknowledge', runUrl).toString();
}
