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

  it('reads temperature units in every common spelling: T[°C], TempF, Temp1 (°C), (degF), _degf, celsius', () => {
    expect(splitHeader('T[°C]')).toEqual({ base: 't', unit: 'c' });
    expect(splitHeader('TempF')).toEqual({ base: 'temp', unit: 'f' });
    expect(splitHeader('Temp1 (°C)')).toEqual({ base: 'temp1', unit: 'c' });
    expect(splitHeader('Temperature (degF)')).toEqual({ base: 'temperature', unit: 'f' });
    expect(splitHeader('temp_degf')).toEqual({ base: 'temp', unit: 'f' });
    expect(splitHeader('Temperature (deg. C)')).toEqual({ base: 'temperature', unit: 'c' });
    expect(splitHeader('Temperature (Celsius)')).toEqual({ base: 'temperature', unit: 'c' });
    expect(splitHeader('Temperature, °F')).toEqual({ base: 'temperature', unit: 'f' });
    expect(splitHeader('Time, s')).toEqual({ base: 'time', unit: 's' });
  });
});

describe('planColumns', () => {
  it('recognises the NASA PCoE export header (time_s, voltage_v, current_a, temperature_c)', () => {
    const p = planColumns(['time_s', 'voltage_v', 'current_a', 'temperature_c'], ['0.0', '4.19', '-0.004', '24.3']);
    expect(p).toEqual({
      time: { index: 0, format: 's', source: 'header', column: 'time_s' },
      volts: { index: 1, scale: 1 },
      amps: { index: 2, scale: 1 },
      temp: { index: 3, unit: 'C', source: 'header', column: 'temperature_c' },
    });
  });

  it('recognises names without units, milli-units and ISO timestamps', () => {
    const p = planColumns(['Timestamp', 'Voltage (mV)', 'Current (mA)'], ['2026-03-01T10:00:00Z', '13200', '5000']);
    expect(p.time).toMatchObject({ format: 'iso', source: 'inferred' });
    expect(p.volts.scale).toBe(1e-3);
    expect(p.amps.scale).toBe(1e-3);
    expect(p.temp).toBeNull();
  });

  it('takes an explicit mapping and time format over recognition', () => {
    const p = planColumns(['col1', 'col2', 'col3'], ['1', '2', '3'], { time: 'col1', volts: 'col3', amps: 'col2', timeFormat: 'ms' });
    expect(p.volts.index).toBe(2);
    expect(p.time).toMatchObject({ format: 'ms', source: 'chosen' });
  });

  it('takes a Time column over a Date column beside it, and a Date column alone', () => {
    expect(planColumns(['Date', 'Time', 'U (V)', 'I (A)'], ['15.07.2026', '12:00:00', '13', '5']).time).toMatchObject({ index: 1, format: 'hms' });
    expect(planColumns(['Date', 'U (V)', 'I (A)'], ['2026-07-15 12:00:00', '13', '5']).time).toMatchObject({ index: 0, format: 'iso' });
  });

  it('names what it could not find, on line 1', () => {
    expect(() => planColumns(['when', 'voltage'], null)).toThrow(/line 1: no time, amps column/);
    expect(() => planColumns(['time (fortnights)', 'v', 'i'], null)).toThrow(/line 1: unknown time unit "fortnights"/);
  });

  it('finds temperature columns by their unit marks, and keeps a bare "T" as time', () => {
    const cases: [string, 'C' | 'F'][] = [['T[°C]', 'C'], ['TempF', 'F'], ['Temp1 (°C)', 'C'], ['Temperature (degF)', 'F'], ['temp_degf', 'F'], ['T2 [°F]', 'F']];
    for (const [header, unit] of cases) {
      const p = planColumns(['Time (s)', 'U (V)', 'I (A)', header], ['0', '13', '5', '20']);
      expect(p.temp, header).toMatchObject({ index: 3, unit, source: 'header', column: header });
      expect(p.time.index, header).toBe(0);
    }
    // Kneepoint's own export names its channels temp_<label>_c, and its run time column
    // elapsedSeconds (`elapsed` in files exported before the rename): both are the time, not `t`.
    for (const runTime of ['elapsedSeconds', 'elapsed']) { // vocab-rename: keep
      const own = planColumns([runTime, 't', 'volts', 'amps', 'temp_cell_c'], ['0', '0', '13', '5', '20']);
      expect(own.temp, runTime).toMatchObject({ index: 4, unit: 'C' });
      expect(own.time.index, runTime).toBe(0);
    }
    const bareT = planColumns(['t', 'v', 'i', 'T[°C]'], ['0', '13', '5', '20']);
    expect(bareT.time.index).toBe(0);
    expect(bareT.temp?.index).toBe(3);
  });

  it("reads a bare Temperature in the unit chosen, else the lab's, and never as °C by default", () => {
    const headers = ['time_s', 'voltage_v', 'current_a', 'Temperature'];
    const row = ['0', '13', '5', '77'];
    expect(planColumns(headers, row, { tempUnit: 'F' }).temp).toMatchObject({ unit: 'F', source: 'chosen' });
    expect(planColumns(headers, row, { labTempUnit: 'F' }).temp).toMatchObject({ unit: 'F', source: 'lab' });
    expect(() => planColumns(headers, row)).toThrow(/temperature column "Temperature" names no unit; choose °C, °F or K/);
    // A header that names its unit is not overridden by a different choice.
    expect(() => planColumns(['time_s', 'voltage_v', 'current_a', 'TempF'], row, { tempUnit: 'C' })).toThrow(/is in °F but °C was chosen/);
  });
});

describe('parseRow', () => {
  const plan = planColumns(['time (ms)', 'voltage', 'current', 'temp (°F)'], ['0', '1', '1', '1']);
  it('converts ms to s and °F to °C (41 °F = 5 °C by the scales\' definitions)', () => {
    expect(parseRow(plan, ['1500', '12.5', '3', '41'], 2)).toEqual({ t: 1.5, volts: 12.5, amps: 3, tempCelsius: 5 });
  });
  it('names the line and the field of a bad value', () => {
    expect(() => parseRow(plan, ['1500', 'abc', '3', '41'], 17)).toThrow('line 17: volts "abc" is not a number');
  });
  it('reads a °F column as °F: 77 °F is 25 °C (scale definitions), not 77 °C', () => {
    const p = planColumns(['time_s', 'volts', 'amps', 'Temperature (degF)'], ['0', '1', '1', '77']);
    expect(parseRow(p, ['0', '13', '5', '77'], 2).tempCelsius).toBeCloseTo(25, 12);
  });
  it('refuses times beyond the year 2100 either way (±1e300), naming the line', () => {
    const p = planColumns(['time_s', 'volts', 'amps'], ['0', '1', '1']);
    expect(() => parseRow(p, ['1e300', '13', '5'], 3)).toThrow(/^line 3: time "1e300" read as seconds is beyond the year 2100/);
    expect(() => parseRow(p, ['-1e300', '13', '5'], 4)).toThrow(/^line 4: time "-1e300"/);
  });
  it('reads decimal-comma times in a semicolon file and names the trouble in a comma file', () => {
    const semi = { ...planColumns(['Zeit (s)', 'Spannung (V)', 'Strom (A)'], null, { time: 'Zeit (s)', volts: 'Spannung (V)', amps: 'Strom (A)' }), decimalComma: true };
    expect(parseRow(semi, ['12,5', '13,1', '5,5'], 2)).toEqual({ t: 12.5, volts: 13.1, amps: 5.5, tempCelsius: null });
    const comma = planColumns(['time_s', 'volts', 'amps'], ['0', '1', '1']);
    expect(() => parseRow(comma, ['12,5', '13', '5'], 2)).toThrow(/decimal comma needs a semicolon- or tab-separated file/);
  });
});
