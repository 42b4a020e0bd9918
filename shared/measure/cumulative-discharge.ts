import { createIntegratorState, integrateStep, integratorTotals } from './integrator.js';
import { DEFAULT_MAX_GAP_SECONDS } from './gap-limit.js';

/** Delivered charge and energy so far at each reading, Ah and Wh (never decreasing). */
export interface CumulativeDischarge {
  ah: Float64Array;
  wh: Float64Array;
}

/**
 * Cumulative discharge Ah and Wh at each reading of time-ordered columns, by the core's own
 * integrator step (trapezoid, gap limit, refusals alike), so the figure at the last reading
 * is the run's delivered total. A refused reading keeps the total reached before it.
 */
export function cumulativeDischarge(
  tSeconds: ArrayLike<number>,
  volts: ArrayLike<number>,
  amps: ArrayLike<number>,
  maxGapSeconds: number = DEFAULT_MAX_GAP_SECONDS,
): CumulativeDischarge {
  const n = tSeconds.length;
  if (volts.length !== n || amps.length !== n) throw new RangeError('cumulativeDischarge: columns differ in length');
  const s = createIntegratorState();
  const ah = new Float64Array(n);
  const wh = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    integrateStep(s, tSeconds[i]!, volts[i]!, amps[i]!, maxGapSeconds);
    const totals = integratorTotals(s);
    ah[i] = totals.dischargeAh;
    wh[i] = totals.dischargeWh;
  }
  return { ah, wh };
}
