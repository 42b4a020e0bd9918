import { describe, expect, it } from 'vitest';
import { CsvFormatSchema, type CsvFormat } from '../../../shared/schemas/bench.js';
import { createCsvParser, parseCsvLine } from './csv-parser.js';
import type { ParseResult } from './parse-result.js';

const ARRIVAL_MS = 1_700_000_000_000;
const fmt = (input: Record<string, unknown>): CsvFormat => CsvFormatSchema.parse({ kind: 'csv', ...input });
const frameOf = (r: ParseResult) => {
  if (r.kind !== 'frame') throw new Error(`expected a frame, got ${JSON.stringify(r)}`);
  return r.frame;
};

describe('parseCsvLine', () => {
  it('maps columns with units, temperature channels and aux', () => {
    const format = fmt({ columns: ['t', 'volts', 'amps', 'temp:cell', 'aux:heaterAmps'] });
    const frame = frameOf(parseCsvLine(format, '12.5,13.21,10.0,24.5,0.8', false, ARRIVAL_MS));
    expect(frame).toEqual({ t: 12.5, volts: 13.21, amps: 10, temps: { cell: 24.5 }, aux: { heaterAmps: 0.8 }, clock: 'device' });
  });

  it('converts ms time, mV, mA and flips a discharge-negative meter', () => {
    // 1 s = 1000 ms, 1 V = 1000 mV, 1 A = 1000 mA: SI prefixes (BIPM SI Brochure, 9th ed.).
    const format = fmt({
      columns: ['t', 'volts', 'amps'],
      timeUnit: 'ms',
      voltsUnit: 'mV',
      ampsUnit: 'mA',
      currentSign: 'discharge-negative',
    });
    const frame = frameOf(parseCsvLine(format, '2500,13210,-5000', false, ARRIVAL_MS));
    expect(frame.t).toBe(2.5);
    expect(frame.volts).toBeCloseTo(13.21, 12);
    expect(frame.amps).toBe(5);
  });

  it('converts Fahrenheit and Kelvin to Celsius', () => {
    // 212 °F = 100 °C and 273.15 K = 0 °C by definition (NIST SP 811, appendix B).
    const f = frameOf(parseCsvLine(fmt({ columns: ['volts', 'amps', 'temp:a'], tempUnit: 'F' }), '1,1,212', false, 0));
    expect(f.temps?.a).toBeCloseTo(100, 9);
    const k = frameOf(parseCsvLine(fmt({ columns: ['volts', 'amps', 'temp:a'], tempUnit: 'K' }), '1,1,273.15', false, 0));
    expect(k.temps?.a).toBeCloseTo(0, 9);
  });

  it('parses ISO timestamps as Unix seconds on the device clock', () => {
    const format = fmt({ columns: ['t', 'volts', 'amps'], timeUnit: 'iso' });
    const frame = frameOf(parseCsvLine(format, '2026-01-01T00:00:01.500Z,12,1', false, 0));
    expect(frame.t).toBe(Date.UTC(2026, 0, 1, 0, 0, 1, 500) / 1000);
    expect(frame.clock).toBe('device');
  });

  it('stamps frames without a time column on arrival', () => {
    const frame = frameOf(parseCsvLine(fmt({ columns: ['volts', 'amps'] }), '12,1', false, ARRIVAL_MS));
    expect(frame.t).toBe(ARRIVAL_MS / 1000);
    expect(frame.clock).toBe('arrival');
  });

  it('honours semicolon and tab delimiters and skipped columns', () => {
    const semi = frameOf(parseCsvLine(fmt({ columns: ['volts', '-', 'amps'], delimiter: ';' }), '12;x;3', false, 0));
    expect([semi.volts, semi.amps]).toEqual([12, 3]);
    const tab = frameOf(parseCsvLine(fmt({ columns: ['volts', 'amps'], delimiter: '\t' }), '12\t3', false, 0));
    expect([tab.volts, tab.amps]).toEqual([12, 3]);
  });

  it('rejects malformed lines with a reason naming the column', () => {
    const format = fmt({ columns: ['t', 'volts', 'amps'] });
    expect(parseCsvLine(format, '1,12.0', false, 0)).toEqual({ kind: 'rejected', reason: 'expected 3 fields, got 2' });
    const bad = parseCsvLine(format, '1,12.x,3', false, 0);
    expect(bad.kind).toBe('rejected');
    expect(bad.kind === 'rejected' && bad.reason).toMatch(/^volts: '12.x'/);
    expect(parseCsvLine(format, '1,,3', false, 0).kind).toBe('rejected');
    expect(parseCsvLine(format, '1,1e999,3', false, 0).kind).toBe('rejected');
  });
});

describe('createCsvParser header handling', () => {
  it('auto skips a header line and keeps the data after it', () => {
    const parse = createCsvParser(fmt({ columns: ['t', 'volts', 'amps'] }));
    expect(parse('time_s,volts_V,amps_A', 0).kind).toBe('skipped');
    expect(frameOf(parse('0,13.3,5', 0)).volts).toBe(13.3);
  });

  it('skip-first drops only the first line, whatever it holds', () => {
    const parse = createCsvParser(fmt({ columns: ['volts', 'amps'], header: 'skip-first' }));
    expect(parse('1,2', 0).kind).toBe('skipped');
    expect(frameOf(parse('3,4', 0)).volts).toBe(3);
  });

  it('none treats a header as a malformed line', () => {
    const parse = createCsvParser(fmt({ columns: ['volts', 'amps'], header: 'none' }));
    expect(parse('volts,amps', 0).kind).toBe('rejected');
  });

  it('a stream with bad lines loses none of the good ones', () => {
    const parse = createCsvParser(fmt({ columns: ['t', 'volts', 'amps'] }));
    const lines = ['t,v,a', '0,13.2,5', 'garbage', '1,13.1,5', '2,13.0', '3,12.9,5'];
    const results = lines.map((l) => parse(l, 0));
    expect(results.filter((r) => r.kind === 'frame').map((r) => frameOf(r).t)).toEqual([0, 1, 3]);
    expect(results.filter((r) => r.kind === 'rejected')).toHaveLength(2);
  });
});
