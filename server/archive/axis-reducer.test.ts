import { describe, expect, it } from 'vitest';
import { dischargeAxis, reduceOverDischarge } from './axis-reducer.js';
import { integrateColumns } from '../../shared/measure/integrator.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';


/** A constant-current discharge: I amps for `seconds` s at one reading a second, volts falling linearly. */
function constantCurrent(amps: number, seconds: number, v0: number, voltsPerSecond: number) {
  const elapsed = Array.from({ length: seconds + 1 }, (_, i) => i);
  return {
    elapsedSeconds: Float64Array.from(elapsed),
    volts: Float64Array.from(elapsed, (t) => v0 - voltsPerSecond * t),
    amps: Float64Array.from(elapsed, () => amps),
  };
}

describe('delivered-discharge axis', () => {
  it('analytic check: at constant current I the delivered Ah at time t is exactly I·t/3600', () => {
    // Analytic: Q(t) = ∫0..t I dt = I·t (coulombs), /3600 for Ah. The trapezoid rule is exact for a
    // constant (and any linear) integrand (any numerical-analysis handbook, e.g. Burden & Faires ch. 4).
    const amps = 10;
    const { x } = dischargeAxis([constantCurrent(amps, 3600, 13.2, 0.0005)], 'ah');
    for (const t of [0, 1, 360, 1800, 3599, 3600]) expect(x[t]).toBe((amps * t) / SECONDS_PER_HOUR);
  });

  it('analytic check: Wh at constant current with linearly falling volts is I·(V0·t − k·t²/2)/3600', () => {
    // Analytic: E(t) = ∫0..t I·(V0 − k·s) ds = I·(V0·t − k·t²/2); trapezoid exact for a linear integrand.
    const amps = 5;
    const v0 = 13.2;
    const k = 0.0005;
    const { x } = dischargeAxis([constantCurrent(amps, 3600, v0, k)], 'wh');
    for (const t of [100, 1800, 3600]) expect(x[t]).toBeCloseTo((amps * (v0 * t - (k * t * t) / 2)) / SECONDS_PER_HOUR, 9);
  });

  it('ends at the total the core integrator gives for the same columns', () => {
    const c = constantCurrent(7.5, 2000, 12.8, 0.001);
    const core = integrateColumns(c.elapsedSeconds, c.volts, c.amps);
    expect(dischargeAxis([c], 'ah').x[2000]).toBe(core.dischargeAh);
    expect(dischargeAxis([c], 'wh').x[2000]).toBe(core.dischargeWh);
  });

  it('buckets over Ah: equal widths from 0 to the delivered total, each bucket keeps its volts extremes', () => {
    const c = constantCurrent(10, 3600, 13.2, 0.0005); // 10 Ah delivered
    const r = reduceOverDischarge([c], 'ah', {}, 40);
    expect(r.reduced).toBe(true);
    expect(r.from).toBe(0);
    expect(r.to).toBe(10);
    expect(r.t).toHaveLength(40);
    expect(r.bucketSeconds).toBe(10 / 40); // bucket width in Ah
    expect(r.t[1]).toBe(0.25);
    // Readings at Ah in [0, 0.25): t = 0..89 s, so volts 13.2 down to 13.2 − 0.0005·89.
    expect(r.volts.max[0]).toBe(13.2);
    expect(r.volts.min[0]).toBeCloseTo(13.2 - 0.0005 * 89, 12);
    // The last reading (t = 3600 s, exactly 10 Ah) lands in the last bucket.
    expect(r.volts.min[39]).toBeCloseTo(13.2 - 0.0005 * 3600, 12);
  });

  it('a rest after the load adds no Ah: the recovering volts stay at the delivered total', () => {
    const c = constantCurrent(10, 360, 13, 0.001); // 1 Ah
    const rest = { elapsedSeconds: Float64Array.from([361, 362, 363]), volts: Float64Array.from([12.8, 12.9, 13.0]), amps: Float64Array.from([0, 0, 0]) };
    const r = reduceOverDischarge([c, rest], 'ah', { from: 0.99, to: 1.01 }, 100);
    expect(r.reduced).toBe(false);
    // Ah after the load ramps from 10 A to 0 over one second: 1 Ah + 5 As.
    expect(r.t.at(-1)).toBeCloseTo(1 + 5 / SECONDS_PER_HOUR, 12);
    expect(r.volts.max.at(-1)).toBe(13.0);
  });

  it('does not integrate across a gap longer than the limit', () => {
    const before = constantCurrent(10, 10, 13, 0);
    const after = { elapsedSeconds: Float64Array.from([1000, 1001]), volts: Float64Array.from([13, 13]), amps: Float64Array.from([10, 10]) };
    const { x } = dischargeAxis([before, after], 'ah', 30);
    expect(x[11]).toBe(x[10]); // the reading after the gap restarts integration
    expect(x[12]).toBe(x[10] + 10 / SECONDS_PER_HOUR);
  });

  it('refuses a window that ends before it starts', () => {
    expect(() => reduceOverDischarge([constantCurrent(1, 10, 12, 0)], 'ah', { from: 2, to: 1 }, 10)).toThrow(RangeError);
  });
});
