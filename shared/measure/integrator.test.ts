import { describe, expect, it } from 'vitest';
import { xyIntegration } from 'ml-spectra-processing';
import { integrateColumns, integrateReadings, integrateStep, createIntegratorState, integratorTotals, rejectedCounts } from './integrator.js';
import { trapezoid, trapezoidFunction } from './trapezoid.js';

const HOUR_S = 3600;

describe('trapezoidal rule against published values', () => {
  it('∫₀¹ e^(−x²) dx with n = 10 gives 0.7462107961', () => {
    // Source: the standard textbook example of the composite trapezoidal rule (e.g. Stewart,
    // Calculus, §7.7, from memory). Exact value √π/2·erf(1) =
    // 0.7468241328 (erf(1) = 0.8427007929, Abramowitz & Stegun, Table 7.1).
    const approx = trapezoidFunction((x) => Math.exp(-x * x), 0, 1, 10);
    expect(approx).toBeCloseTo(0.7462107961, 10);
    expect(Math.abs(approx - 0.7468241328)).toBeGreaterThan(5e-4); // the rule's known error, not zero
  });

  it('agrees with ml-spectra-processing xyIntegration on random data', () => {
    // Reference library: ml-spectra-processing (npm), xyIntegration (plain trapezoid).
    let seed = 12345;
    const rand = (): number => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (let trial = 0; trial < 20; trial++) {
      const n = 50 + Math.floor(rand() * 500);
      const x = new Float64Array(n);
      const y = new Float64Array(n);
      for (let i = 1; i < n; i++) x[i] = x[i - 1]! + 0.01 + rand();
      for (let i = 0; i < n; i++) y[i] = rand() * 100 - 20;
      const ref = xyIntegration({ x, y });
      expect(Math.abs(trapezoid(x, y) - ref)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref)));
    }
  });
});

describe('integrator: analytic cases exact to 1e-9', () => {
  it('constant 100 W (25 V × 4 A) for 2 h at 1 Hz is 200 Wh and 8 Ah', () => {
    // Analytic: E = P·t = 100 W × 2 h; Q = I·t = 4 A × 2 h.
    const n = 2 * HOUR_S + 1;
    const t = Array.from({ length: n }, (_, i) => i);
    const r = integrateColumns(t, t.map(() => 25), t.map(() => 4));
    expect(Math.abs(r.dischargeWh - 200)).toBeLessThan(1e-9);
    expect(Math.abs(r.dischargeAh - 8)).toBeLessThan(1e-9);
    expect(r.chargeWh).toBe(0);
  });

  it('a linear current ramp 0 → 10 A over 1 h at constant 12 V is 5 Ah and 60 Wh', () => {
    // Analytic: ∫₀ᵀ (I_max·t/T) dt = I_max·T/2; the trapezoid rule is exact for linear functions.
    const n = 7201;
    const t = Array.from({ length: n }, (_, i) => (i * HOUR_S) / (n - 1));
    const r = integrateColumns(t, t.map(() => 12), t.map((x) => (10 * x) / HOUR_S));
    expect(Math.abs(r.dischargeAh - 5)).toBeLessThan(1e-9);
    expect(Math.abs(r.dischargeWh - 60)).toBeLessThan(1e-9);
  });

  it('keeps charge apart from discharge and cuts a sign-changing panel at zero', () => {
    // Analytic: current +10 A → −10 A linearly over 2 h: 5 Ah out in the first hour, 5 Ah in in the second.
    const r = integrateReadings([
      { t: 0, volts: 10, amps: 10 },
      { t: 2 * HOUR_S, volts: 10, amps: -10 },
    ], { maxGapSeconds: 3 * HOUR_S });
    expect(r.dischargeAh).toBeCloseTo(5, 12);
    expect(r.chargeAh).toBeCloseTo(5, 12);
    expect(r.dischargeWh).toBeCloseTo(50, 12);
    expect(r.chargeWh).toBeCloseTo(50, 12);
  });
});

describe('integrator: bad input is counted and refused', () => {
  it('rejects non-finite values, backwards time and duplicates without touching totals', () => {
    const s = createIntegratorState();
    expect(integrateStep(s, 0, 12, 1)).toBe('first');
    expect(integrateStep(s, 1, 12, 1)).toBe('integrated');
    const before = integratorTotals(s);
    expect(integrateStep(s, 2, Number.NaN, 1)).toBe('non-finite');
    expect(integrateStep(s, 2, 12, Number.POSITIVE_INFINITY)).toBe('non-finite');
    expect(integrateStep(s, 0.5, 12, 1)).toBe('backwards');
    expect(integrateStep(s, 1, 12, 1)).toBe('duplicate');
    expect(integrateStep(s, 2, 1e200, 1e200)).toBe('out-of-range');
    expect(integratorTotals(s)).toEqual(before);
    expect(rejectedCounts(s)).toEqual({ nonFinite: 2, backwards: 1, duplicate: 1, outOfRange: 1, total: 5 });
    expect(integrateStep(s, 2, 12, 1)).toBe('integrated');
    expect(integratorTotals(s).dischargeAh).toBeCloseTo(2 / HOUR_S, 15);
  });

  it('does not integrate across a gap longer than the limit, and reports it', () => {
    const s = createIntegratorState();
    integrateStep(s, 0, 12, 10, 5);
    integrateStep(s, 1, 12, 10, 5);
    expect(integrateStep(s, 61, 12, 10, 5)).toBe('gap');
    integrateStep(s, 62, 12, 10, 5);
    // Two 1-second panels at 10 A; the 60 s gap adds nothing.
    expect(integratorTotals(s).dischargeAh).toBeCloseTo(20 / HOUR_S, 15);
    expect(s.gaps).toBe(1);
    expect(s.gapSeconds.sum).toBe(60);
  });

  it('resumes from archived totals and from a JSON round trip of its state', () => {
    const s = createIntegratorState({ dischargeWh: 100, dischargeAh: 4 });
    const maxGap = 2 * HOUR_S;
    integrateStep(s, 0, 25, 4, maxGap);
    integrateStep(s, HOUR_S, 25, 4, maxGap);
    const copy = JSON.parse(JSON.stringify(s)) as typeof s;
    integrateStep(copy, 2 * HOUR_S, 25, 4, maxGap);
    expect(integratorTotals(copy).dischargeWh).toBeCloseTo(300, 9);
    expect(integratorTotals(copy).dischargeAh).toBeCloseTo(12, 9);
  });
});
