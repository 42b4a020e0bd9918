import type { Frame } from '../schemas/frame.js';

/** Test helper: a seeded uniform noise source (LCG, Numerical Recipes constants) so traces repeat exactly. */
export function noise(seed: number): (amplitude: number) => number {
  let x = seed >>> 0;
  return (amplitude) => {
    x = (Math.imul(x, 1664525) + 1013904223) >>> 0;
    return (x / 2 ** 32 - 0.5) * 2 * amplitude;
  };
}

/** Test helper: samples a trace at 1 Hz (or `hz`) from t0 to t1 inclusive. */
export function trace(t0: number, t1: number, at: (t: number) => Omit<Frame, 't' | 'clock'>, hz = 1): Frame[] {
  const out: Frame[] = [];
  for (let i = 0; t0 + i / hz <= t1; i++) {
    const t = t0 + i / hz;
    out.push({ t, clock: 'device', ...at(t) });
  }
  return out;
}
