import { InvalidInputError } from '../domain/domain-errors.js';
import { fahrenheitToCelsius, kelvinToCelsius } from '../../shared/units/convert.js';
import { FieldSpans, isBlank } from '../ingest/parsers/csv-fields.js';
import { readDecimal } from '../ingest/parsers/strict-number.js';
import { checkTimeValue, createTimeReader, inferTimeFormat, MAX_EPOCH_SECONDS, type TimeFormat, type TimeFormatSource } from './import-time.js';

/** Channels an imported log can carry. */
export type ImportChannel = 'time' | 'volts' | 'amps' | 'temp';
export type TempUnit = 'C' | 'F' | 'K';
/** Where a temperature unit came from: the column's unit mark, the person importing, or the lab's preference. */
export type TempUnitSource = 'header' | 'chosen' | 'lab';

/** Where each channel sits in a row and how to turn its text into SI-ish units (s, V, A, °C). */
export interface ColumnPlan {
  time: { index: number; format: TimeFormat; source: TimeFormatSource; column: string };
  volts: { index: number; scale: number };
  amps: { index: number; scale: number };
  temp: { index: number; unit: TempUnit; source: TempUnitSource; column: string } | null;
  /** Numbers written with a decimal comma (semicolon- or tab-separated logs). */
  decimalComma?: boolean;
  /** IANA zone of dates written without one (the lab's); default UTC. */
  timeZone?: string;
}

export interface ColumnOverrides {
  time?: string;
  volts?: string;
  amps?: string;
  temp?: string;
  /** The time format chosen on the form (wins over a unit mark in the header). */
  timeFormat?: TimeFormat;
  /** Unit of a temperature column whose header names none. */
  tempUnit?: TempUnit;
  /** The lab's temperature unit, taken when neither the header nor the form names one. */
  labTempUnit?: 'C' | 'F';
}

/**
 * A degree sign as loggers' files carry it: °, the ordinal º, or the mojibake of a file saved
 * in Windows-1252 and read as UTF-8 (U+FFFD) or the reverse ("Â°").
 */
const DEGREE_SIGN = /^(Â°|°|º|\uFFFD)\s*/i;
/** "degF", "deg. C", "degrees C", "° C": the degree written out or as a sign, before the letter. */
const DEGREE_WORD = /^(deg(rees?)?\.?|Â°|°|º|\uFFFD)\s*/i;
/** Temperature names run together with their unit: TempF, Temp_degC, T1C, temperature-f. */
const TEMP_WITH_UNIT = /^(t|temp|temperature)(\s?\d*)[\s_-]*(deg(?:rees?)?|Â°|°|º|\uFFFD)?\s*(c|f|k)$/;

/** Splits "Voltage (V)", "voltage_v", "Current [mA]", "temp °C", "TempF" into a base name and a unit. */
export function splitHeader(header: string): { base: string; unit: string | null } {
  const h = header.trim().toLowerCase().replace(/^\uFEFF/, '');
  const bracket = /^(.*?)[\s_,]*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(h);
  if (bracket) return { base: bracket[1]!.trim(), unit: normaliseUnit(bracket[2]!) };
  const joined = TEMP_WITH_UNIT.exec(h);
  if (joined) return { base: `${joined[1]}${joined[2]!.trim()}`, unit: joined[4]! };
  const suffix = /^(.*?)[\s_/,-]+(s|sec|ms|min|h|hr|v|mv|a|ma|(?:deg(?:rees?)?|Â°|°|º|\uFFFD)?\s*[cfk]|celsius|fahrenheit|kelvin)$/.exec(h);
  if (suffix) return { base: suffix[1]!.trim(), unit: normaliseUnit(suffix[2]!) };
  return { base: h, unit: null };
}

/** One spelling per unit: "°C", "degC", "deg C", "celsius" → "c"; "degF", "fahrenheit" → "f"; "kelvin" → "k". */
function normaliseUnit(raw: string): string | null {
  const u = raw.replace(DEGREE_SIGN, '').trim();
  const word = { celsius: 'c', fahrenheit: 'f', kelvin: 'k' }[u];
  if (word) return word;
  const deg = u.replace(DEGREE_WORD, '').trim();
  if (deg !== u && /^[cfk]$/.test(deg)) return deg;
  return u || null;
}

/** Common English names, and the German ones a lab's loggers often write (Zeit, Datum, Spannung, Strom). */
const TIME_NAMES = /^(t|time|elapsed|elapsed ?seconds|elapsed time|test time|timestamp|date ?time|datetime|seconds|secs?|clock|date and time|zeit|uhrzeit|datum ?zeit)$/;
/** A date column: the time column only when no other is there (a "Date" beside a "Time" holds the day, not the instant). */
const DATE_NAMES = /^(date|datum)$/;
const VOLT_NAMES = /^(v|u|volt|volts|voltage|pack voltage|battery voltage|terminal voltage|voltage measured|spannung)$/;
const AMP_NAMES = /^(i|a|amp|amps|ampere|amperes|current|pack current|battery current|current measured|strom)$/;
/** Temperature names, numbered or not (Temp1, T2). A bare "t" is time unless it carries a temperature unit. */
const TEMP_NAMES = /^(t ?\d+|temp [a-z0-9]+|temp ?\d*|temperature ?\d*|temperatur ?\d*|cell temp|cell temperature|t cell|battery temperature|temperature measured|ambient|ambient temp|ambient temperature)$/;
const TEMP_UNITS = new Set(['c', 'f', 'k']);

const normalise = (base: string) => base.replace(/[_-]+/g, ' ').replace(/\s+/g, ' ');

type Found = { index: number; unit: string | null; column: string };

/** Does this header name the channel? Units decide between time and temperature for "T". */
function matches(kind: ImportChannel | 'date', header: string): boolean {
  const { base, unit } = splitHeader(header);
  const name = normalise(base);
  switch (kind) {
    case 'time':
      return TIME_NAMES.test(name) && (unit === null || !TEMP_UNITS.has(unit));
    case 'date':
      return DATE_NAMES.test(name) && unit === null;
    case 'temp':
      return (TEMP_NAMES.test(name) && (unit === null || TEMP_UNITS.has(unit))) || (name === 't' && unit !== null && TEMP_UNITS.has(unit));
    case 'volts':
      return VOLT_NAMES.test(name);
    case 'amps':
      return AMP_NAMES.test(name);
  }
}

function find(headers: readonly string[], kind: ImportChannel, override?: string): Found | null {
  if (override !== undefined) {
    const index = headers.findIndex((h) => h.trim() === override.trim());
    if (index < 0) throw new InvalidInputError(`line 1: no column named "${override}" for ${kind}`, { columns: [`no column "${override}"`] });
    return { index, unit: splitHeader(headers[index]!).unit, column: headers[index]! };
  }
  let index = headers.findIndex((h) => matches(kind, h));
  if (index < 0 && kind === 'time') index = headers.findIndex((h) => matches('date', h));
  return index < 0 ? null : { index, unit: splitHeader(headers[index]!).unit, column: headers[index]! };
}

const TIME_UNIT_FORMAT: Record<string, TimeFormat> = { s: 's', sec: 's', ms: 'ms', min: 'min', h: 'h', hr: 'h' };
const VOLT_SCALE: Record<string, number> = { v: 1, mv: 1e-3 };
const AMP_SCALE: Record<string, number> = { a: 1, ma: 1e-3 };
const TEMP_UNIT: Record<string, TempUnit> = { c: 'C', f: 'F', k: 'K' };
const DEGREES: Record<TempUnit, string> = { C: '°C', F: '°F', K: 'K' };

function planTime(time: Found, firstValue: string | null, overrides: ColumnOverrides): ColumnPlan['time'] | string {
  const base = { index: time.index, column: time.column };
  if (overrides.timeFormat) return { ...base, format: overrides.timeFormat, source: 'chosen' };
  if (time.unit !== null) {
    const format = TIME_UNIT_FORMAT[time.unit];
    return format ? { ...base, format, source: 'header' } : `time unit "${time.unit}"`;
  }
  if (/^(seconds|secs?)$/.test(normalise(splitHeader(time.column).base))) return { ...base, format: 's', source: 'header' };
  return { ...base, format: firstValue === null ? 's' : inferTimeFormat(firstValue, time.column), source: 'inferred' };
}

function planTemp(temp: Found, overrides: ColumnOverrides): ColumnPlan['temp'] | string {
  const base = { index: temp.index, column: temp.column };
  if (temp.unit !== null) {
    const unit = TEMP_UNIT[temp.unit];
    if (!unit) return `temperature unit "${temp.unit}"`;
    if (overrides.tempUnit && overrides.tempUnit !== unit) {
      throw new InvalidInputError(`line 1: column "${temp.column}" is in ${DEGREES[unit]} but ${DEGREES[overrides.tempUnit]} was chosen; clear the choice or fix the header`, { tempUnit: ['contradicts the header'] });
    }
    return { ...base, unit, source: 'header' };
  }
  if (overrides.tempUnit) return { ...base, unit: overrides.tempUnit, source: 'chosen' };
  if (overrides.labTempUnit) return { ...base, unit: overrides.labTempUnit, source: 'lab' };
  throw new InvalidInputError(`line 1: temperature column "${temp.column}" names no unit; choose °C, °F or K`, { tempUnit: ['choose the unit'] });
}

/**
 * Recognises the time, volts, amps and (optional) temperature columns of a header row,
 * with or without units in the names, or takes them from `overrides`. `firstRow` lets the
 * time format be recognised when the header names none. Throws a 400 naming line 1 otherwise.
 */
export function planColumns(headers: readonly string[], firstRow: readonly string[] | null, overrides: ColumnOverrides = {}): ColumnPlan {
  const time = find(headers, 'time', overrides.time);
  const volts = find(headers, 'volts', overrides.volts);
  const amps = find(headers, 'amps', overrides.amps);
  const temp = find(headers, 'temp', overrides.temp);
  const missing = [!time && 'time', !volts && 'volts', !amps && 'amps'].filter(Boolean);
  if (missing.length) throw new InvalidInputError(`line 1: no ${missing.join(', ')} column recognised in header "${headers.join(',').slice(0, 200)}"; name them or send a column mapping`, { columns: ['map the columns'] });
  const timePlan = planTime(time!, firstRow?.[time!.index]?.trim() ?? null, overrides);
  const tempPlan = temp ? planTemp(temp, overrides) : null;
  const vScale = volts!.unit === null ? 1 : VOLT_SCALE[volts!.unit];
  const aScale = amps!.unit === null ? 1 : AMP_SCALE[amps!.unit];
  const bad = [
    typeof timePlan === 'string' && timePlan,
    vScale === undefined && `volts unit "${volts!.unit}"`,
    aScale === undefined && `amps unit "${amps!.unit}"`,
    typeof tempPlan === 'string' && tempPlan,
  ].filter(Boolean);
  if (bad.length) throw new InvalidInputError(`line 1: unknown ${bad.join(', ')}`);
  return {
    time: timePlan as ColumnPlan['time'],
    volts: { index: volts!.index, scale: vScale! },
    amps: { index: amps!.index, scale: aScale! },
    temp: tempPlan as ColumnPlan['temp'],
  };
}

/** °F → °C and K → °C, by unit (shared/units). */
const toCelsius = { C: (v: number) => v, F: fahrenheitToCelsius, K: kelvinToCelsius };

/** One parsed row, before the current's sign is settled. */
export interface ParsedRow {
  t: number;
  volts: number;
  amps: number;
  tempCelsius: number | null;
}

/** A row parser: the record's text, where its fields lie, and its line number. */
export type RowParser = (text: string, spans: FieldSpans, line: number) => ParsedRow;

/** A field's bounds with the blanks inside its quotes trimmed too (the reader trims those outside). */
function fieldBounds(spans: FieldSpans, text: string, index: number): [number, number] {
  if (index >= spans.count) return [0, 0];
  let start = spans.starts[index]!;
  let end = spans.ends[index]!;
  while (start < end && isBlank(text.charCodeAt(start))) start++;
  while (end > start && isBlank(text.charCodeAt(end - 1))) end--;
  return [start, end];
}

/** A field's text, trimmed, as messages and date formats need it ('' when the row is short). */
function fieldText(spans: FieldSpans, text: string, index: number): string {
  return index < spans.count ? spans.text(text, index).trim() : '';
}

/** Seconds per unit of the time formats that are a plain number. */
const NUMERIC_TIME_SECONDS: Partial<Record<TimeFormat, number>> = { s: 1, ms: 1e-3, min: 60, h: 3600 };

/**
 * A parser of one log's data rows by the plan (one per pass: clock times keep a day count).
 * Numbers are read in place by the same strict reader as live meters' lines (readDecimal);
 * a string is made only for a date or clock time and for a message.
 * Throws a 400 naming the line and the bad field.
 */
export function createRowParser(plan: ColumnPlan): RowParser {
  const decimalComma = plan.decimalComma ?? false;
  const readTime = createTimeReader(plan.time.format, { timeZone: plan.timeZone ?? 'UTC', decimalComma });
  const numericTimeScale = NUMERIC_TIME_SECONDS[plan.time.format];
  const num = (text: string, spans: FieldSpans, index: number, what: string, line: number): number => {
    const [start, end] = fieldBounds(spans, text, index);
    const v = spans.escaped[index] === 1 ? Number.NaN : readDecimal(text, start, end, decimalComma);
    if (Number.isNaN(v)) throw new InvalidInputError(`line ${line}: ${what} "${fieldText(spans, text, index).slice(0, 40)}" is not a number`);
    return v;
  };
  const timeError = (timeText: string, line: number) => {
    const comma = !decimalComma && /^\d+,\d+$/.test(timeText) ? '; a decimal comma needs a semicolon- or tab-separated file' : '';
    return new InvalidInputError(`line ${line}: time "${timeText.slice(0, 40)}" is not ${plan.time.format === 'iso' ? 'an ISO 8601 date-time' : `in the format ${plan.time.format}`}${comma}`, { timeFormat: ['does not match the file'] });
  };
  const timeIndex = plan.time.index;
  return (text, spans, line) => {
    let t: number;
    if (numericTimeScale !== undefined && spans.escaped[timeIndex] !== 1) {
      const [start, end] = fieldBounds(spans, text, timeIndex);
      t = readDecimal(text, start, end, decimalComma) * numericTimeScale;
    } else t = readTime(fieldText(spans, text, timeIndex));
    if (!Number.isFinite(t)) throw timeError(fieldText(spans, text, timeIndex), line);
    if (!(Math.abs(t) < MAX_EPOCH_SECONDS)) checkTimeValue(t, fieldText(spans, text, timeIndex), plan.time.format, line);
    const volts = num(text, spans, plan.volts.index, 'volts', line) * plan.volts.scale;
    const amps = num(text, spans, plan.amps.index, 'amps', line) * plan.amps.scale;
    let tempCelsius: number | null = null;
    if (plan.temp) {
      const [start, end] = fieldBounds(spans, text, plan.temp.index);
      // A blank temperature is "not measured", not an error.
      if (end > start) tempCelsius = toCelsius[plan.temp.unit](num(text, spans, plan.temp.index, 'temperature', line));
    }
    return { t, volts, amps, tempCelsius };
  };
}

/** Fields laid end to end with their spans, for a row given as texts (tests, single rows). */
export function spansOfFields(fields: readonly string[]): { text: string; spans: FieldSpans } {
  const spans = new FieldSpans();
  let text = '';
  for (const field of fields) {
    spans.add(text.length, text.length + field.length, false);
    text += field;
  }
  return { text, spans };
}

/** Parses one data row given as field texts by the plan (a fresh parser: fine for one row, use createRowParser for a file). */
export function parseRow(plan: ColumnPlan, fields: readonly string[], line: number): ParsedRow {
  const { text, spans } = spansOfFields(fields);
  return createRowParser(plan)(text, spans, line);
}
