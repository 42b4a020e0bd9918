import { celsiusToFahrenheit, whToKWh, ahToMah } from './convert.js';
import { HOURS_PER_DAY, SECONDS_PER_DAY, SECONDS_PER_HOUR, SECONDS_PER_MINUTE } from './time.js';

/** Shown for a value that is missing or not a finite number. */
export const NO_VALUE = '—';
export type TemperatureUnit = 'C' | 'F';
export type EnergyUnit = 'Wh' | 'kWh' | 'auto';
export type ChargeUnit = 'Ah' | 'mAh' | 'auto';

/** `auto` switches to kWh from this many Wh, and to mAh below 1 Ah. */
const AUTO_KWH_FROM_WH = 10_000;
const AUTO_MAH_BELOW_AH = 1;

const formatters = new Map<number, Intl.NumberFormat>();

/** A number with fixed decimals and thousands separators ("1,280.0"); NO_VALUE when not finite. */
export function formatNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  let f = formatters.get(decimals);
  if (!f) {
    // en-US grouping keeps exports and screens identical whatever the browser's locale.
    f = new Intl.NumberFormat('en-US', { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
    formatters.set(decimals, f);
  }
  const text = f.format(value);
  // "-0.00" reads like a fault on a bench screen; show it as zero.
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

function withUnit(value: number | null | undefined, decimals: number, unit: string): string {
  const text = formatNumber(value, decimals);
  return text === NO_VALUE ? NO_VALUE : `${text} ${unit}`;
}

/** Volts, e.g. "25.60 V". */
export function formatVolts(volts: number | null | undefined, decimals = 2): string {
  return withUnit(volts, decimals, 'V');
}

/** Amps, e.g. "12.49 A". */
export function formatAmps(amps: number | null | undefined, decimals = 2): string {
  return withUnit(amps, decimals, 'A');
}

/** Watts, e.g. "337.0 W". */
export function formatWatts(watts: number | null | undefined, decimals = 1): string {
  return withUnit(watts, decimals, 'W');
}

/** Energy in Wh or kWh ("1,280.0 Wh", "12.800 kWh"); `auto` picks kWh from 10,000 Wh. */
export function formatEnergy(wh: number | null | undefined, unit: EnergyUnit = 'Wh', decimals?: number): string {
  const useKWh = unit === 'kWh' || (unit === 'auto' && wh != null && Math.abs(wh) >= AUTO_KWH_FROM_WH);
  return useKWh ? withUnit(wh == null ? wh : whToKWh(wh), decimals ?? 3, 'kWh') : withUnit(wh, decimals ?? 1, 'Wh');
}

/** Charge in Ah or mAh ("50.70 Ah", "1,856 mAh"); `auto` picks mAh below 1 Ah. */
export function formatCharge(ah: number | null | undefined, unit: ChargeUnit = 'Ah', decimals?: number): string {
  const useMah = unit === 'mAh' || (unit === 'auto' && ah != null && Math.abs(ah) < AUTO_MAH_BELOW_AH);
  return useMah ? withUnit(ah == null ? ah : ahToMah(ah), decimals ?? 0, 'mAh') : withUnit(ah, decimals ?? 2, 'Ah');
}

/** A temperature stored in °C, shown in °C or °F ("25.0 °C", "77.0 °F"). */
export function formatTemperature(celsius: number | null | undefined, unit: TemperatureUnit = 'C', decimals = 1): string {
  const value = unit === 'F' && celsius != null ? celsiusToFahrenheit(celsius) : celsius;
  return withUnit(value, decimals, unit === 'F' ? '°F' : '°C');
}

/** A percentage, e.g. "101.4 %". */
export function formatPercent(percent: number | null | undefined, decimals = 1): string {
  return withUnit(percent, decimals, '%');
}

const pad2 = (n: number): string => String(n).padStart(2, '0');

/**
 * A duration for people: "42 s", "5 min 03 s", "2 h 05 min", "3 d 04 h".
 * Rounds to the shown resolution (whole seconds under an hour, whole minutes above).
 */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return NO_VALUE;
  const sign = seconds < 0 ? '-' : '';
  const total = Math.abs(seconds);
  if (Math.round(total) < SECONDS_PER_MINUTE) return `${sign}${Math.round(total)} s`;
  if (Math.round(total) < SECONDS_PER_HOUR) {
    const s = Math.round(total);
    return `${sign}${Math.floor(s / SECONDS_PER_MINUTE)} min ${pad2(s % SECONDS_PER_MINUTE)} s`;
  }
  const minutes = Math.round(total / SECONDS_PER_MINUTE);
  const minutesPerDay = SECONDS_PER_DAY / SECONDS_PER_MINUTE;
  const minutesPerHour = SECONDS_PER_HOUR / SECONDS_PER_MINUTE;
  if (minutes < minutesPerDay) return `${sign}${Math.floor(minutes / minutesPerHour)} h ${pad2(minutes % minutesPerHour)} min`;
  const hours = Math.round(total / SECONDS_PER_HOUR);
  return `${sign}${Math.floor(hours / HOURS_PER_DAY)} d ${pad2(hours % HOURS_PER_DAY)} h`;
}

/** A clock-style elapsed time for exports and axes: "02:05:09" (hours may exceed 24). */
export function formatElapsedClock(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return NO_VALUE;
  const s = Math.round(Math.abs(seconds));
  const h = Math.floor(s / SECONDS_PER_HOUR);
  const m = Math.floor((s % SECONDS_PER_HOUR) / SECONDS_PER_MINUTE);
  return `${seconds < 0 ? '-' : ''}${pad2(h)}:${pad2(m)}:${pad2(s % SECONDS_PER_MINUTE)}`;
}
