import type { RunTotals } from '../schemas/reading.js';
import { addTo } from './compensated-sum.js';
import { splitPanel } from './trapezoid.js';
import { DEFAULT_MAX_GAP_SECONDS, resolveGapLimit, type GapLimitInput } from './gap-limit.js';
import {
  createIntegratorState, integratorTotals, IntegratorStateSchema, type IntegratorState,
} from './integrator-state.js';

export { createIntegratorState, integratorTotals, IntegratorStateSchema, rejectedCounts, type IntegratorState } from './integrator-state.js';

/** What happened to one frame: integrated, first of the run, after a gap, or refused. */
export type StepOutcome = 'integrated' | 'first' | 'gap' | 'non-finite' | 'out-of-range' | 'backwards' | 'duplicate';

/**
 * Largest |volts| or |amps| the core takes. Far beyond any bench (the ingest area's
 * per-bench limits are much tighter), and small enough that no product, sum or mean the
 * core forms can overflow to Infinity: 1e9 V × 1e9 A × 2e15 s per panel is about 2e33 J.
 */
export const CORE_MAX_ABS_VALUE = 1e9;
/** Largest |t| in seconds the core takes, so the difference of any two times stays finite. */
export const CORE_MAX_ABS_T_SECONDS = 1e15;

/** True when a finite frame lies inside the core's numeric range. */
export function withinCoreRange(t: number, volts: number, amps: number): boolean {
  return Math.abs(t) <= CORE_MAX_ABS_T_SECONDS && Math.abs(volts) <= CORE_MAX_ABS_VALUE && Math.abs(amps) <= CORE_MAX_ABS_VALUE;
}

export { DEFAULT_MAX_GAP_SECONDS, DEFAULT_GAP_FACTOR, MIN_GAP_SECONDS, resolveGapLimit, type GapLimit, type GapLimitBasis, type GapLimitInput } from './gap-limit.js';

// Scratch for splitPanel: one allocation for the module, not one per reading.
const panel: [number, number] = [0, 0];

/**
 * Adds one reading to the state by the trapezoidal rule (constant work).
 * Positive amps add to discharge totals, negative to charge; a panel that changes sign is
 * cut at its zero crossing. Non-finite values, values beyond the core's range, a t that
 * goes backwards or repeats, are counted and refused without touching the totals; a step longer than maxGapSeconds is
 * counted as a gap and restarts integration from this reading.
 */
export function integrateStep(s: IntegratorState, t: number, volts: number, amps: number, maxGapSeconds = DEFAULT_MAX_GAP_SECONDS): StepOutcome {
  if (!Number.isFinite(t) || !Number.isFinite(volts) || !Number.isFinite(amps)) {
    s.rejectedNonFinite++;
    return 'non-finite';
  }
  if (!withinCoreRange(t, volts, amps)) {
    s.rejectedOutOfRange = (s.rejectedOutOfRange ?? 0) + 1;
    return 'out-of-range';
  }
  const lastT = s.lastT;
  let outcome: StepOutcome = 'integrated';
  if (lastT === null) {
    outcome = 'first';
  } else {
    const dt = t - lastT;
    if (dt < 0) {
      s.rejectedBackwards++;
      return 'backwards';
    }
    if (dt === 0) {
      s.rejectedDuplicate++;
      return 'duplicate';
    }
    if (dt > maxGapSeconds) {
      s.gaps++;
      addTo(s.gapSeconds, dt);
      outcome = 'gap';
    } else {
      splitPanel(s.lastAmps, amps, dt, panel);
      if (panel[0] !== 0) addTo(s.dischargeAs, panel[0]);
      if (panel[1] !== 0) addTo(s.chargeAs, panel[1]);
      splitPanel(s.lastVolts * s.lastAmps, volts * amps, dt, panel);
      if (panel[0] !== 0) addTo(s.dischargeWs, panel[0]);
      if (panel[1] !== 0) addTo(s.chargeWs, panel[1]);
    }
  }
  s.lastT = t;
  s.lastVolts = volts;
  s.lastAmps = amps;
  s.accepted++;
  return outcome;
}

/** Options for integrating whole arrays; the gap limit is resolved as resolveGapLimit says. */
export interface IntegrateOptions extends GapLimitInput {
  /** Continue from this state (it is not modified). */
  from?: IntegratorState;
}

/** One reading as the array form takes it (a Frame fits). */
export interface ReadingPoint {
  t: number;
  volts: number;
  amps: number;
}

/** Integrates an array of readings in one pass; returns the totals and the final state. */
export function integrateReadings(readings: ArrayLike<ReadingPoint>, options: IntegrateOptions = {}): RunTotals & { state: IntegratorState } {
  const s = options.from ? IntegratorStateSchema.parse(structuredClone(options.from)) : createIntegratorState();
  const gapSeconds = resolveGapLimit(options).seconds;
  for (let i = 0; i < readings.length; i++) {
    const x = readings[i]!;
    integrateStep(s, x.t, x.volts, x.amps, gapSeconds);
  }
  return { ...integratorTotals(s), state: s };
}

/** Integrates column arrays (t, volts, amps) in one pass, as from a CSV or typed arrays. */
export function integrateColumns(t: ArrayLike<number>, volts: ArrayLike<number>, amps: ArrayLike<number>, options: IntegrateOptions = {}): RunTotals & { state: IntegratorState } {
  if (t.length !== volts.length || t.length !== amps.length) throw new RangeError('integrateColumns: columns differ in length');
  const s = options.from ? IntegratorStateSchema.parse(structuredClone(options.from)) : createIntegratorState();
  const gapSeconds = resolveGapLimit(options).seconds;
  for (let i = 0; i < t.length; i++) integrateStep(s, t[i]!, volts[i]!, amps[i]!, gapSeconds);
  return { ...integratorTotals(s), state: s };
}
