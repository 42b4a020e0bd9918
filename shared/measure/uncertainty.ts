import { UNCERTAINTY_METHOD, type CapacityUncertainty, type MeterAccuracy } from '../schemas/meter-accuracy.js';
import { SECONDS_PER_HOUR } from '../units/time.js';

/**
 * Uncertainty of delivered Ah and Wh from a meter's data-sheet accuracy, by the law of
 * propagation of uncertainty of JCGM 100:2008 (the GUM), clause 5:
 * - each data-sheet limit a is a Type B evaluation with a rectangular distribution,
 *   u = a/√3 (GUM 4.3.7);
 * - the gain error (% of reading) is one systematic error shared by every reading, so it is
 *   fully correlated across readings and its effect on an integral is gain × the integral;
 * - the offset error is likewise one value for the whole run: its effect on ∫I dt is
 *   offset × the time under load;
 * - volts and amps errors are independent of each other; the combined standard
 *   uncertainty is the root sum of squares of the sensitivity-weighted terms (GUM 5.1.2);
 * - expanded uncertainty U = k·u with k = 2 (about 95 % for a near-normal result, GUM 6.3.3).
 *
 * For Ah = ∫I dt:      c(gain_I) = Ah,  c(offset_I) = t_load.
 * For Wh = ∫V·I dt:    c(gain_V) = Wh,  c(offset_V) = ∫I dt = Ah,
 *                      c(gain_I) = Wh,  c(offset_I) = ∫V dt.
 */
export const COVERAGE_FACTOR = 2;
const SQRT3 = Math.sqrt(3);
const PERCENT = 100;

/** The integrals the sensitivities come from, over the capacity's discharge. */
export interface CapacityIntegrals {
  /** ∫I dt, Ah. */
  ah: number;
  /** ∫V·I dt, Wh (null when not known). */
  wh: number | null;
  /** Time under load, s. */
  loadSeconds: number;
  /** ∫V dt under load, V·s. */
  voltSeconds: number;
}

/** Standard uncertainty of a rectangular (Type B) limit ±a: a/√3 (GUM 4.3.7). */
export function rectangularStandard(halfWidth: number): number {
  return halfWidth / SQRT3;
}

/** Root sum of squares of sensitivity-weighted standard uncertainties (GUM 5.1.2, uncorrelated inputs). */
export function rootSumSquares(terms: readonly number[]): number {
  return Math.sqrt(terms.reduce((acc, x) => acc + x * x, 0));
}

/** Standard uncertainty of ∫I dt, Ah: gain term (g/√3)·Ah and offset term (o/√3)·t_load. */
export function ampHourStandardUncertainty(acc: MeterAccuracy, x: CapacityIntegrals): number {
  const loadHours = x.loadSeconds / SECONDS_PER_HOUR;
  return rootSumSquares([
    rectangularStandard(acc.ampsGainPercent / PERCENT) * x.ah,
    rectangularStandard(acc.ampsOffsetAmps) * loadHours,
  ]);
}

/** Standard uncertainty of ∫V·I dt, Wh: the V and I gain and offset terms with sensitivities Wh, Ah, Wh and ∫V dt. */
export function wattHourStandardUncertainty(acc: MeterAccuracy, x: CapacityIntegrals & { wh: number }): number {
  const voltHours = x.voltSeconds / SECONDS_PER_HOUR;
  return rootSumSquares([
    rectangularStandard(acc.voltsGainPercent / PERCENT) * x.wh,
    rectangularStandard(acc.voltsOffsetVolts) * x.ah,
    rectangularStandard(acc.ampsGainPercent / PERCENT) * x.wh,
    rectangularStandard(acc.ampsOffsetAmps) * voltHours,
  ]);
}

/** Standard and expanded (k = 2) uncertainty of a capacity, with the method named. */
export function capacityUncertainty(acc: MeterAccuracy, x: CapacityIntegrals): CapacityUncertainty {
  const standardAh = ampHourStandardUncertainty(acc, x);
  const standardWh = x.wh === null ? null : wattHourStandardUncertainty(acc, { ...x, wh: x.wh });
  return {
    method: UNCERTAINTY_METHOD,
    coverageFactor: COVERAGE_FACTOR,
    standardAh,
    expandedAh: COVERAGE_FACTOR * standardAh,
    standardWh,
    expandedWh: standardWh === null ? null : COVERAGE_FACTOR * standardWh,
    accuracy: acc,
  };
}
