import type { ReadingsResponse } from '../../../../shared/schemas/api-runs';
import type { Chemistry } from '../../../../shared/schemas/chemistry';
import { incrementalCapacity, type VoltChargePoint } from '../../../../shared/measure/incremental-capacity';
import { peukertRuntimeFromTest, TYPICAL_PEUKERT_EXPONENT } from '../../../../shared/measure/peukert';

/**
 * Width of a dQ/dV voltage bin per cell in series: a few millivolts per cell resolves the
 * plateaus of a lithium cell without drowning them in meter noise (common practice, from memory).
 */
export const IC_BIN_VOLTS_PER_CELL = 0.005;
/** The narrowest bin for a pack of unknown make-up, V. */
export const IC_MIN_BIN_VOLTS = 0.01;

/**
 * The discharge to the end voltage as volts against delivered Ah, from readings on the Ah axis:
 * each bucket's middle volts at its middle Ah (gaps skipped, nothing past `capacityAh`).
 */
export function dischargePoints(readings: ReadingsResponse, capacityAh: number): VoltChargePoint[] {
  const half = readings.reduced && readings.bucketSeconds ? readings.bucketSeconds / 2 : 0;
  const out: VoltChargePoint[] = [];
  for (let i = 0; i < readings.x.length; i++) {
    const lo = readings.volts.min[i];
    const hi = readings.volts.max[i];
    const ah = readings.x[i]! + half;
    if (lo === null || hi === null || lo === undefined || hi === undefined || ah > capacityAh) continue;
    out.push({ dischargeAh: ah, volts: (lo + hi) / 2 });
  }
  return out;
}

/** dQ/dV of a capacity run (Ah per volt against volts), with bins scaled to the cells in series. */
export function runIncrementalCapacity(readings: ReadingsResponse, capacityAh: number, cellsInSeries: number | null): { volts: number[]; dQdV: number[] } {
  const binVolts = Math.max(IC_MIN_BIN_VOLTS, IC_BIN_VOLTS_PER_CELL * (cellsInSeries ?? 1));
  return incrementalCapacity(dischargePoints(readings, capacityAh), { binVolts });
}

/** Multiples of the rated capacity (C-rates) the run-time table estimates at. */
export const ESTIMATE_C_RATES = [0.05, 0.1, 0.2, 0.5, 1] as const;
/** Multiples of the test current used when the pack has no rating. */
export const ESTIMATE_CURRENT_FACTORS = [0.25, 0.5, 2, 4] as const;

/** One row of the run-time table: a current and how long the pack would last at it. */
export interface RuntimeEstimate {
  amps: number;
  /** The current as a C-rate of the rated Ah, when the pack has a rating. */
  cRate: number | null;
  hours: number;
}

/** Run time at other currents from the measured discharge by Peukert, with exponent k. */
export function runtimeEstimates(testAh: number, testAmps: number, ratedAh: number | null, k: number): RuntimeEstimate[] {
  const rows =
    ratedAh !== null && ratedAh > 0
      ? ESTIMATE_C_RATES.map((c) => ({ amps: c * ratedAh, cRate: c }))
      : ESTIMATE_CURRENT_FACTORS.map((f) => ({ amps: f * testAmps, cRate: null }));
  return rows.map((r) => ({ ...r, hours: peukertRuntimeFromTest(testAh, testAmps, r.amps, k) }));
}

/** The exponent the estimate starts from: the chemistry's typical one, else that of an ideal battery. */
export function defaultPeukertExponent(chemistry: Chemistry | null): number {
  return (chemistry ? TYPICAL_PEUKERT_EXPONENT[chemistry] : null) ?? 1;
}
