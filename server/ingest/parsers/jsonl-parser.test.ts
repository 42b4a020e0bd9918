import { describe, expect, it } from 'vitest';
import { JsonlFormatSchema } from '../../../shared/schemas/bench.js';
import { parseJsonLine } from './jsonl-parser.js';

const defaults = JsonlFormatSchema.parse({ kind: 'jsonl' });

describe('parseJsonLine', () => {
  it('reads volts, amps, time, seq and nested temps/aux', () => {
    const r = parseJsonLine(defaults, '{"t":3.5,"volts":13.1,"amps":20,"seq":7,"temps":{"cell":21.5},"aux":{"heaterAmps":1.5}}', 0);
    expect(r).toEqual({
      kind: 'frame',
      frame: { t: 3.5, volts: 13.1, amps: 20, seq: 7, temps: { cell: 21.5 }, aux: { heaterAmps: 1.5 }, clock: 'device' },
    });
  });

  it('maps renamed fields with units and sign', () => {
    const format = JsonlFormatSchema.parse({
      kind: 'jsonl',
      fields: { t: 'ms', volts: 'mv', amps: 'ma' },
      temps: { cell: 'tc' },
      timeUnit: 'ms',
      voltsUnit: 'mV',
      ampsUnit: 'mA',
      tempUnit: 'F',
      currentSign: 'discharge-negative',
    });
    const r = parseJsonLine(format, '{"ms":1500,"mv":3300,"ma":-2000,"tc":32}', 0);
    // 32 °F = 0 °C by definition (NIST SP 811, appendix B).
    expect(r).toEqual({ kind: 'frame', frame: { t: 1.5, volts: 3.3, amps: 2, temps: { cell: 0 }, clock: 'device' } });
  });

  it('stamps a line without time on arrival', () => {
    const r = parseJsonLine(defaults, '{"volts":12,"amps":1}', 42_000);
    expect(r.kind === 'frame' && r.frame).toMatchObject({ t: 42, clock: 'arrival' });
  });

  it('rejects broken JSON, non-objects, missing or non-numeric values', () => {
    const reasons = ['{"volts":12,', '[1,2]', '{"amps":1}', '{"volts":"12","amps":1}', '{"volts":12,"amps":1,"temps":{"cell":"hot"}}', '{"volts":12,"amps":1,"seq":-1}'].map(
      (line) => parseJsonLine(defaults, line, 0),
    );
    expect(reasons.map((r) => r.kind)).toEqual(Array(6).fill('rejected'));
    expect(reasons[2]).toEqual({ kind: 'rejected', reason: 'volts: missing or not a number' });
    expect(reasons[4]).toEqual({ kind: 'rejected', reason: 'temperature cell: not a number' });
  });
});
