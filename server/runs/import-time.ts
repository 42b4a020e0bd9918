import { InvalidInputError } from '../domain/domain-errors.js';
import { calendarWallMs, fractionToMs, parseTimestampMs, wallMsToUtcMs } from './zoned-time.js';
import { MS_PER_S, SECONDS_PER_DAY } from '../../shared/units/time.js';

/**
 * How a log writes its time column: a number of seconds, milliseconds, minutes or hours;
 * an elapsed or clock time `h:mm:ss`; an ISO 8601 date-time; a day-first (dd.mm.yyyy) or
 * month-first (mm/dd/yyyy) date and time; or spreadsheet serial days.
 */
export type TimeFormat = 's' | 'ms' | 'min' | 'h' | 'hms' | 'iso' | 'dmy' | 'mdy' | 'serial-days';
/** Where the format came from: the column's unit mark, the person importing, or a guess from the values. */
export type TimeFormatSource = 'header' | 'chosen' | 'inferred';

const SECONDS_PER: Record<'s' | 'ms' | 'min' | 'h', number> = { s: 1, ms: 1e-3, min: 60, h: 3600 };
/** Day 0 of spreadsheet serial dates (1900 date system as spreadsheets store it, counting from 30 Dec 1899; common practice). */
const SERIAL_DAY_ZERO_MS = Date.UTC(1899, 11, 30);
/** A clock time that falls by more than this passed midnight (the log went on into the next day). */
const MIDNIGHT_ROLLOVER_S = SECONDS_PER_DAY / 2;
/** Two-digit years are 20xx: battery logs are from this century. */
const CENTURY = 2000;

/** A plain decimal number as loggers write it (no hex, no "Infinity", no thousands separators). */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;
const HMS = /^(\d+):([0-5]\d):([0-5]\d)(?:[.,](\d{1,9}))?$/;
const ISO_DATE = /^\d{4}-\d{2}-\d{2}/;
const NUMERIC_DATE = /^(\d{1,2})[./-](\d{1,2})[./-](\d{4}|\d{2})(?:[ T,]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?$/;

/** Latest instant a log can come from as seconds since 1970 (1 Jan 2100): larger numbers are no seconds. */
export const MAX_EPOCH_SECONDS = Date.UTC(2100, 0, 1) / MS_PER_S;
/** Earliest epoch a log's own clock could hold in milliseconds (9 Sep 2001, 1e12 ms): smaller numbers are no epoch ms. */
const MIN_EPOCH_MS = 1e12;
/** Earliest epoch in seconds the importer takes for a Unix time (9 Sep 2001, 1e9 s). */
const MIN_EPOCH_S = 1e9;

/** Parses a decimal number, with a decimal comma where the file uses one; NaN otherwise. */
export function parseDecimal(raw: string, decimalComma: boolean): number {
  const text = decimalComma ? raw.replace(',', '.') : raw;
  return DECIMAL.test(text) ? Number(text) : Number.NaN;
}

/** What the time reader needs besides the format. */
export interface TimeReadOptions {
  /** IANA zone of dates written without one (the lab's). */
  timeZone: string;
  decimalComma: boolean;
}

/**
 * A reader of one log's time column, in seconds (since 1970 for dates, since the logger's own
 * zero otherwise). NaN when a field is not in the format. Keeps a day count so that clock times
 * `h:mm:ss` run on past midnight.
 */
export function createTimeReader(format: TimeFormat, opts: TimeReadOptions): (text: string) => number {
  switch (format) {
    case 's':
    case 'ms':
    case 'min':
    case 'h': {
      const scale = SECONDS_PER[format];
      return (text) => parseDecimal(text, opts.decimalComma) * scale;
    }
    case 'hms': {
      let days = 0;
      let last = Number.NEGATIVE_INFINITY;
      return (text) => {
        const m = HMS.exec(text);
        if (!m) return Number.NaN;
        const t = Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]) + fractionToMs(m[4]) / MS_PER_S;
        if (t + days * SECONDS_PER_DAY < last - MIDNIGHT_ROLLOVER_S) days++;
        last = t + days * SECONDS_PER_DAY;
        return last;
      };
    }
    case 'iso':
      return (text) => (ISO_DATE.test(text) ? parseTimestampMs(text, opts.timeZone) / MS_PER_S : Number.NaN);
    case 'dmy':
    case 'mdy':
      return (text) => {
        const m = NUMERIC_DATE.exec(text);
        if (!m) return Number.NaN;
        const [a, b] = [Number(m[1]), Number(m[2])];
        const [day, month] = format === 'dmy' ? [a, b] : [b, a];
        const year = m[3]!.length === 2 ? CENTURY + Number(m[3]) : Number(m[3]);
        const wall = calendarWallMs(year, month, day, Number(m[4] ?? 0), Number(m[5] ?? 0), Number(m[6] ?? 0), fractionToMs(m[7]));
        return wallMsToUtcMs(wall, opts.timeZone) / MS_PER_S;
      };
    case 'serial-days':
      return (text) => {
        const days = parseDecimal(text, opts.decimalComma);
        // Round to the millisecond: a serial day carries about 1e-11 d of float noise.
        const wall = Math.round(SERIAL_DAY_ZERO_MS + days * SECONDS_PER_DAY * MS_PER_S);
        return wallMsToUtcMs(wall, opts.timeZone) / MS_PER_S;
      };
  }
}

/** Words for each format, for messages and the form. */
export const TIME_FORMAT_WORDS: Record<TimeFormat, string> = {
  s: 'seconds', ms: 'milliseconds', min: 'minutes', h: 'hours', hms: 'h:mm:ss', iso: 'ISO 8601 date-time',
  dmy: 'day-first date (dd.mm.yyyy)', mdy: 'month-first date (mm/dd/yyyy)', 'serial-days': 'spreadsheet serial days',
};

/** True when the format gives instants (seconds since 1970) rather than elapsed time. */
export function isAbsoluteTime(format: TimeFormat, firstSeconds: number): boolean {
  return format === 'iso' || format === 'dmy' || format === 'mdy' || format === 'serial-days' || (firstSeconds >= MIN_EPOCH_S && firstSeconds < MAX_EPOCH_SECONDS);
}

const askFormat = (message: string) => new InvalidInputError(message, { timeFormat: ['choose the time format'] });

/**
 * The format of a time column the file does not label, from its first value: clock times,
 * ISO dates and Unix times in seconds or milliseconds tell themselves apart; a day-first or
 * month-first date cannot (03.04.2026), so the importer asks. A bare number is seconds for
 * now; checkTimeSteps refuses it later if its steps could as well be milliseconds.
 */
export function inferTimeFormat(firstValue: string, column: string): TimeFormat {
  if (HMS.test(firstValue)) return 'hms';
  if (ISO_DATE.test(firstValue)) return 'iso';
  if (NUMERIC_DATE.test(firstValue)) throw askFormat(`line 2: time "${firstValue}" in column "${column}" is a date that can be day-first or month-first; choose the time format (dd.mm.yyyy or mm/dd/yyyy)`);
  const v = parseDecimal(firstValue, firstValue.includes(',') && !firstValue.includes('.'));
  if (Number.isFinite(v) && v >= MIN_EPOCH_MS && v < MAX_EPOCH_SECONDS * MS_PER_S) return 'ms';
  if (Number.isFinite(v) || firstValue === '') return 's';
  throw askFormat(`line 2: time "${firstValue.slice(0, 40)}" in column "${column}" is in no format Kneepoint recognises by itself; choose the time format`);
}

/** Longest log accepted: a capacity or protection test runs hours to weeks (common practice); a year covers float tests. */
export const MAX_LOG_SPAN_S = 366 * SECONDS_PER_DAY;
/** Finest cadence a battery logger writes (1 kHz); a median step below it means a wrong unit. */
export const MIN_MEDIAN_STEP_S = 1e-3;
/** Coarsest cadence accepted: one reading an hour. */
export const MAX_MEDIAN_STEP_S = 3600;
/** A bare number column read as seconds is taken only while its median step is at most this; beyond, ms is as likely. */
export const MAX_INFERRED_SECONDS_STEP_S = 60;

/** Refuses a time a log cannot hold (beyond 2100 as seconds since 1970, either sign), naming the line. */
export function checkTimeValue(seconds: number, raw: string, format: TimeFormat, line: number): void {
  if (Math.abs(seconds) < MAX_EPOCH_SECONDS) return;
  const hint = format === 's' || format === 'min' || format === 'h' ? '; if the column counts milliseconds, choose milliseconds' : '';
  throw askFormat(`line ${line}: time "${raw.slice(0, 40)}" read as ${TIME_FORMAT_WORDS[format]} is beyond the year 2100 counted from 1970${hint}`);
}

/** What the survey learned of the time column. */
export interface TimeStepFacts {
  format: TimeFormat;
  source: TimeFormatSource;
  column: string;
  /** Median step between distinct times, seconds (null with fewer than two distinct times). */
  medianStepSeconds: number | null;
  spanSeconds: number;
}

/**
 * Refuses a file whose steps cannot be the unit claimed: a span over a year, a median step
 * finer than a millisecond or coarser than an hour, or a bare number column whose steps could
 * be seconds or milliseconds alike (then it asks for the unit).
 */
export function checkTimeSteps(f: TimeStepFacts): void {
  const how = f.source === 'inferred' ? `read as ${TIME_FORMAT_WORDS[f.format]}` : `in ${TIME_FORMAT_WORDS[f.format]}`;
  const other = 'choose the time format that matches the file';
  if (f.spanSeconds > MAX_LOG_SPAN_S) throw askFormat(`time column "${f.column}" ${how} spans ${(f.spanSeconds / SECONDS_PER_DAY).toFixed(0)} days, more than a year; ${other}`);
  if (f.medianStepSeconds === null) return;
  if (f.medianStepSeconds < MIN_MEDIAN_STEP_S) throw askFormat(`time column "${f.column}" ${how} steps ${f.medianStepSeconds} s (median), finer than any battery logger; ${other}`);
  if (f.medianStepSeconds > MAX_MEDIAN_STEP_S) throw askFormat(`time column "${f.column}" ${how} steps ${f.medianStepSeconds} s (median), more than an hour between readings; ${other}`);
  if (f.source === 'inferred' && f.format === 's' && f.medianStepSeconds > MAX_INFERRED_SECONDS_STEP_S) {
    throw askFormat(`time column "${f.column}" has no unit and steps of ${f.medianStepSeconds} (median): seconds (${(f.medianStepSeconds / 60).toFixed(1)} min apart) or milliseconds (${f.medianStepSeconds / MS_PER_S} s apart)? Choose the time format`);
  }
}
