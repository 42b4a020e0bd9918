import { parseScpiNumber } from '../ingest/parsers/scpi-reply.js';

/**
 * Checks of a SCPI instrument's replies: a reply of the wrong shape is garbage, and the
 * reason says what was expected. Pure functions; the driver turns a reason into an
 * InstrumentFault.
 */

/** A checked reply: its value, or why it is garbage. */
export type Checked<T> = { ok: true; value: T } | { ok: false; reason: string };

/** Longest reply shown in a reason. */
const SHOWN_CHARS = 40;
/** IEEE 488.2 section 10.14 (from memory): `*IDN?` answers manufacturer, model, serial number, firmware. */
const IDN_FIELDS = 4;

/** Shows a reply in a reason: clipped, control bytes as \xNN so the log stays readable. */
export function showReply(reply: string): string {
  const clipped = reply.length > SHOWN_CHARS ? `${reply.slice(0, SHOWN_CHARS)}…` : reply;
  // eslint-disable-next-line no-control-regex
  return `'${clipped.replace(/[\x00-\x1f\x7f-\xff]/g, (c) => `\\x${c.charCodeAt(0).toString(16).padStart(2, '0')}`)}'`;
}

/** True when the reply holds a byte no SCPI reply has (control characters, 8-bit noise). */
export function hasNoise(reply: string): boolean {
  // eslint-disable-next-line no-control-regex
  return /[\x00-\x08\x0b-\x1f\x7f-\xff]/.test(reply);
}

/** A measured number (NR1/NR2/NR3); the SCPI not-a-number and overload codes are refused. */
export function checkNumber(reply: string): Checked<number> {
  if (hasNoise(reply)) return { ok: false, reason: `garbage ${showReply(reply)}` };
  const parsed = parseScpiNumber(reply);
  return parsed.ok ? parsed : { ok: false, reason: parsed.reason };
}

/** An on/off state: `1`, `0`, `ON`, `OFF` (IEEE 488.2 boolean, any case). */
export function checkState(reply: string): Checked<boolean> {
  const text = reply.trim().toUpperCase();
  if (text === '1' || text === 'ON' || text === '+1') return { ok: true, value: true };
  if (text === '0' || text === 'OFF' || text === '+0') return { ok: true, value: false };
  return { ok: false, reason: `${showReply(reply)} is not an on/off state` };
}

/** One error queue entry, `<code>,"<text>"` (SCPI-1999 SYSTem:ERRor); code 0 means the queue is empty. */
export function checkErrorEntry(reply: string): Checked<{ code: number; text: string }> {
  const match = /^\s*([+-]?\d+)\s*,\s*"([^"]*)"\s*$/.exec(reply);
  if (!match || hasNoise(reply)) return { ok: false, reason: `${showReply(reply)} is not an error queue entry` };
  return { ok: true, value: { code: Number(match[1]), text: match[2] } };
}

/** An identity line: printable, four comma-separated fields with a maker and a model. */
export function checkIdentity(reply: string): Checked<string> {
  const text = reply.trim();
  const fields = text.split(',');
  if (hasNoise(text) || fields.length !== IDN_FIELDS || fields[0].trim() === '' || fields[1].trim() === '') {
    return { ok: false, reason: `${showReply(reply)} is not an identity (maker,model,serial,firmware)` };
  }
  return { ok: true, value: text };
}
