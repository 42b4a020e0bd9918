import type { CurrentSign } from '../../../shared/schemas/bench.js';
import { isBlank } from './csv-fields.js';
import { readDecimal } from './strict-number.js';
import { MS_PER_S } from '../../../shared/units/time.js';

const MILLI = 1000;

/** Parses a decimal number strictly (no empty string, no trailing junk, finite only; blanks around it allowed). */
export function parseStrictNumber(text: string): number | undefined {
  let start = 0;
  let end = text.length;
  while (start < end && isBlank(text.charCodeAt(start))) start++;
  while (end > start && isBlank(text.charCodeAt(end - 1))) end--;
  const value = readDecimal(text, start, end);
  return Number.isNaN(value) ? undefined : value;
}

/** Converts a time field to seconds; ISO timestamps become Unix seconds. */
export function timeToSeconds(raw: string | number, unit: 's' | 'ms' | 'iso'): number | undefined {
  if (unit === 'iso') {
    if (typeof raw !== 'string') return undefined;
    const ms = Date.parse(raw.trim());
    return Number.isFinite(ms) ? ms / MS_PER_S : undefined;
  }
  const value = typeof raw === 'number' ? raw : parseStrictNumber(raw);
  if (value === undefined || !Number.isFinite(value)) return undefined;
  return unit === 'ms' ? value / MS_PER_S : value;
}

/** Volts from V or mV. */
export function toVolts(value: number, unit: 'V' | 'mV'): number {
  return (unit === 'mV' ? value / MILLI : value) + 0;
}

/** Amps from A or mA, flipped to the product's sign (positive = discharge). */
export function toAmps(value: number, unit: 'A' | 'mA', sign: CurrentSign): number {
  const amps = unit === 'mA' ? value / MILLI : value;
  // Adding 0 folds -0 (from "-0", a flipped 0 or an underflow) into 0, so frames compare and serialise cleanly.
  return (sign === 'discharge-negative' ? -amps : amps) + 0;
}

/** °C from °C, °F or K (the one conversion in shared/units). */
export { toCelsius } from '../../../shared/units/convert.js';
