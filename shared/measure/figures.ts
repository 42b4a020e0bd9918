import type { Verdict } from '../schemas/run-summary.js';

/**
 * Default acceptance: delivered capacity ≥ 100 % of rated, the usual rated-capacity
 * acceptance for lithium cells and batteries under IEC 61960-3 (from memory; clause not cited).
 */
export const DEFAULT_ACCEPTANCE_PERCENT = 100;
const PERCENT = 100;
const WH_PER_KWH = 1000;

/** Delivered as % of rated; null when either is unknown or rated ≤ 0. */
export function percentOfRated(delivered: number | null | undefined, rated: number | null | undefined): number | null {
  if (delivered == null || rated == null || !(rated > 0)) return null;
  return (delivered / rated) * PERCENT;
}

/** Decimals a percentage of rated is shown with. */
export const PERCENT_DECIMALS = 1;
const PERCENT_SCALE = 10 ** PERCENT_DECIMALS;
/** Slack for binary rounding (10 Ah integrated to 9.999999999999 Ah is 100.0 %, not 99.9 %). */
const PERCENT_ROUNDING_SLACK = 1e-6;

/**
 * A percentage of rated as it is shown and judged: rounded down to 0.1 %, so 99.99 % shows
 * 99.9 % and fails a 100 % acceptance; "100.0 %" never stands beside a fail.
 */
export function percentShown(percent: number): number {
  return Math.floor(percent * PERCENT_SCALE + PERCENT_ROUNDING_SLACK) / PERCENT_SCALE;
}

/** Pass when every known percentage, as shown (percentShown), is ≥ the acceptance %; `unrated` when none is known. */
export function verdictFor(percents: ReadonlyArray<number | null>, acceptancePercent = DEFAULT_ACCEPTANCE_PERCENT): Verdict {
  const known = percents.filter((p): p is number => p !== null);
  if (known.length === 0) return 'unrated';
  return known.every((p) => percentShown(p) >= acceptancePercent) ? 'pass' : 'fail';
}

/** C-rate: current ÷ rated Ah (0.2 C for 10 A from a 50 Ah pack). */
export function cRate(amps: number | null | undefined, ratedAh: number | null | undefined): number | null {
  if (amps == null || ratedAh == null || !(ratedAh > 0)) return null;
  return Math.abs(amps) / ratedAh;
}

/** Price ÷ delivered kWh (currency per kWh of capacity); null when unknown or nothing delivered. */
export function costPerKWh(price: number | null | undefined, deliveredWh: number | null | undefined): number | null {
  if (price == null || deliveredWh == null || !(deliveredWh > 0)) return null;
  return price / (deliveredWh / WH_PER_KWH);
}

/** Specific energy, Wh/kg; null when mass is unknown. */
export function whPerKg(deliveredWh: number | null | undefined, massKg: number | null | undefined): number | null {
  if (deliveredWh == null || massKg == null || !(massKg > 0)) return null;
  return deliveredWh / massKg;
}

/** A percentage of rated and its expanded uncertainty, in percentage points. */
export interface PercentWithUncertainty {
  percent: number | null;
  expandedPercent: number | null;
}

/**
 * The verdict read with the capacity's expanded uncertainty U: fail when any known
 * percentage lies below the acceptance by more than U; borderline when any margin
 * (percentage − acceptance) lies within ±U; otherwise as verdictFor. Without a U it is verdictFor.
 */
export function verdictWithUncertainty(items: readonly PercentWithUncertainty[], acceptancePercent = DEFAULT_ACCEPTANCE_PERCENT): Verdict {
  const plain = verdictFor(items.map((i) => i.percent), acceptancePercent);
  if (plain === 'unrated') return plain;
  const judged = items.filter((i): i is { percent: number; expandedPercent: number } => i.percent !== null && i.expandedPercent !== null);
  if (judged.length === 0) return plain;
  const margins = judged.map((i) => ({ margin: i.percent - acceptancePercent, u: i.expandedPercent }));
  if (margins.some((m) => m.margin < -m.u)) return 'fail';
  if (margins.some((m) => Math.abs(m.margin) <= m.u)) return 'borderline';
  return plain;
}
