import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { unit } from 'mathjs';
import {
  ahFromWh, ahToCoulombs, ahToMah, celsiusToFahrenheit, fahrenheitToCelsius, joulesToWh, kWhToWh,
  kelvinToCelsius, mahToAh, toCelsius, voltsFrom, wattsFrom, whFromAh, whToJoules, whToKWh,
} from './convert.js';
import { MS_PER_HOUR, SECONDS_PER_DAY, SECONDS_PER_HOUR } from './time.js';

// Reference library: mathjs (npm) unit conversions.
const ref = (value: number, from: string, to: string): number => unit(value, from).toNumber(to);

describe('one temperature conversion for every unit a log or meter writes, against mathjs', () => {
  it.each([
    [98.6, 'F', 'degF'], // body temperature (mathjs degF→degC: 37 °C)
    [-40, 'F', 'degF'], // where the scales meet (mathjs: −40 °C)
    [298.15, 'K', 'K'], // 25 °C (mathjs K→degC)
    [21.5, 'C', 'degC'],
  ] as const)('%d %s', (value, u, mathjsUnit) => {
    expect(toCelsius(value, u)).toBeCloseTo(ref(value, mathjsUnit, 'degC'), 10);
  });
  it('K → °C and the time units agree with mathjs', () => {
    expect(kelvinToCelsius(0)).toBeCloseTo(ref(0, 'K', 'degC'), 10);
    expect(SECONDS_PER_HOUR).toBe(ref(1, 'hour', 's'));
    expect(SECONDS_PER_DAY).toBe(ref(1, 'day', 's'));
    expect(MS_PER_HOUR).toBe(ref(1, 'hour', 'ms'));
  });
});

describe('temperature conversion against mathjs', () => {
  it.each([
    [32, 0], // 32 °F = 0 °C (water freezes; mathjs degF→degC)
    [41, 5], // 41 °F = 5 °C (mathjs degF→degC)
    [77, 25], // 77 °F = 25 °C (mathjs degF→degC)
  ])('%d °F = %d °C', (f, c) => {
    expect(fahrenheitToCelsius(f)).toBeCloseTo(ref(f, 'degF', 'degC'), 12);
    expect(fahrenheitToCelsius(f)).toBeCloseTo(c, 12);
    expect(celsiusToFahrenheit(c)).toBeCloseTo(ref(c, 'degC', 'degF'), 12);
  });
  it('agrees with mathjs over a range and round-trips', () => {
    fc.assert(fc.property(fc.double({ min: -80, max: 200, noNaN: true }), (c) => {
      expect(celsiusToFahrenheit(c)).toBeCloseTo(ref(c, 'degC', 'degF'), 9);
      expect(fahrenheitToCelsius(celsiusToFahrenheit(c))).toBeCloseTo(c, 9);
    }));
  });
});

describe('energy and charge conversion against mathjs', () => {
  it('1 Wh = 3600 J (mathjs Wh→J)', () => {
    expect(whToJoules(1)).toBe(ref(1, 'Wh', 'J'));
    expect(whToJoules(1)).toBe(3600);
    expect(joulesToWh(3600)).toBe(1);
  });
  it('kWh, mAh and coulombs (mathjs kWh→Wh, mAh→C)', () => {
    expect(kWhToWh(1.28)).toBeCloseTo(ref(1.28, 'kWh', 'Wh'), 9);
    expect(whToKWh(1280)).toBeCloseTo(ref(1280, 'Wh', 'kWh'), 12);
    expect(ahToCoulombs(mahToAh(1))).toBeCloseTo(ref(1, 'mAh', 'C'), 12);
    expect(ahToMah(1.8564874208181574)).toBeCloseTo(1856.48742081816, 9);
  });
});

describe('trade arithmetic (common practice)', () => {
  it('337 W at 12.49 A is 26.98 V', () => {
    expect(voltsFrom(337, 12.49)).toBeCloseTo(26.98, 2);
    expect(wattsFrom(26.98, 12.49)).toBeCloseTo(337, 0);
  });
  it('1,299 Wh delivered at about 25.6 V is about 50.7 Ah', () => {
    expect(ahFromWh(1299, 25.6)).toBeCloseTo(50.7, 1);
    expect(whFromAh(50, 25.6)).toBeCloseTo(1280, 9);
  });
  it('refuses to divide by zero volts or amps', () => {
    expect(voltsFrom(10, 0)).toBeNaN();
    expect(ahFromWh(10, 0)).toBeNaN();
  });
});
