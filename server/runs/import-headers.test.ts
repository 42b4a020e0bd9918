import { describe, expect, it } from 'vitest';
import { parseRow, planColumns, splitHeader } from './import-headers.js';

describe('splitHeader', () => {
  it('separates units written in brackets, parentheses or as a suffix', () => {
    expect(splitHeader('Voltage (V)')).toEqual({ base: 'voltage', unit: 'v' });
    expect(splitHeader('Current [mA]')).toEqual({ base: 'current', unit: 'ma' });
    expect(splitHeader('temperature_c')).toEqual({ base: 'temperature', unit: 'c' });
    expect(splitHeader('Temp (°F)')).toEqual({ base: 'temp', unit: 'f' });
    expect(splitHeader('time_ms')).toEqual({ base: 'time', unit: 'ms' });
    expect(splitHeader('volts')).toEqual({ base: 'volts', unit: null });
  });

  it('reads the degree sign of a file saved in Windows-1252 (decoded as U+FFFD) or double-encoded (Â°)', () => {
    expect(splitHeader('Temp (\uFFFDC)')).toEqual({ base: 'temp', unit: 'c' });
    expect(splitHeader('Temperature [Â°F]')).toEqual({ base: 'temperature', unit: 'f' });
    expect(splitHeader('Temp (ºC)')).toEqual({ base: 'temp', unit: 'c' });
  });
});

describe('planColumns', () => {
  it('recognises the NASA PCoE export header (time_s, voltage_v, current_a, temperature_c)', () => {
    const p = planColumns(['time_s', 'voltage_v', 'current_a', 'temperature_c'], ['0.0', '4.19', '-0.004', '24.3']);
    expect(p).toEqual({ time: { index: 0, unit: 's' }, volts: { index: 1, scale: 1 }, amps: { index: 2, scale: 1 }, temp: { index: 3, unit: 'C' } });
  });

  it('recognises names without units, milli-units and ISO timestamps', () => {
    const p = planColumns(['Timestamp', 'Voltage (mV)', 'Current (mA)'], ['2026-03-01T10:00:00Z', '13200', '5000']);
    expect(p.time.unit).toBe('iso');
    expect(p.volts.scale).toBe(1e-3);
    expect(p.amps.scale).toBe(1e-3);
    expect(p.temp).toBeNull();
  });

  it('takes an explicit mapping over recognition', () => {
    const p = planColumns(['col1', 'col2', 'col3'], ['1', '2', '3'], { time: 'col1', volts: 'col3', amps: 'col2', timeUnit: 'ms' });
    expect(p.volts.index).toBe(2);
    expect(p.time.unit).toBe('ms');
  });

  it('names what it could not find, on line 1', () => {
    expect(() => planColumns(['when', 'voltage'], null)).toThrow(/line 1: no time, amps column/);
    expect(() => planColumns(['time (fortnights)', 'v', 'i'], null)).toThrow(/line 1: unknown time unit "fortnights"/);
  });
});

describe('parseRow', () => {
  const plan = planColumns(['time (ms)', 'voltage', 'current', 'temp (°F)'], ['0', '1', '1', '1']);
  it('converts ms to s and °F to °C (41 °F = 5 °C by the scales\' definitions)', () => {
    expect(parseRow(plan, ['1500', '12.5', '3', '41'], 2)).toEqual({ t: 1.5, volts: 12.5, amps: 3, tempC: 5 });
  });
  it('names the line and the field of a bad value', () => {
    expect(() => parseRow(plan, ['1500', 'abc', '3', '41'], 17)).toThrow('line 17: volts "abc" is not a number');
  });
});
