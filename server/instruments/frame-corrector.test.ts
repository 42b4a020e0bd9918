import { describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import type { Instrument } from '../../shared/schemas/instrument.js';
import { FrameCorrector } from './frame-corrector.js';

const base: Instrument = {
  id: 1, kind: 'meter', make: 'Ostwind Labs', model: 'DM-6', serialNumber: 'A', calibratedOn: null, calibrationDueOn: null,
  benchId: 3, channels: {}, notes: '', certificate: null, calibration: 'not-recorded', updatedAt: '2026-12-01T00:00:00.000Z',
};
const frame: Frame = { t: 1, volts: 12, amps: 5, temps: { cell: 20 }, clock: 'arrival' };

describe('frame corrector', () => {
  it('applies the meters of a bench (lower id first per channel), not loads, supplies or shelved meters', () => {
    const corrector = new FrameCorrector();
    corrector.load([
      { ...base, id: 7, channels: { volts: { gain: 2, offset: 0 }, 'temp:cell': { gain: 1, offset: 1 } } },
      { ...base, id: 2, channels: { volts: { gain: 1.5, offset: 0 } } },
      { ...base, id: 3, kind: 'load', channels: { amps: { gain: 2, offset: 0 } } },
      { ...base, id: 4, benchId: null, channels: { amps: { gain: 2, offset: 0 } } },
    ]);
    expect(corrector.apply(3, frame)).toEqual({ ...frame, volts: 18, temps: { cell: 21 }, aux: { raw_volts: 12, raw_temp_cell: 20 } });
    expect(corrector.apply(9, frame)).toBe(frame);
  });

  it('forgets corrections when the records change', () => {
    const corrector = new FrameCorrector();
    corrector.load([{ ...base, channels: { amps: { gain: 1.1, offset: 0 } } }]);
    expect(corrector.apply(3, frame).amps).toBeCloseTo(5.5, 12);
    corrector.load([]);
    expect(corrector.apply(3, frame)).toBe(frame);
  });
});
