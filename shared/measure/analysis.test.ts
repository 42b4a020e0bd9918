import { describe, expect, it } from 'vitest';
import { internalResistanceFromSteps, resistanceFromPoints } from './internal-resistance.js';
import { incrementalCapacity, movingAverage } from './incremental-capacity.js';
import { noise } from './synthetic-trace.test-helper.js';

describe('internal resistance from load steps (Ohm\'s law, R = −ΔV/ΔI; DC method, common practice)', () => {
  it('two operating points', () => {
    expect(resistanceFromPoints(26.0, 5, 25.8, 15)).toBeCloseTo(0.02, 12);
  });
  it('recovers 20 mΩ from a noisy 5 → 15 → 5 A step trace', () => {
    const n = noise(21);
    const R = 0.02;
    const samples = Array.from({ length: 300 }, (_, t) => {
      const amps = t >= 100 && t < 200 ? 15 : 5;
      return { t, amps: amps + n(0.02), volts: 26.4 - t * 0.0005 - amps * R + n(0.002) };
    });
    const { steps, medianOhms } = internalResistanceFromSteps(samples, { minStepAmps: 2, windowReadings: 5 });
    expect(steps).toHaveLength(2);
    expect(medianOhms!).toBeGreaterThan(R * 0.95);
    expect(medianOhms!).toBeLessThan(R * 1.05);
  });
});

describe('incremental capacity dQ/dV', () => {
  it('a linear discharge V = 26 − 0.1·Q gives a flat 10 Ah/V', () => {
    // Analytic: dQ/dV = −1/(dV/dQ) = 10 Ah/V.
    const pts = Array.from({ length: 2001 }, (_, i) => ({ dischargeAh: i * 0.025, volts: 26 - 0.1 * i * 0.025 }));
    const { dQdV } = incrementalCapacity(pts, { binVolts: 0.05, smoothBins: 1 });
    expect(dQdV.length).toBeGreaterThan(50);
    for (const x of dQdV) expect(x).toBeCloseTo(10, 6);
  });
  it('finds a plateau: logistic Q(V) peaks at V0 with height A/(4w), even with noise', () => {
    // Analytic: Q(V) = A/(1 + e^((V − V0)/w)) ⇒ |dQ/dV| peaks at V0 with A/(4w).
    const A = 50, V0 = 3.25, w = 0.02;
    const n = noise(22);
    const pts = Array.from({ length: 20_000 }, (_, i) => {
      const q = (A * (i + 0.5)) / 20_000;
      return { dischargeAh: q, volts: V0 + w * Math.log(A / q - 1) + n(0.0005) };
    });
    const { volts, dQdV } = incrementalCapacity(pts, { binVolts: 0.005, smoothBins: 3 });
    const peak = dQdV.indexOf(Math.max(...dQdV));
    expect(Math.abs(volts[peak]! - V0)).toBeLessThan(0.006);
    expect(Math.abs(dQdV[peak]! - A / (4 * w)) / (A / (4 * w))).toBeLessThan(0.05);
  });
  it('moving average keeps a constant and smooths a spike', () => {
    expect(movingAverage([2, 2, 2], 3)).toEqual([2, 2, 2]);
    expect(movingAverage([0, 3, 0], 3)[1]).toBe(1);
  });
});
