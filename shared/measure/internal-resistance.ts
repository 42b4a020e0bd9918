import { z } from 'zod';

/** One sample for resistance and dQ/dV work (a Reading fits). */
export interface VoltAmpSample {
  t: number;
  volts: number;
  amps: number;
}

/** One load step and the resistance it shows. */
export interface LoadStep {
  t: number;
  deltaVolts: number;
  deltaAmps: number;
  ohms: number;
}

export interface LoadStepOptions {
  /** Smallest change of mean current that can count as a step, A (the noise may ask for more). */
  minStepAmps?: number;
  /** Readings averaged on each side of a step (noise rejection). */
  windowReadings?: number;
  /** A window with any reading at or below this voltage is no step (a protection opening, not a load change). */
  collapseVolts?: number;
}

const DEFAULT_MIN_STEP_AMPS = 0.1;
const DEFAULT_WINDOW_READINGS = 5;
/**
 * A step's change of mean current must exceed this many standard errors of that change,
 * estimated from the scatter of the readings on either side: meter noise never gets there.
 */
const NOISE_MULTIPLE = 8;
/** …and at least this share of the larger current, so a meter's noise at a high current is no step. */
const MIN_STEP_SHARE = 0.02;
/** Steps kept for the median (the count goes on). */
const MAX_STEPS_KEPT = 256;
const HALF = 0.5;

/** DC resistance from two operating points: R = −ΔV/ΔI (discharge-positive amps: more load, lower volts). */
export function resistanceFromPoints(volts1: number, amps1: number, volts2: number, amps2: number): number {
  const deltaAmps = amps2 - amps1;
  if (deltaAmps === 0) return Number.NaN;
  return -(volts2 - volts1) / deltaAmps;
}

/** The step finder's memory: the last 2 × window readings and the resistances found (plain JSON). */
export const LoadStepStateSchema = z.object({
  volts: z.array(z.number()),
  amps: z.array(z.number()),
  t: z.array(z.number()),
  ohms: z.array(z.number()),
  steps: z.number().int().nonnegative(),
});
export type LoadStepState = z.infer<typeof LoadStepStateSchema>;

/** A fresh step finder. */
export function createLoadStepState(): LoadStepState {
  return { volts: [], amps: [], t: [], ohms: [], steps: 0 };
}

function meanOf(xs: readonly number[], from: number, to: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += xs[i]!;
  return sum / (to - from);
}

function varianceOf(xs: readonly number[], from: number, to: number, mean: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += (xs[i]! - mean) ** 2;
  return sum / (to - from - 1);
}

/** True when every reading of [from, to) is nearer `own` than `other`: the level held the whole window. */
function holds(xs: readonly number[], from: number, to: number, own: number, other: number): boolean {
  for (let i = from; i < to; i++) if (Math.abs(xs[i]! - own) >= Math.abs(xs[i]! - other)) return false;
  return true;
}

/**
 * Feeds one reading to the step finder (work proportional to the window). A load step is a
 * change of mean current between the `w` readings before an edge and the `w` after it that
 * (1) exceeds NOISE_MULTIPLE standard errors of that change, from the readings' own scatter,
 * (2) is at least minStepAmps and 2 % of the current, and (3) persists: every reading on
 * each side sits nearer its own side's mean. A ramp (a taper, a sag) fails (1); noise fails
 * (1) or (2); each step is found once, at its edge. A window with a collapsed voltage (a
 * protection opening) is no step. `gap` empties the window.
 */
export function trackLoadSteps(s: LoadStepState, sample: VoltAmpSample, gap: boolean, options: LoadStepOptions = {}): LoadStep | null {
  const w = options.windowReadings ?? DEFAULT_WINDOW_READINGS;
  if (gap) {
    s.volts.length = 0;
    s.amps.length = 0;
    s.t.length = 0;
  }
  s.volts.push(sample.volts);
  s.amps.push(sample.amps);
  s.t.push(sample.t);
  if (s.amps.length > 2 * w) {
    s.volts.shift();
    s.amps.shift();
    s.t.shift();
  }
  if (s.amps.length < 2 * w) return null;
  const a1 = meanOf(s.amps, 0, w);
  const a2 = meanOf(s.amps, w, 2 * w);
  const deltaAmps = a2 - a1;
  const pooledVariance = (varianceOf(s.amps, 0, w, a1) + varianceOf(s.amps, w, 2 * w, a2)) * HALF;
  const standardError = Math.sqrt((pooledVariance * 2) / w);
  const floor = Math.max(options.minStepAmps ?? DEFAULT_MIN_STEP_AMPS, MIN_STEP_SHARE * Math.max(Math.abs(a1), Math.abs(a2)));
  if (Math.abs(deltaAmps) < floor || Math.abs(deltaAmps) <= NOISE_MULTIPLE * standardError) return null;
  if (!holds(s.amps, 0, w, a1, a2) || !holds(s.amps, w, 2 * w, a2, a1)) return null;
  const collapse = options.collapseVolts;
  if (collapse !== undefined && s.volts.some((v) => v <= collapse)) return null;
  const v1 = meanOf(s.volts, 0, w);
  const v2 = meanOf(s.volts, w, 2 * w);
  const step: LoadStep = { t: s.t[w]!, deltaVolts: v2 - v1, deltaAmps, ohms: resistanceFromPoints(v1, a1, v2, a2) };
  s.steps++;
  if (Number.isFinite(step.ohms)) {
    s.ohms.push(step.ohms);
    if (s.ohms.length > MAX_STEPS_KEPT) s.ohms.shift();
  }
  return step;
}

/** The median resistance of the steps found so far (null when none). */
export function medianStepOhms(s: LoadStepState): number | null {
  const ohms = [...s.ohms].sort((a, b) => a - b);
  if (ohms.length === 0) return null;
  const mid = Math.floor(ohms.length / 2);
  return ohms.length % 2 ? ohms[mid]! : (ohms[mid - 1]! + ohms[mid]!) * HALF;
}

/** Finds the load steps of a whole array (see trackLoadSteps) and their median resistance. */
export function internalResistanceFromSteps(samples: ArrayLike<VoltAmpSample>, options: LoadStepOptions = {}): { steps: LoadStep[]; medianOhms: number | null } {
  const s = createLoadStepState();
  const steps: LoadStep[] = [];
  for (let i = 0; i < samples.length; i++) {
    const step = trackLoadSteps(s, samples[i]!, false, options);
    if (step) steps.push(step);
  }
  return { steps, medianOhms: medianStepOhms(s) };
}
