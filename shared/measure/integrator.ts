import type { RunTotals } from '../schemas/reading.js';
import { addTo } from './compensated-sum.js';
import { splitPanel } from './trapezoid.js';
import { DEFAULT_MAX_GAP_SECONDS, resolveGapLimit, type GapLimitInput } from './gap-limit.js';
import {
  createIntegratorState, integratorTotals, IntegratorStateSchema, type IntegratorState,
} from './integrator-state.js';

export { createIntegratorState, integratorTotals, IntegratorStateSchema, rejectedCounts, type IntegratorState } from './integrator-state.js';

/** What happened to one frame: integrated, first of the run, after a gap, or refused. */
export type StepOutcome = 'integrated' | 'first' | 'gap' | 'non-finite' | 'backwards' | 'duplicate';

export { DEFAULT_MAX_GAP_SECONDS, DEFAULT_GAP_FACTOR, MIN_GAP_SECONDS, resolveGapLimit, type GapLimit, type GapLimitBasis, type GapLimitInput } from './gap-limit.js';

// Scratch for splitPanel: one allocation for the module, not one per reading.
const panel: [number, number] = [0, 0];

/**
 * Adds one reading to the state by the trapezoidal rule (constant work).
 * Positive amps add to discharge totals, negative to charge; a panel that changes sign is
 * cut at its zero crossing. Non-finite values, a t that goes backwards or repeats, are
 * counted and refused without touching the totals; a step longer than maxGapSeconds is
 * counted as a gap and restarts integration from this reading.
 */
export function integrateStep(s: IntegratorState, t: number, volts: number, amps: number, maxGapSeconds = DEFAULT_MAX_GAP_SECONDS): StepOutcome {
  if (!Number.isFinite(t) || !Number.isFinite(volts) || !Number.isFinite(amps)) {
    s.rejectedNonFinite++;
    return 'non-finite';
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

/** One sample as the array form takes it (a Frame fits). */
export interface Sample {
  t: number;
  volts: number;
  amps: number;
}

/** Integrates an array of samples in one pass; returns the totals and the final state. */
export function integrateSamples(samples: ArrayLike<Sample>, options: IntegrateOptions = {}): RunTotals & { state: IntegratorState } {
  const s = options.from ? IntegratorStateSchema.parse(structuredClone(options.from)) : createIntegratorState();
  const gapSeconds = resolveGapLimit(options).seconds;
  for (let i = 0; i < samples.length; i++) {
    const x = samples[i]!;
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
