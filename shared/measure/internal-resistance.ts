import { z } from 'zod';

/** One reading for resistance and dQ/dV work (a Reading fits). */
export interface VoltAmpReading {
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

/** How load steps are told apart from noise (defaults suit a logging meter). */
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
/** The quick test on running sums passes anything within half the floor, far beyond their rounding drift. */
const QUICK_TEST_SHARE = 0.5;

/** DC resistance from two operating points: R = −ΔV/ΔI (discharge-positive amps: more load, lower volts). */
export function resistanceFromPoints(volts1: number, amps1: number, volts2: number, amps2: number): number {
  const deltaAmps = amps2 - amps1;
  if (deltaAmps === 0) return Number.NaN;
  return -(volts2 - volts1) / deltaAmps;
}

/** The step finder's memory: a ring of the last 2 × window readings and the resistances found (plain JSON). */
export const LoadStepStateSchema = z.object({
  volts: z.array(z.number()),
  amps: z.array(z.number()),
  t: z.array(z.number()),
  /** Ring slot the next reading goes to; readings held (up to the ring's length). */
  next: z.number().int().nonnegative().default(0),
  held: z.number().int().nonnegative().default(0),
  /** Running sums of the amps in the older and the newer half of the ring (a quick first test; exact sums decide). */
  sumBefore: z.number().default(0),
  sumAfter: z.number().default(0),
  ohms: z.array(z.number()),
  steps: z.number().int().nonnegative(),
});
/** The step finder's state, as checked by LoadStepStateSchema. */
export type LoadStepState = z.infer<typeof LoadStepStateSchema>;

/** A fresh step finder. */
export function createLoadStepState(): LoadStepState {
  return { volts: [], amps: [], t: [], next: 0, held: 0, sumBefore: 0, sumAfter: 0, ohms: [], steps: 0 };
}

/** Mean of ring entries [from, to) in time order (0 = oldest). */
function meanOf(xs: readonly number[], start: number, from: number, to: number): number {
  const n = xs.length;
  let sum = 0;
  for (let i = from; i < to; i++) sum += xs[(start + i) % n]!;
  return sum / (to - from);
}

function varianceOf(xs: readonly number[], start: number, from: number, to: number, mean: number): number {
  const n = xs.length;
  let sum = 0;
  for (let i = from; i < to; i++) sum += (xs[(start + i) % n]! - mean) ** 2;
  return sum / (to - from - 1);
}

/** True when every reading of [from, to) is nearer `own` than `other`: the level held the whole window. */
function holds(xs: readonly number[], start: number, from: number, to: number, own: number, other: number): boolean {
  const n = xs.length;
  for (let i = from; i < to; i++) {
    const x = xs[(start + i) % n]!;
    if (Math.abs(x - own) >= Math.abs(x - other)) return false;
  }
  return true;
}

/**
 * Feeds one reading to the step finder (work proportional to the window, no allocation). A
 * load step is a change of mean current between the `w` readings before an edge and the `w`
 * after it that (1) is at least minStepAmps and 2 % of the current, (2) exceeds
 * NOISE_MULTIPLE standard errors of that change, from the readings' own scatter, and
 * (3) persists: every reading on each side sits nearer its own side's mean. Noise fails (1)
 * or (2); a ramp (a taper, a sag) fails (2); each step is found once, at its edge. A window
 * with a collapsed voltage (a protection opening) is no step. `gap` empties the window.
 */
export function trackLoadSteps(s: LoadStepState, reading: VoltAmpReading, gap: boolean, options: LoadStepOptions = {}): LoadStep | null {
  const w = options.windowReadings ?? DEFAULT_WINDOW_READINGS;
  const size = 2 * w;
  if (gap || s.amps.length !== size) {
    s.volts = new Array<number>(size).fill(0);
    s.amps = new Array<number>(size).fill(0);
    s.t = new Array<number>(size).fill(0);
    s.next = 0;
    s.held = 0;
  }
  const full = s.held === size;
  if (full) {
    // The oldest reading leaves the older half; the oldest of the newer half moves into it.
    const moving = s.amps[(s.next + w) % size]!;
    s.sumBefore += moving - s.amps[s.next]!;
    s.sumAfter += reading.amps - moving;
  }
  s.volts[s.next] = reading.volts;
  s.amps[s.next] = reading.amps;
  s.t[s.next] = reading.t;
  s.next = (s.next + 1) % size;
  if (!full) {
    s.held++;
    if (s.held < size) return null;
    s.sumBefore = meanOf(s.amps, s.next, 0, w) * w;
    s.sumAfter = meanOf(s.amps, s.next, w, size) * w;
  }
  const floorAmps = options.minStepAmps ?? DEFAULT_MIN_STEP_AMPS;
  // Quick test on the running sums (with room for their rounding drift); the exact means decide.
  if (Math.abs(s.sumAfter - s.sumBefore) / w < floorAmps * QUICK_TEST_SHARE) return null;
  const start = s.next; // the oldest reading
  const a1 = meanOf(s.amps, start, 0, w);
  const a2 = meanOf(s.amps, start, w, size);
  const deltaAmps = a2 - a1;
  const floor = Math.max(floorAmps, MIN_STEP_SHARE * Math.max(Math.abs(a1), Math.abs(a2)));
  if (Math.abs(deltaAmps) < floor) return null;
  const pooledVariance = (varianceOf(s.amps, start, 0, w, a1) + varianceOf(s.amps, start, w, size, a2)) * HALF;
  if (Math.abs(deltaAmps) <= NOISE_MULTIPLE * Math.sqrt((pooledVariance * 2) / w)) return null;
  if (!holds(s.amps, start, 0, w, a1, a2) || !holds(s.amps, start, w, size, a2, a1)) return null;
  const collapse = options.collapseVolts;
  if (collapse !== undefined && s.volts.some((v) => v <= collapse)) return null;
  const v1 = meanOf(s.volts, start, 0, w);
  const v2 = meanOf(s.volts, start, w, size);
  const step: LoadStep = { t: s.t[(start + w) % size]!, deltaVolts: v2 - v1, deltaAmps, ohms: resistanceFromPoints(v1, a1, v2, a2) };
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
export function internalResistanceFromSteps(readings: ArrayLike<VoltAmpReading>, options: LoadStepOptions = {}): { steps: LoadStep[]; medianOhms: number | null } {
  const s = createLoadStepState();
  const steps: LoadStep[] = [];
  for (let i = 0; i < readings.length; i++) {
    const step = trackLoadSteps(s, readings[i]!, false, options);
    if (step) steps.push(step);
  }
  return { steps, medianOhms: medianStepOhms(s) };
}
