import { MS_PER_HOUR, MS_PER_S } from '../../shared/units/time.js';
/** An ISO date-time that says which zone it is in (Z or an offset such as +02:00 after the time; a date's own -15 is no zone). */
const HAS_ZONE = /\d:\d{2}(?::\d{2}(?:[.,]\d+)?)?\s*(z|[+-]\d{2}(:?\d{2})?)$/i;
/** A date and wall-clock time without a zone: "2026-03-29 01:30:00", "2026-03-29T01:30:00.250". */
const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?$/i;

const formatters = new Map<string, Intl.DateTimeFormat>();
const offsets = new Map<string, number>();

/** How far `timeZone`'s wall clock is ahead of UTC at the instant `utcMs` (from the platform's IANA data). */
function zoneOffsetMs(utcMs: number, timeZone: string): number {
  // Offsets only change on the hour in practice: cache per zone and UTC hour (a long log asks millions of times).
  const key = `${timeZone}|${Math.floor(utcMs / MS_PER_HOUR)}`;
  const cached = offsets.get(key);
  if (cached !== undefined) return cached;
  let fmt = formatters.get(timeZone);
  if (!fmt) {
    fmt = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric' });
    formatters.set(timeZone, fmt);
  }
  const part = (parts: Intl.DateTimeFormatPart[], type: string) => Number(parts.find((p) => p.type === type)?.value);
  const hourStart = Math.floor(utcMs / MS_PER_HOUR) * MS_PER_HOUR;
  const parts = fmt.formatToParts(new Date(hourStart));
  const wall = Date.UTC(part(parts, 'year'), part(parts, 'month') - 1, part(parts, 'day'), part(parts, 'hour'), part(parts, 'minute'), part(parts, 'second'));
  const offset = wall - hourStart;
  if (offsets.size > 10_000) offsets.clear();
  offsets.set(key, offset);
  return offset;
}

/**
 * Unix milliseconds of a wall-clock reading in `timeZone`, given as milliseconds of the same
 * calendar reading taken as if it were UTC (what Date.UTC of its parts gives). NaN stays NaN.
 */
export function wallMsToUtcMs(wallMs: number, timeZone: string): number {
  if (!Number.isFinite(wallMs)) return Number.NaN;
  // Guess with the offset at the wall time, then correct once with the offset at the guess (DST edges).
  const guess = wallMs - zoneOffsetMs(wallMs, timeZone);
  return wallMs - zoneOffsetMs(guess, timeZone);
}

/**
 * Milliseconds of a calendar date and time read as if UTC, or NaN when a part is out of range
 * (month 13, 31 April, 25 o'clock): Date.UTC would roll those over into another date silently.
 */
export function calendarWallMs(year: number, month: number, day: number, hour = 0, minute = 0, second = 0, fractionMs = 0): number {
  const ms = Date.UTC(year, month - 1, day, hour, minute, second);
  const d = new Date(ms);
  const same = d.getUTCFullYear() === year && d.getUTCMonth() === month - 1 && d.getUTCDate() === day && d.getUTCHours() === hour && d.getUTCMinutes() === minute && d.getUTCSeconds() === second;
  return same ? ms + fractionMs : Number.NaN;
}

/** Milliseconds of a decimal fraction of a second written as its digits ("25" of "12:00:00.25"). */
export function fractionToMs(digits: string | undefined): number {
  return digits ? Number(`0.${digits}`) * MS_PER_S : 0;
}

/**
 * Unix milliseconds of an ISO 8601 timestamp. One with a zone means what it says; one
 * without is wall-clock time in `timeZone` (the lab's), not in whatever zone the server
 * runs in. NaN when the text is not a timestamp.
 */
export function parseTimestampMs(text: string, timeZone: string): number {
  const local = HAS_ZONE.test(text) ? null : LOCAL_DATE_TIME.exec(text);
  if (!local) return Date.parse(text);
  // A date alone is the lab's midnight (Date.parse would take it as UTC midnight).
  const [, y, mo, d, h = '0', mi = '0', s = '0', frac] = local;
  return wallMsToUtcMs(calendarWallMs(+y!, +mo!, +d!, +h, +mi, +s, fractionToMs(frac)), timeZone);
}
