import { describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import { createScpiInstrument, DEFAULT_IDN, SCPI_NAN } from './scpi.js';

const frame: Frame = { t: 30, volts: 26.512, amps: -10.001, temps: { cell: -3.9, ambient: -10 }, aux: { heaterAmps: 2.403 }, clock: 'device', seq: 30 };

describe('SCPI instrument', () => {
  it('answers *IDN? and NaN (9.91E37, the SCPI-99 convention) before its first reading', () => {
    const scpi = createScpiInstrument();
    expect(scpi.receive('*IDN?\nMEAS:VOLT?\n')).toEqual([`${DEFAULT_IDN}\n`, `${SCPI_NAN}\n`]);
  });

  it('accepts short and long forms, optional nodes, lower case and channel lists', () => {
    const scpi = createScpiInstrument();
    scpi.update(frame);
    const replies = scpi.receive(
      'MEAS:VOLT?\nmeasure:voltage:dc?\n:MEAS:SCAL:CURR?\nMEAS:CURR? (@2)\nMEAS:TEMP?\nMEAS:TEMP? (@2)\nFETC?\n',
    );
    expect(replies).toEqual(['26.512\n', '26.512\n', '-10.001\n', '2.403\n', '-3.9\n', '-10\n', '30,26.512,-10.001,-3.9,-10,2.403,30\n']);
  });

  it('answers several commands on one line with semicolons, and survives a split line', () => {
    const scpi = createScpiInstrument();
    scpi.update(frame);
    expect(scpi.receive('MEAS:VO')).toEqual([]);
    expect(scpi.receive('LT?;MEAS:CURR?\r\n')).toEqual(['26.512;-10.001\n']);
  });

  it('queues -113 for an unknown header and reports it through SYST:ERR?', () => {
    const scpi = createScpiInstrument();
    expect(scpi.receive('MEAS:POW?\n')).toEqual([]);
    expect(scpi.receive('SYST:ERR?\nSYST:ERR?\n')).toEqual(['-113,"Undefined header"\n', '0,"No error"\n']);
  });
});
