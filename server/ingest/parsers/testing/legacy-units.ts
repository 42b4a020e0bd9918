// Unit helpers as they were before the one-parser rewrite (regex number check): the oracle's own.
import type { CurrentSign } from '../../../../shared/schemas/bench.js';

const MS_PER_S = 1000; // vocab-rename: keep (the oracle keeps its own constants as they were)
const MILLI = 1000;
const KELVIN_OFFSET = 273.15;
const FAHRENHEIT_OFFSET = 32;
const FAHRENHEIT_PER_C = 1.8;

/** Parses a decimal number strictly (no empty string, no trailing junk, finite only). */
export function parseStrictNumber(text: string): number | undefined {
  const trimmed = text.trim();
  if (trimmed === '' || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed)) return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : undefined;
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

/** °C from °C, °F or K. */
export function toCelsius(value: number, unit: 'C' | 'F' | 'K'): number {
  if (unit === 'F') return (value - FAHRENHEIT_OFFSET) / FAHRENHEIT_PER_C;
  if (unit === 'K') return value - KELVIN_OFFSET;
  return value;
}
