import { describe, expect, it } from 'vitest';
import {
  NO_VALUE, formatAmps, formatCharge, formatDuration, formatElapsedClock, formatEnergy, formatNumber,
  formatPercent, formatTemperature, formatVolts, formatWatts,
} from './format.js';

describe('formatting with units', () => {
  it('formats each quantity with its unit', () => {
    expect(formatVolts(25.6)).toBe('25.60 V');
    expect(formatAmps(12.49)).toBe('12.49 A');
    expect(formatWatts(337)).toBe('337.0 W');
    expect(formatEnergy(1280)).toBe('1,280.0 Wh');
    expect(formatEnergy(12_800, 'auto')).toBe('12.800 kWh');
    expect(formatEnergy(1280, 'kWh')).toBe('1.280 kWh');
    expect(formatCharge(50.7)).toBe('50.70 Ah');
    expect(formatCharge(0.5, 'auto')).toBe('500 mAh');
    expect(formatCharge(1.8564874208181574, 'mAh')).toBe('1,856 mAh');
    expect(formatPercent(101.44)).toBe('101.4 %');
  });
  it('shows °F from a stored °C (77 °F = 25 °C, 32 °F = 0 °C; mathjs agrees, see convert.test.ts)', () => {
    expect(formatTemperature(25, 'F')).toBe('77.0 °F');
    expect(formatTemperature(0, 'F')).toBe('32.0 °F');
    expect(formatTemperature(5)).toBe('5.0 °C');
  });
  it('shows a dash for missing or non-finite values and never "-0.00"', () => {
    expect(formatVolts(null)).toBe(NO_VALUE);
    expect(formatVolts(Number.NaN)).toBe(NO_VALUE);
    expect(formatEnergy(undefined, 'auto')).toBe(NO_VALUE);
    expect(formatNumber(-0.0001, 2)).toBe('0.00');
    expect(formatNumber(-0.01, 2)).toBe('-0.01');
  });
});

describe('durations', () => {
  it.each([
    [42, '42 s'],
    [59.6, '1 min 00 s'],
    [303, '5 min 03 s'],
    [2 * 3600 + 5 * 60 + 9, '2 h 05 min'],
    [3599.6, '1 h 00 min'],
    [3 * 86_400 + 4 * 3600, '3 d 04 h'],
    [-90, '-1 min 30 s'],
  ])('%d s → %s', (s, text) => {
    expect(formatDuration(s)).toBe(text);
  });
  it('formats a clock-style elapsed time past 24 h', () => {
    expect(formatElapsedClock(2 * 3600 + 5 * 60 + 9)).toBe('02:05:09');
    expect(formatElapsedClock(25 * 3600)).toBe('25:00:00');
    expect(formatDuration(Number.POSITIVE_INFINITY)).toBe(NO_VALUE);
  });
});
