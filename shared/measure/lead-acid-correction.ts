/**
 * Lead-acid capacity corrected to 25 °C by the IEEE 450 "time-adjusted" method
 * (IEEE Std 450, capacity test of vented lead-acid batteries):
 *   % capacity at 25 °C = t_a / (t_s × K_t) × 100
 * where t_a is the measured time to the end voltage, t_s the rated time and K_t the
 * temperature correction factor for the initial electrolyte temperature. For a
 * constant-current test the corrected Ah is measured Ah ÷ K_t.
 *
 * The K_t table below is FROM MEMORY (the IEEE 450 / IEEE 485 cell-temperature factor
 * table, two decimals, °F steps), not checked against a published copy: verify it against
 * your copy of the standard before relying on a verdict near the acceptance limit.
 * Between points it is interpolated linearly; outside the table it is refused.
 */
export const IEEE450_KT_FROM_MEMORY: ReadonlyArray<readonly [fahrenheit: number, kt: number]> = [
  [40, 1.3], [45, 1.25], [50, 1.19], [55, 1.15], [60, 1.11], [65, 1.08], [70, 1.04], [75, 1.01],
  [77, 1.0], [80, 0.98], [85, 0.97], [90, 0.94], [95, 0.93], [100, 0.91], [105, 0.89], [110, 0.88],
];

const FAHRENHEIT_PER_CELSIUS = 9 / 5;
const FAHRENHEIT_ZERO_OFFSET = 32;
const PERCENT = 100;

/** K_t for a cell temperature in °C, interpolated in the (from memory) IEEE 450 table. */
export function ieee450Factor(celsius: number, table = IEEE450_KT_FROM_MEMORY): number {
  const f = celsius * FAHRENHEIT_PER_CELSIUS + FAHRENHEIT_ZERO_OFFSET;
  const first = table[0]!;
  const last = table[table.length - 1]!;
  if (!(f >= first[0] && f <= last[0])) throw new RangeError(`ieee450Factor: ${celsius} °C is outside the table (${first[0]}–${last[0]} °F)`);
  for (let i = 1; i < table.length; i++) {
    const [f1, k1] = table[i - 1]!;
    const [f2, k2] = table[i]!;
    if (f <= f2) return k1 + ((f - f1) / (f2 - f1)) * (k2 - k1);
  }
  return last[1];
}

/** IEEE 450 time-adjusted % capacity at 25 °C: t_a / (t_s × K_t) × 100. */
export function ieee450PercentCapacity(actualSeconds: number, ratedSeconds: number, celsius: number): number {
  return (actualSeconds / (ratedSeconds * ieee450Factor(celsius))) * PERCENT;
}

/** Measured Ah corrected to 25 °C: Ah ÷ K_t (constant-current test). */
export function correctedAhAt25C(measuredAh: number, celsius: number): number {
  return measuredAh / ieee450Factor(celsius);
}
