import { describe, expect, it } from 'vitest';
import { FrameLimitsSchema } from '../../shared/schemas/bench.js';
import { frameOutOfBounds } from './frame-limits.js';

const defaults = FrameLimitsSchema.parse({});
const frame = (over: object = {}) => ({ t: 10, volts: 51.2, amps: 20, clock: 'arrival' as const, ...over });

describe('frameOutOfBounds', () => {
  it('passes a frame from an ordinary 48 V discharge', () => {
    expect(frameOutOfBounds(frame({ temps: { cell: 24.5 }, aux: { heaterAmps: 1.5 } }), defaults)).toBeNull();
  });

  it('names volts, amps and temperatures beyond the defaults (±2,000 V, ±5,000 A, -100…300 °C)', () => {
    expect(frameOutOfBounds(frame({ volts: 1e200, amps: 1e200 }), defaults)).toBe('volts 1e+200 beyond ±2000 V');
    expect(frameOutOfBounds(frame({ volts: -2000.5 }), defaults)).toMatch(/^volts -2000\.5 beyond/);
    expect(frameOutOfBounds(frame({ amps: -5001 }), defaults)).toBe('amps -5001 beyond ±5000 A');
    expect(frameOutOfBounds(frame({ temps: { cell: 25, ambient: 300.1 } }), defaults)).toBe('temperature ambient 300.1 °C outside -100…300 °C');
    expect(frameOutOfBounds(frame({ temps: { cell: -273.15 } }), defaults)).toBe('temperature cell -273.15 °C outside -100…300 °C');
    expect(frameOutOfBounds(frame({ aux: { heaterAmps: 6000 } }), defaults)).toMatch(/^heater amps 6000/);
  });

  it('keeps the bounds inclusive and takes a bench\'s own', () => {
    expect(frameOutOfBounds(frame({ volts: 2000, amps: -5000, temps: { cell: -100, pad: 300 } }), defaults)).toBeNull();
    const smallBench = FrameLimitsSchema.parse({ maxAbsVolts: 60, maxAbsAmps: 100, minTempCelsius: -40, maxTempCelsius: 90 });
    expect(frameOutOfBounds(frame({ volts: 61 }), smallBench)).toBe('volts 61 beyond ±60 V');
    expect(frameOutOfBounds(frame({ temps: { cell: 95 } }), smallBench)).toMatch(/outside -40…90 °C/);
  });

  it('refuses limits that make no sense', () => {
    expect(FrameLimitsSchema.safeParse({ minTempCelsius: 50, maxTempCelsius: 20 }).success).toBe(false);
    expect(FrameLimitsSchema.safeParse({ maxAbsVolts: 0 }).success).toBe(false);
    expect(FrameLimitsSchema.safeParse({ maxAbsAmps: 1e200 }).success).toBe(false);
  });
});
