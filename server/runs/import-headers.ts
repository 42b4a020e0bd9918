import { HttpError } from '../http/http-error.js';
import { parseTimestampMs } from './zoned-time.js';

/** Channels an imported log can carry. */
export type ImportChannel = 'time' | 'volts' | 'amps' | 'temp';
export type TimeUnit = 's' | 'ms' | 'min' | 'h' | 'iso';

/** Where each channel sits in a row and how to turn its text into SI-ish units (s, V, A, °C). */
export interface ColumnPlan {
  time: { index: number; unit: TimeUnit };
  volts: { index: number; scale: number };
  amps: { index: number; scale: number };
  temp: { index: number; unit: 'C' | 'F' | 'K' } | null;
  /** Numbers written with a decimal comma (semicolon- or tab-separated logs). */
  decimalComma?: boolean;
  /** IANA zone of ISO timestamps written without one (the lab's); default UTC. */
  timeZone?: string;
}

export interface ColumnOverrides {
  time?: string;
  volts?: string;
  amps?: string;
  temp?: string;
  timeUnit?: TimeUnit;
}

/**
 * A degree sign as loggers' files carry it: °, the ordinal º, or the mojibake of a file saved
 * in Windows-1252 and read as UTF-8 (U+FFFD) or the reverse ("Â°").
 */
const DEGREE_SIGN = /^(Â°|°|º|\uFFFD)\s*/i;

/** Splits "Voltage (V)", "voltage_v", "Current [mA]", "temp °C" into a base name and a unit. */
export function splitHeader(header: string): { base: string; unit: string | null } {
  const h = header.trim().toLowerCase().replace(/^\uFEFF/, '');
  const bracket = /^(.*?)[\s_]*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(h);
  if (bracket) return { base: bracket[1]!.trim(), unit: bracket[2]!.replace(DEGREE_SIGN, '').trim() || null };
  const suffix = /^(.*?)[\s_/-]+(s|sec|ms|min|h|hr|v|mv|a|ma|c|°c|degc|f|°f|degf|k)$/.exec(h);
  if (suffix) return { base: suffix[1]!.trim(), unit: suffix[2]!.replace(/^(°|deg)/, '') };
  return { base: h, unit: null };
}

const TIME_NAMES = /^(t|time|elapsed|elapsed time|test time|timestamp|date ?time|datetime|seconds|secs?|clock)$/;
const VOLT_NAMES = /^(v|u|volt|volts|voltage|pack voltage|battery voltage|terminal voltage|voltage measured)$/;
const AMP_NAMES = /^(i|a|amp|amps|ampere|amperes|current|pack current|battery current|current measured)$/;
const TEMP_NAMES = /^(temp|temperature|cell temp|cell temperature|t cell|battery temperature|temperature measured)$/;

const normalise = (base: string) => base.replace(/[_-]+/g, ' ').replace(/\s+/g, ' ');

function unitOf(kind: ImportChannel, unit: string | null): number | TimeUnit | 'C' | 'F' | 'K' | undefined {
  switch (kind) {
    case 'time':
      return unit === null || unit === 's' || unit === 'sec' ? 's' : unit === 'ms' ? 'ms' : unit === 'min' ? 'min' : unit === 'h' || unit === 'hr' ? 'h' : undefined;
    case 'volts':
      return unit === null || unit === 'v' ? 1 : unit === 'mv' ? 1e-3 : undefined;
    case 'amps':
      return unit === null || unit === 'a' ? 1 : unit === 'ma' ? 1e-3 : undefined;
    case 'temp':
      return unit === null || unit === 'c' ? 'C' : unit === 'f' ? 'F' : unit === 'k' ? 'K' : undefined;
  }
}

function find(headers: readonly string[], kind: ImportChannel, names: RegExp, override?: string): { index: number; unit: string | null } | null {
  if (override !== undefined) {
    const index = headers.findIndex((h) => h.trim() === override.trim());
    if (index < 0) throw new HttpError(400, `line 1: no column named "${override}" for ${kind}`);
    return { index, unit: splitHeader(headers[index]!).unit };
  }
  const index = headers.findIndex((h) => names.test(normalise(splitHeader(h).base)));
  return index < 0 ? null : { index, unit: splitHeader(headers[index]!).unit };
}

/**
 * Recognises the time, volts, amps and (optional) temperature columns of a header row,
 * with or without units in the names, or takes them from `overrides`. `firstRow` decides
 * whether the time column holds ISO timestamps. Throws a 400 naming line 1 otherwise.
 */
export function planColumns(headers: readonly string[], firstRow: readonly string[] | null, overrides: ColumnOverrides = {}): ColumnPlan {
  const time = find(headers, 'time', TIME_NAMES, overrides.time);
  const volts = find(headers, 'volts', VOLT_NAMES, overrides.volts);
  const amps = find(headers, 'amps', AMP_NAMES, overrides.amps);
  const temp = find(headers, 'temp', TEMP_NAMES, overrides.temp);
  const missing = [!time && 'time', !volts && 'volts', !amps && 'amps'].filter(Boolean);
  if (missing.length) throw new HttpError(400, `line 1: no ${missing.join(', ')} column recognised in header "${headers.join(',').slice(0, 200)}"; name them or send a column mapping`);
  const sample = firstRow?.[time!.index]?.trim() ?? '';
  const looksIso = sample !== '' && !Number.isFinite(Number(sample)) && !Number.isNaN(Date.parse(sample));
  const timeUnit = overrides.timeUnit ?? (looksIso ? 'iso' : (unitOf('time', time!.unit) as TimeUnit | undefined));
  const vScale = unitOf('volts', volts!.unit) as number | undefined;
  const aScale = unitOf('amps', amps!.unit) as number | undefined;
  const tUnit = temp ? (unitOf('temp', temp.unit) as 'C' | 'F' | 'K' | undefined) : undefined;
  const bad = [
    !timeUnit && `time unit "${time!.unit}"`,
    vScale === undefined && `volts unit "${volts!.unit}"`,
    aScale === undefined && `amps unit "${amps!.unit}"`,
    temp && !tUnit && `temperature unit "${temp.unit}"`,
  ].filter(Boolean);
  if (bad.length) throw new HttpError(400, `line 1: unknown ${bad.join(', ')}`);
  return {
    time: { index: time!.index, unit: timeUnit! },
    volts: { index: volts!.index, scale: vScale! },
    amps: { index: amps!.index, scale: aScale! },
    temp: temp ? { index: temp.index, unit: tUnit! } : null,
  };
}

const SECONDS_PER: Record<Exclude<TimeUnit, 'iso'>, number> = { s: 1, ms: 1e-3, min: 60, h: 3600 };
/** °F → °C and K → °C (exact definitions of the scales). */
const toCelsius = { C: (v: number) => v, F: (v: number) => ((v - 32) * 5) / 9, K: (v: number) => v - 273.15 };

/** A plain decimal number as loggers write it (no hex, no "Infinity", no thousands separators). */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** One parsed row, before the current's sign is settled. */
export interface ParsedRow {
  t: number;
  volts: number;
  amps: number;
  tempC: number | null;
}

/** Parses one data row by the plan; throws a 400 naming the line and the bad field. */
export function parseRow(plan: ColumnPlan, fields: readonly string[], line: number): ParsedRow {
  const num = (index: number, what: string): number => {
    const raw = fields[index]?.trim() ?? '';
    const text = plan.decimalComma ? raw.replace(',', '.') : raw;
    const v = DECIMAL.test(text) ? Number(text) : Number.NaN;
    if (!Number.isFinite(v)) throw new HttpError(400, `line ${line}: ${what} "${raw.slice(0, 40)}" is not a number`);
    return v;
  };
  let t: number;
  if (plan.time.unit === 'iso') {
    const text = fields[plan.time.index]?.trim() ?? '';
    t = parseTimestampMs(text, plan.timeZone ?? 'UTC') / 1000;
    if (!Number.isFinite(t)) throw new HttpError(400, `line ${line}: time "${text}" is not an ISO timestamp`);
  } else t = num(plan.time.index, 'time') * SECONDS_PER[plan.time.unit];
  const tempText = plan.temp ? (fields[plan.temp.index]?.trim() ?? '') : '';
  return {
    t,
    volts: num(plan.volts.index, 'volts') * plan.volts.scale,
    amps: num(plan.amps.index, 'amps') * plan.amps.scale,
    // A blank temperature is "not measured", not an error.
    tempC: plan.temp && tempText !== '' ? toCelsius[plan.temp.unit](num(plan.temp.index, 'temperature')) : null,
  };
}
