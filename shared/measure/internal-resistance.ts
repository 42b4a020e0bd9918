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
  /** Smallest change of current between neighbouring readings that counts as a step, A. */
  minStepAmps?: number;
  /** Readings averaged on each side of a step (noise rejection). */
  windowReadings?: number;
}

const DEFAULT_MIN_STEP_AMPS = 1;
const DEFAULT_WINDOW_READINGS = 3;

/** DC resistance from two operating points: R = −ΔV/ΔI (discharge-positive amps: more load, lower volts). */
export function resistanceFromPoints(volts1: number, amps1: number, volts2: number, amps2: number): number {
  const deltaAmps = amps2 - amps1;
  if (deltaAmps === 0) return Number.NaN;
  return -(volts2 - volts1) / deltaAmps;
}

function mean(samples: ArrayLike<VoltAmpSample>, from: number, to: number, key: 'volts' | 'amps'): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += samples[i]![key];
  return sum / (to - from);
}

/**
 * Finds load steps (|ΔI| ≥ minStepAmps between neighbouring readings) and returns ΔV/ΔI for
 * each, from the mean of `windowReadings` readings before and after the step, so that the
 * meter's noise averages out. Steps whose windows would overlap another step are skipped.
 */
export function internalResistanceFromSteps(samples: ArrayLike<VoltAmpSample>, options: LoadStepOptions = {}): { steps: LoadStep[]; medianOhms: number | null } {
  const minStep = options.minStepAmps ?? DEFAULT_MIN_STEP_AMPS;
  const w = options.windowReadings ?? DEFAULT_WINDOW_READINGS;
  const edges: number[] = [];
  for (let i = 1; i < samples.length; i++) if (Math.abs(samples[i]!.amps - samples[i - 1]!.amps) >= minStep) edges.push(i);
  const steps: LoadStep[] = [];
  for (let j = 0; j < edges.length; j++) {
    const i = edges[j]!;
    const before = Math.max(j > 0 ? edges[j - 1]! : 0, i - w);
    const after = Math.min(j + 1 < edges.length ? edges[j + 1]! : samples.length, i + w);
    if (i - before < 1 || after - i < 1) continue;
    const v1 = mean(samples, before, i, 'volts');
    const a1 = mean(samples, before, i, 'amps');
    const v2 = mean(samples, i, after, 'volts');
    const a2 = mean(samples, i, after, 'amps');
    steps.push({ t: samples[i]!.t, deltaVolts: v2 - v1, deltaAmps: a2 - a1, ohms: resistanceFromPoints(v1, a1, v2, a2) });
  }
  const ohms = steps.map((s) => s.ohms).filter(Number.isFinite).sort((a, b) => a - b);
  const mid = Math.floor(ohms.length / 2);
  const medianOhms = ohms.length === 0 ? null : ohms.length % 2 ? ohms[mid]! : (ohms[mid - 1]! + ohms[mid]!) / 2;
  return { steps, medianOhms };
}
