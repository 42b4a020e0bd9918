import { describe, expect, it } from 'vitest';
import type { Frame } from '../schemas/frame.js';
import { InstrumentInputSchema } from '../schemas/instrument.js';
import { calibrationState, correctFrame } from './calibration.js';

const frame: Frame = { t: 10, volts: 12.5, amps: 20, temps: { cell: 25 }, aux: { heaterAmps: 1 }, clock: 'device' };

describe('calibration', () => {
  it('corrects each named channel as raw × gain + offset and keeps the raw values', () => {
    // Two-point calibration: a meter reading 12.5 V against a reference showing 12.525 V, etc.
    const out = correctFrame(frame, { volts: { gain: 1.002, offset: 0 }, amps: { gain: 1, offset: -0.05 }, 'temp:cell': { gain: 1, offset: 0.4 } });
    expect(out.volts).toBeCloseTo(12.525, 12);
    expect(out.amps).toBeCloseTo(19.95, 12);
    expect(out.temps).toEqual({ cell: 25.4 });
    expect(out.aux).toEqual({ heaterAmps: 1, raw_volts: 12.5, raw_amps: 20, raw_temp_cell: 25 });
    // The frame that came in is not changed (sinks may hold it).
    expect(frame).toEqual({ t: 10, volts: 12.5, amps: 20, temps: { cell: 25 }, aux: { heaterAmps: 1 }, clock: 'device' });
  });

  it('leaves a frame alone under identity corrections or for channels it lacks', () => {
    expect(correctFrame(frame, { volts: { gain: 1, offset: 0 }, 'temp:ambient': { gain: 1.1, offset: 0 } })).toBe(frame);
  });

  it('is in date through the due day, overdue the day after, not recorded without a due date', () => {
    expect(calibrationState('2026-12-02', '2026-12-02')).toBe('in-date');
    expect(calibrationState('2026-12-01', '2026-12-02')).toBe('overdue');
    expect(calibrationState(null, '2026-12-02')).toBe('not-recorded');
  });

  it('refuses gains far from 1, unknown channels and a due date before the calibration', () => {
    const base = { kind: 'meter', make: 'Ostwind Labs', model: 'DM-6', serialNumber: 'A1' };
    const bad = InstrumentInputSchema.safeParse({ ...base, channels: { volts: { gain: 10, offset: 0 }, power: { gain: 1, offset: 0 } }, calibratedOn: '2026-05-01', calibrationDueOn: '2026-04-01' });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['channels.volts.gain', 'channels.power']));
    expect(InstrumentInputSchema.safeParse({ ...base, calibratedOn: '2026-05-01', calibrationDueOn: '2026-04-01' }).error!.issues[0].path).toEqual(['calibrationDueOn']);
  });
});
