import { describe, expect, it } from 'vitest';
import { createHeater } from './heater.js';

describe('heater thermostat', () => {
  // The demo pack's own design (invented): 120 W at 51.2 V, on below 2 °C, off above 7 °C.
  const params = { watts: 120, ratedVolts: 51.2, onBelowCelsius: 2, offAboveCelsius: 7 };

  it('switches on below the lower threshold and off above the upper one (hysteresis)', () => {
    const heater = createHeater(params);
    const path = [5, 3, 2.1, 1.9, 4, 6.9, 7.1, 5, 2.5, 1.5];
    const switches = path.map((t) => heater.update(t));
    expect(switches).toEqual([undefined, undefined, undefined, 'on', undefined, undefined, 'off', undefined, undefined, 'on']);
  });

  it('is a resistor: rated watts at rated volts, P = V²/R elsewhere', () => {
    const heater = createHeater(params);
    expect(heater.amps(51.2)).toBe(0);
    heater.update(-5);
    expect(heater.amps(51.2) * 51.2).toBeCloseTo(120, 9);
    // Ohm's law: at 57.6 V the element draws (57.6/51.2)² × 120 W.
    expect(heater.amps(57.6) * 57.6).toBeCloseTo(120 * (57.6 / 51.2) ** 2, 9);
  });

  it('with PWM draws current only in the on slots: 2 s on, 1 s off, counted from switch-on', () => {
    const heater = createHeater({ ...params, pwm: { onSeconds: 2, offSeconds: 1 } });
    heater.update(-5, 10);
    const drawn = [10, 10.5, 11, 11.75, 12, 12.5, 13, 14.9, 15].map((t) => heater.amps(51.2, t) > 0);
    expect(drawn).toEqual([true, true, true, true, false, false, true, true, false]);
  });
});
