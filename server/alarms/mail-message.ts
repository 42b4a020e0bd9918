import { z } from 'zod';
import { formatAmps, formatCharge, formatDuration, formatEnergy, formatTemperature, formatVolts } from '../../shared/units/format.js';
import type { AlarmDelivery } from './alarm-channel.js';

/** Longest subject line we write (RFC 5322 recommends lines under 78 characters; folding handles the rest). */
const MAX_SUBJECT_CHARS = 200;
/** Longest display name put in a header. */
const MAX_NAME_CHARS = 100;

/** Thrown when a recipient's address cannot be used; the queue marks the delivery failed at once. */
export class BadAddressError extends Error {}

/** An address we will put in a header: a plain e-mail address, no CR, LF or other controls, no display-name tricks. */
// eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
const AddressSchema = z.email().max(254).refine((a) => !/[\u0000-\u001f\u007f<>",;\\]/.test(a));

/** Checks an address (throws BadAddressError naming the problem). */
export function checkedAddress(address: string): string {
  if (!AddressSchema.safeParse(address).success) throw new BadAddressError(`Not a usable e-mail address: ${JSON.stringify(address.slice(0, 80))}`);
  return address;
}

/**
 * Text fit for a header: every control character (CR and LF above all, which would start a
 * new header line) becomes a space, runs of spaces shrink to one, and the length is capped.
 */
export function headerSafe(text: string, maxChars: number): string {
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is removed
  return text.replace(/[\u0000-\u001f\u007f\u2028\u2029]+/g, ' ').replace(/\s+/g, ' ').trim().slice(0, maxChars);
}

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** The message nodemailer sends (its own field names). */
export interface AlarmMail {
  from: string;
  to: { name: string; address: string };
  subject: string;
  text: string;
  html: string;
  messageId: string;
}

/** The rows of values shown in the message, in the lab's units. */
export function valueRows(d: AlarmDelivery): [string, string][] {
  const v = d.alarm.values;
  return [
    ['Voltage', formatVolts(v.volts, 3)],
    ['Current', formatAmps(v.amps, 2)],
    ['Energy out', formatEnergy(v.dischargeWh, d.units.energyUnit === 'kWh' ? 'kWh' : 'Wh')],
    ['Charge out', formatCharge(v.dischargeAh, 'Ah')],
    ['Temperature', formatTemperature(v.tempCelsius, d.units.temperatureUnit)],
    ['Run time', formatDuration(v.runSeconds)],
  ];
}

/**
 * Builds the alarm e-mail: plain text and HTML with the bench, the pack, the values at the
 * event and links to the run and to acknowledge. Names and notes go into the subject only
 * through headerSafe, and the recipient only as a checked address with a cleaned name.
 */
export function buildAlarmMail(d: AlarmDelivery, from: string): AlarmMail {
  const a = d.alarm;
  const bench = d.bench?.name ?? 'no bench';
  const pack = d.pack ? [d.pack.brand, d.pack.label].filter(Boolean).join(' ') : 'no pack';
  const again = d.step > 0 ? ` (reminder ${d.step}, not yet acknowledged)` : '';
  const subject = headerSafe(`[${d.labName}] ${a.priority.toUpperCase()} ${a.kind}: ${bench}, ${pack}${again}`, MAX_SUBJECT_CHARS);
  const rows = valueRows(d);
  const text = [
    `${a.message}${again}`,
    '',
    `Bench: ${bench}`,
    `Pack: ${pack}`,
    `Run: ${d.run.name} (#${d.run.id})`,
    ...rows.map(([k, v]) => `${k}: ${v}`),
    '',
    `Open the run: ${d.runUrl}`,
    `Acknowledge (sign in first): ${d.ackUrl}`,
    '',
    'Unattended tests need someone told at once: go to the bench or have someone there.',
    'Follow local codes, the makers\' instructions and licensed practice.',
  ].join('\n');
  const cell = (s: string) => `<td style="padding:2px 12px 2px 0">${escapeHtml(s)}</td>`;
  const html = [
    `<p><strong>${escapeHtml(a.message)}</strong>${escapeHtml(again)}</p>`,
    '<table>',
    ...[['Bench', bench], ['Pack', pack], ['Run', `${d.run.name} (#${d.run.id})`], ...rows].map(([k, v]) => `<tr>${cell(k!)}${cell(v!)}</tr>`),
    '</table>',
    `<p><a href="${escapeHtml(d.runUrl)}">Open the run</a> · <a href="${escapeHtml(d.ackUrl)}">Acknowledge</a> (sign in first)</p>`,
    '<p>Unattended tests need someone told at once. Follow local codes, the makers\' instructions and licensed practice.</p>',
  ].join('\n');
  return {
    from: checkedAddress(from),
    to: { name: headerSafe(d.user.name, MAX_NAME_CHARS), address: checkedAddress(d.user.email) },
    subject,
    text,
    html,
    // One id per queue row: a receiver that sees the same row twice can tell.
    messageId: `<alarm-delivery-${d.deliveryId}@kneepoint.invalid>`,
  };
}
