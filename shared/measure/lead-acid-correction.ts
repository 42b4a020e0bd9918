import { celsiusToFahrenheit, fahrenheitToCelsius } from '../units/convert.js';

/**
 * Lead-acid capacity corrected to 25 °C (77 °F) for the initial electrolyte temperature, as
 * IEEE Std 450 asks of a capacity test of vented lead-acid batteries. A cold battery delivers
 * less than it would at 25 °C, so its measured figure is CREDITED (corrected > measured); a
 * warm one is debited.
 *
 * The table gives the capacity factor F(T) = capacity at 25 °C ÷ capacity at T, above 1 below
 * 25 °C (1.19 at 50 °F). Corrected Ah = measured Ah × F. IEEE Std 450's time-adjusted method
 * writes the same correction as % capacity = t_a ÷ (t_s × K_t) × 100 with a factor K_t that is
 * below 1 for a cold cell, that is the reciprocal of F; IEEE Std 485 tabulates the sizing
 * factor in the F form.
 *
 * FROM MEMORY until checked against a published copy: the values are recalled from the
 * IEEE 450 / IEEE 485 cell-temperature tables (two decimals, 5 °F steps), not copied from the
 * standard. Verify them against your copy before relying on a verdict near the acceptance
 * limit. 85 °F is 0.96, on the even 0.02-per-5 °F run from 80 to 90 °F (an earlier 0.97
 * broke it). Between points the factor is interpolated linearly; outside the table refused.
 */
export const CAPACITY_FACTOR_FROM_MEMORY: ReadonlyArray<readonly [fahrenheit: number, factor: number]> = [
  [40, 1.3], [45, 1.25], [50, 1.19], [55, 1.15], [60, 1.11], [65, 1.08], [70, 1.04], [75, 1.01],
  [77, 1.0], [80, 0.98], [85, 0.96], [90, 0.94], [95, 0.93], [100, 0.91], [105, 0.89], [110, 0.88],
];

const PERCENT = 100;

/** Celsius range the table covers (40 to 110 °F), for forms and messages. */
export const CAPACITY_FACTOR_CELSIUS_RANGE = {
  min: fahrenheitToCelsius(CAPACITY_FACTOR_FROM_MEMORY[0]![0]),
  max: fahrenheitToCelsius(CAPACITY_FACTOR_FROM_MEMORY[CAPACITY_FACTOR_FROM_MEMORY.length - 1]![0]),
} as const;

/** True when the table covers this electrolyte temperature. */
export function inCapacityFactorRange(celsius: number): boolean {
  return celsius >= CAPACITY_FACTOR_CELSIUS_RANGE.min - 1e-9 && celsius <= CAPACITY_FACTOR_CELSIUS_RANGE.max + 1e-9;
}

/** F(T) = capacity at 25 °C ÷ capacity at T for an electrolyte at `celsius` (above 1 when cold), from the table. */
export function capacityFactorTo25C(celsius: number, table = CAPACITY_FACTOR_FROM_MEMORY): number {
  const f = celsiusToFahrenheit(celsius);
  const first = table[0]!;
  const last = table[table.length - 1]!;
  // A hair of float noise at the ends (4.444… °C) must not refuse the table's own end points.
  const fClamped = Math.abs(f - first[0]) < 1e-9 ? first[0] : Math.abs(f - last[0]) < 1e-9 ? last[0] : f;
  if (!(fClamped >= first[0] && fClamped <= last[0])) throw new RangeError(`capacityFactorTo25C: ${celsius} °C is outside the table (${first[0]}–${last[0]} °F)`);
  for (let i = 1; i < table.length; i++) {
    const [f1, k1] = table[i - 1]!;
    const [f2, k2] = table[i]!;
    if (fClamped <= f2) return k1 + ((fClamped - f1) / (f2 - f1)) * (k2 - k1);
  }
  return last[1];
}

/** IEEE 450 time-adjusted % capacity at 25 °C: t_a ÷ (t_s × K_t) × 100, with K_t = 1 ÷ F(T). */
export function ieee450PercentCapacity(actualSeconds: number, ratedSeconds: number, celsius: number): number {
  return ((actualSeconds * capacityFactorTo25C(celsius)) / ratedSeconds) * PERCENT;
}

/** Measured Ah corrected to 25 °C: Ah × F(T), so a cold battery is credited (constant-current test). */
export function correctedAhAt25C(measuredAh: number, celsius: number): number {
  return measuredAh * capacityFactorTo25C(celsius);
}
