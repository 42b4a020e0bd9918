import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createIntegratorState, integrateReadings, integrateStep, integratorTotals, type ReadingPoint } from './integrator.js';

// Property tests (fast-check, npm): invariants of the trapezoidal rule, not example values.
const readingStream = (minAmps: number): fc.Arbitrary<ReadingPoint[]> =>
  fc
    .array(
      fc.record({
        dt: fc.double({ min: 0.001, max: 5, noNaN: true }),
        volts: fc.double({ min: 0.5, max: 60, noNaN: true }),
        amps: fc.double({ min: minAmps, max: 200, noNaN: true }),
      }),
      { minLength: 1, maxLength: 300 },
    )
    .map((rows) => {
      let t = 0;
      return rows.map((r) => ((t += r.dt), { t, volts: r.volts, amps: r.amps }));
    });

describe('integrator properties', () => {
  it('energy and charge never decrease during a discharge', () => {
    fc.assert(
      fc.property(readingStream(0), (readings) => {
        const s = createIntegratorState();
        let last = integratorTotals(s);
        for (const x of readings) {
          integrateStep(s, x.t, x.volts, x.amps);
          const now = integratorTotals(s);
          expect(now.dischargeWh).toBeGreaterThanOrEqual(last.dischargeWh);
          expect(now.dischargeAh).toBeGreaterThanOrEqual(last.dischargeAh);
          expect(now.chargeWh).toBe(0);
          last = now;
        }
      }),
    );
  });

  it('feeding a stream in chunks (through a JSON snapshot) gives the same totals as one pass', () => {
    fc.assert(
      fc.property(readingStream(-200), fc.array(fc.nat({ max: 300 }), { maxLength: 6 }), (readings, cuts) => {
        const whole = integrateReadings(readings);
        const bounds = [...new Set([0, ...cuts.map((c) => c % (readings.length + 1)), readings.length])].sort((a, b) => a - b);
        let state = createIntegratorState();
        for (let i = 1; i < bounds.length; i++) {
          const part = integrateReadings(readings.slice(bounds[i - 1], bounds[i]), { from: state });
          state = JSON.parse(JSON.stringify(part.state)) as typeof state;
        }
        expect(integratorTotals(state)).toEqual(integratorTotals(whole.state));
      }),
    );
  });
});
