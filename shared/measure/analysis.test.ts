import { derivative } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { internalResistanceFromSteps, resistanceFromPoints } from './internal-resistance.js';
import { incrementalCapacity, movingAverage } from './incremental-capacity.js';
import { noise } from './synthetic-trace.test-helper.js';
import { createRunPipeline } from './run-pipeline.js';
import { summarizeRun } from './summarize-run.js';

describe('internal resistance from load steps (Ohm\'s law, R = −ΔV/ΔI; DC method, common practice)', () => {
  it('two operating points', () => {
    expect(resistanceFromPoints(26.0, 5, 25.8, 15)).toBeCloseTo(0.02, 12);
  });
  it('recovers 20 mΩ from a noisy 5 → 15 → 5 A step trace', () => {
    const n = noise(21);
    const R = 0.02;
    const readings = Array.from({ length: 300 }, (_, t) => {
      const amps = t >= 100 && t < 200 ? 15 : 5;
      return { t, amps: amps + n(0.02), volts: 26.4 - t * 0.0005 - amps * R + n(0.002) };
    });
    const { steps, medianOhms } = internalResistanceFromSteps(readings, { minStepAmps: 2, windowReadings: 5 });
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
  it('matches the symbolic derivative mathjs gives for a curved discharge V(Q)', () => {
    // Check values: mathjs.derivative of V(Q), then dQ/dV = −1/(dV/dQ) at the bin centre.
    const curve = '3.3 + 0.8 * exp(-Q / 4) - 0.015 * Q';
    const v = (q: number) => 3.3 + 0.8 * Math.exp(-q / 4) - 0.015 * q;
    const dVdQ = derivative(curve, 'Q').compile();
    const qAt = (volts: number) => {
      let lo = 0, hi = 40; // V falls monotonically on [0, 40] Ah: bisection finds Q(V).
      for (let i = 0; i < 60; i++) [lo, hi] = v((lo + hi) / 2) > volts ? [(lo + hi) / 2, hi] : [lo, (lo + hi) / 2];
      return (lo + hi) / 2;
    };
    const pts = Array.from({ length: 40_001 }, (_, i) => ({ dischargeAh: i * 0.001, volts: v(i * 0.001) }));
    const { volts, dQdV } = incrementalCapacity(pts, { binVolts: 0.002, smoothBins: 1 });
    expect(volts.length).toBeGreaterThan(300);
    volts.forEach((centre, i) => {
      const expected = -1 / (dVdQ.evaluate({ Q: qAt(centre) }) as number);
      expect(Math.abs(dQdV[i]! - expected) / expected).toBeLessThan(0.01);
    });
  });
  it('moving average keeps a constant and smooths a spike', () => {
    expect(movingAverage([2, 2, 2], 3)).toEqual([2, 2, 2]);
    expect(movingAverage([0, 3, 0], 3)[1]).toBe(1);
  });
});

describe('internal resistance: load steps told apart from meter noise (issue 11, item 14)', () => {
  it('±0.6 A of meter noise at 100 A gives no steps (was 100 "steps", median −0.10 mΩ)', () => {
    for (const seed of [1, 2, 3]) {
      const n = noise(seed);
      const readings = Array.from({ length: 20_000 }, (_, t) => ({ t, amps: 100 + n(0.6), volts: 51.2 - 0.002 * 100 + n(0.01) }));
      expect(internalResistanceFromSteps(readings)).toEqual({ steps: [], medianOhms: null });
    }
  });

  it('a slow taper (a CV charge) is no step; a real 100 → 150 A step under the same noise is found once', () => {
    const taper = Array.from({ length: 3600 }, (_, t) => ({ t, amps: -(50 - (45 * t) / 3600), volts: 57.6 }));
    expect(internalResistanceFromSteps(taper).steps).toHaveLength(0);
    // Ohm's law: R = −ΔV/ΔI = 2 mΩ (common-practice DC method); 0.6 A and 10 mV of noise.
    const n = noise(9);
    const R = 0.002;
    const readings = Array.from({ length: 600 }, (_, t) => {
      const amps = t >= 300 ? 150 : 100;
      return { t, amps: amps + n(0.6), volts: 53 - amps * R + n(0.01) };
    });
    const { steps, medianOhms } = internalResistanceFromSteps(readings);
    expect(steps).toHaveLength(1);
    expect(steps[0]!.t).toBe(300);
    expect(Math.abs(medianOhms! - R)).toBeLessThan(0.0005);
  });

  it('the run pipeline finds the steps as it runs, so a run\'s summary shows a value (was always "—")', () => {
    const n = noise(21);
    const R = 0.02;
    const frames = Array.from({ length: 300 }, (_, t) => {
      const amps = t >= 100 && t < 200 ? 15 : 5;
      return { t, clock: 'device' as const, amps: amps + n(0.02), volts: 26.4 - t * 0.0005 - amps * R + n(0.002) };
    });
    const p = createRunPipeline({ chemistry: 'lfp', cellsInSeries: 8 });
    const { events } = p.pushMany(frames);
    const s = summarizeRun({ snapshot: p.snapshot(), events });
    expect(s.loadStepCount).toBe(2);
    expect(Math.abs(s.internalResistanceOhms! - R)).toBeLessThan(R * 0.05);
  });
});
