import type { JsonlFormat } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { clip, reject, type LineParser, type ParseResult } from './parse-result.js';
import { timeToSeconds, toAmps, toCelsius, toVolts } from './units.js';
import { MS_PER_S } from '../../../shared/units/time.js';


/**
 * Parses one JSON line into a Frame through the field map. Volts and amps are required
 * numbers; time is optional (absent: stamped on arrival); temps come from the `temps`
 * map or, without one, from a nested `temps` object in °C.
 */
export function parseJsonLine(format: JsonlFormat, line: string, arrivalMs: number): ParseResult {
  let data: unknown;
  try {
    data = JSON.parse(line);
  } catch {
    return reject(`not valid JSON: '${clip(line)}'`);
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) return reject('not a JSON object');
  const record = data as Record<string, unknown>;
  const { fields } = format;

  const volts = record[fields.volts];
  const amps = record[fields.amps];
  if (!isFiniteNumber(volts)) return reject(`${fields.volts}: missing or not a number`);
  if (!isFiniteNumber(amps)) return reject(`${fields.amps}: missing or not a number`);
  const frame: Frame = {
    t: arrivalMs / MS_PER_S,
    volts: toVolts(volts, format.voltsUnit),
    amps: toAmps(amps, format.ampsUnit, format.currentSign),
    clock: 'arrival',
  };

  const rawT = record[fields.t];
  if (rawT !== undefined) {
    const t = typeof rawT === 'string' || typeof rawT === 'number' ? timeToSeconds(rawT, format.timeUnit) : undefined;
    if (t === undefined) return reject(`${fields.t}: not a time in ${format.timeUnit}`);
    frame.t = t;
    frame.clock = 'device';
  }
  const seq = record[fields.seq];
  if (seq !== undefined) {
    if (!Number.isInteger(seq) || (seq as number) < 0) return reject(`${fields.seq}: not a count`);
    frame.seq = seq as number;
  }

  const temps = format.temps ? pick(record, format.temps) : nested(record.temps);
  if (typeof temps === 'string') return reject(`temperature ${temps}: not a number`);
  if (temps) frame.temps = mapValues(temps, (c) => (format.temps ? toCelsius(c, format.tempUnit) : c));
  const aux = format.aux ? pick(record, format.aux) : nested(record.aux);
  if (typeof aux === 'string') return reject(`aux ${aux}: not a number`);
  if (aux) frame.aux = aux;
  return { kind: 'frame', frame };
}

/** Makes a line parser for a JSON-lines format. */
export function createJsonlParser(format: JsonlFormat): LineParser {
  return (line, arrivalMs) => parseJsonLine(format, line, arrivalMs);
}

function isFiniteNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/** Picks mapped keys; returns the offending key's name when one is not a number. */
function pick(record: Record<string, unknown>, map: Record<string, string>): Record<string, number> | string | undefined {
  const out: Record<string, number> = {};
  for (const [channel, key] of Object.entries(map)) {
    const value = record[key];
    if (value === undefined) continue;
    if (!isFiniteNumber(value)) return key;
    out[channel] = value;
  }
  return Object.keys(out).length > 0 ? out : undefined;
}

/** Reads a nested `{ channel: number }` object; returns the offending channel's name when one is not a number. */
function nested(value: unknown): Record<string, number> | string | undefined {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return undefined;
  const entries = Object.entries(value as Record<string, unknown>);
  for (const [channel, v] of entries) if (!isFiniteNumber(v)) return channel;
  return entries.length > 0 ? (Object.fromEntries(entries) as Record<string, number>) : undefined;
}

function mapValues(obj: Record<string, number>, fn: (v: number) => number): Record<string, number> {
  return Object.fromEntries(Object.entries(obj).map(([k, v]) => [k, fn(v)]));
}
