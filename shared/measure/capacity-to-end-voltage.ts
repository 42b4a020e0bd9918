import type { RunTotals } from '../schemas/reading.js';
import { createIntegratorState, integratorTotals } from './integrator-state.js';
import { DEFAULT_MAX_GAP_SECONDS, integrateStep, type ReadingPoint } from './integrator.js';

/**
 * Where a discharge ends for capacity purposes:
 * - `first-below`: through the first reading whose voltage is below the end voltage (the
 *   convention that reproduces the NASA PCoE B0005 capacity figures);
 * - `interpolated`: to the linearly interpolated instant the voltage crosses the end voltage.
 */
export type EndOfDischargeConvention = 'first-below' | 'interpolated';

export interface CapacityToEndVoltage extends RunTotals {
  /** False when the voltage never fell below the end voltage (totals are then the whole array). */
  reached: boolean;
  /** t at which the window ends (source clock). */
  endT: number;
}

/** Integrates readings from the first up to the end voltage, by the chosen convention. */
export function capacityToEndVoltage(
  readings: ArrayLike<ReadingPoint>,
  endVolts: number,
  convention: EndOfDischargeConvention = 'first-below',
  maxGapSeconds = DEFAULT_MAX_GAP_SECONDS,
): CapacityToEndVoltage {
  const s = createIntegratorState();
  let prev: ReadingPoint | null = null;
  for (let i = 0; i < readings.length; i++) {
    const x = readings[i]!;
    if (x.volts < endVolts && prev !== null && convention === 'interpolated' && prev.volts >= endVolts) {
      const f = (prev.volts - endVolts) / (prev.volts - x.volts);
      const t = prev.t + f * (x.t - prev.t);
      integrateStep(s, t, endVolts, prev.amps + f * (x.amps - prev.amps), maxGapSeconds);
      return { ...integratorTotals(s), reached: true, endT: t };
    }
    integrateStep(s, x.t, x.volts, x.amps, maxGapSeconds);
    if (x.volts < endVolts && (convention === 'first-below' || prev === null)) {
      return { ...integratorTotals(s), reached: true, endT: x.t };
    }
    prev = x;
  }
  return { ...integratorTotals(s), reached: false, endT: prev?.t ?? Number.NaN };
}
