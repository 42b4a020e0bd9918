import { describe, expect, it } from 'vitest';
import { createHeater } from './heater.js';

describe('heater thermostat', () => {
  const params = { watts: 60, ratedVolts: 25.6, onBelowC: 0, offAboveC: 5 };

  it('switches on below the lower threshold and off above the upper one (hysteresis)', () => {
    const heater = createHeater(params);
    const path = [3, 1, 0.1, -0.1, 2, 4.9, 5.1, 3, 0.5, -0.5];
    const switches = path.map((t) => heater.update(t));
    expect(switches).toEqual([undefined, undefined, undefined, 'on', undefined, undefined, 'off', undefined, undefined, 'on']);
  });

  it('is a resistor: rated watts at rated volts, P = V²/R elsewhere', () => {
    const heater = createHeater(params);
    expect(heater.amps(25.6)).toBe(0);
    heater.update(-5);
    expect(heater.amps(25.6) * 25.6).toBeCloseTo(60, 9);
    // Ohm's law: at 28.8 V the pad draws (28.8/25.6)² × 60 W.
    expect(heater.amps(28.8) * 28.8).toBeCloseTo(60 * (28.8 / 25.6) ** 2, 9);
  });
});
