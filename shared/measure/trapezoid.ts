import { addTo, createSum, sumValue } from './compensated-sum.js';

/** ∫ y dx by the trapezoidal rule over samples (x ascending), with compensated summation. */
export function trapezoid(x: ArrayLike<number>, y: ArrayLike<number>): number {
  if (x.length !== y.length) throw new RangeError(`trapezoid: x has ${x.length} samples, y has ${y.length}`);
  const s = createSum();
  for (let i = 1; i < x.length; i++) addTo(s, ((y[i - 1]! + y[i]!) / 2) * (x[i]! - x[i - 1]!));
  return sumValue(s);
}

/** Composite trapezoidal rule for a function f on [a, b] with n equal panels. */
export function trapezoidFunction(f: (x: number) => number, a: number, b: number, n: number): number {
  if (!Number.isInteger(n) || n < 1) throw new RangeError('trapezoidFunction: n must be a positive integer');
  const h = (b - a) / n;
  const s = createSum((f(a) + f(b)) / 2);
  for (let i = 1; i < n; i++) addTo(s, f(a + i * h));
  return sumValue(s) * h;
}

/**
 * Splits one trapezoid panel from y1 to y2 over dt into its positive and negative areas,
 * cutting at the linear zero crossing, so that a panel where the current changes sign adds
 * the right amounts to both the discharge and the charge totals.
 * Writes [positiveArea, negativeAreaMagnitude] into out.
 */
export function splitPanel(y1: number, y2: number, dt: number, out: [number, number]): void {
  if (y1 >= 0 && y2 >= 0) {
    out[0] = ((y1 + y2) / 2) * dt;
    out[1] = 0;
  } else if (y1 <= 0 && y2 <= 0) {
    out[0] = 0;
    out[1] = (-(y1 + y2) / 2) * dt;
  } else {
    const f = y1 / (y1 - y2); // fraction of dt before the zero crossing
    const first = (y1 / 2) * f * dt;
    const second = (y2 / 2) * (1 - f) * dt;
    out[0] = y1 > 0 ? first : second;
    out[1] = y1 > 0 ? -second : -first;
  }
}
