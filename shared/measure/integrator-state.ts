import { z } from 'zod';
import type { RunTotals } from '../schemas/reading.js';
import { SECONDS_PER_HOUR } from '../units/time.js';
import { createSum, sumValue, type CompensatedSum } from './compensated-sum.js';

const SumSchema = z.object({ sum: z.number().finite(), comp: z.number().finite() });
const Count = z.number().int().nonnegative();

/**
 * Everything the integrator carries from one reading to the next, as a plain
 * JSON-safe object: archive it, and a restarted server resumes exactly where it stopped.
 * Sums are in A·s and W·s (J) so each step adds one product; Wh/Ah are derived on read.
 */
export const IntegratorStateSchema = z.object({
  version: z.literal(1),
  lastT: z.number().finite().nullable(),
  lastVolts: z.number().finite(),
  lastAmps: z.number().finite(),
  dischargeAs: SumSchema,
  dischargeWs: SumSchema,
  chargeAs: SumSchema,
  chargeWs: SumSchema,
  accepted: Count,
  rejectedNonFinite: Count,
  rejectedBackwards: Count,
  rejectedDuplicate: Count,
  /** Frames beyond the core's numeric range (absent in states from before it was counted). */
  rejectedOutOfRange: Count.default(0),
  gaps: Count,
  gapSeconds: SumSchema,
});

export type IntegratorState = z.infer<typeof IntegratorStateSchema>;

/** A fresh integrator state, or one seeded from archived totals so a run can resume. */
export function createIntegratorState(seed?: Partial<RunTotals>): IntegratorState {
  const fromWh = (wh = 0): CompensatedSum => createSum(wh * SECONDS_PER_HOUR);
  return {
    version: 1,
    lastT: null,
    lastVolts: 0,
    lastAmps: 0,
    dischargeAs: fromWh(seed?.dischargeAh),
    dischargeWs: fromWh(seed?.dischargeWh),
    chargeAs: fromWh(seed?.chargeAh),
    chargeWs: fromWh(seed?.chargeWh),
    accepted: 0,
    rejectedNonFinite: 0,
    rejectedBackwards: 0,
    rejectedDuplicate: 0,
    rejectedOutOfRange: 0,
    gaps: 0,
    gapSeconds: createSum(),
  };
}

/** Running Wh/Ah out and in from a state. */
export function integratorTotals(s: IntegratorState): RunTotals {
  return {
    dischargeWh: sumValue(s.dischargeWs) / SECONDS_PER_HOUR,
    dischargeAh: sumValue(s.dischargeAs) / SECONDS_PER_HOUR,
    chargeWh: sumValue(s.chargeWs) / SECONDS_PER_HOUR,
    chargeAh: sumValue(s.chargeAs) / SECONDS_PER_HOUR,
  };
}

/** Frames refused so far, by reason, and in all. */
export function rejectedCounts(s: IntegratorState): { nonFinite: number; backwards: number; duplicate: number; outOfRange: number; total: number } {
  const outOfRange = s.rejectedOutOfRange ?? 0;
  const total = s.rejectedNonFinite + s.rejectedBackwards + s.rejectedDuplicate + outOfRange;
  return { nonFinite: s.rejectedNonFinite, backwards: s.rejectedBackwards, duplicate: s.rejectedDuplicate, outOfRange, total };
}

/** A deep copy of a state (snapshots must not alias the live one). */
export function cloneIntegratorState(s: IntegratorState): IntegratorState {
  return IntegratorStateSchema.parse(JSON.parse(JSON.stringify(s)));
}
