import { describe, expect, it } from 'vitest';
import type { RunInstrument } from '../../shared/schemas/instrument.js';
import { instrumentsLine } from './instruments-line.js';

const meter: RunInstrument = {
  instrumentId: 1, kind: 'meter', make: 'Ostwind Labs', model: 'DM-6', serialNumber: 'OW-20931',
  calibratedOn: '2025-06-01', calibrationDueOn: '2026-06-01', calibration: 'overdue', channels: {},
};

describe('the report line of instruments', () => {
  it('flags an instrument that was past its due date when the run started', () => {
    expect(instrumentsLine([meter, { ...meter, instrumentId: 2, kind: 'load', model: 'EL-300', serialNumber: 'L7', calibration: 'in-date', calibrationDueOn: '2027-01-10' }])).toBe(
      'Instruments: meter Ostwind Labs DM-6 (serial OW-20931), CALIBRATION OVERDUE (was due 2026-06-01); load Ostwind Labs EL-300 (serial L7), calibrated, due 2027-01-10.',
    );
  });

  it('says when a run has no instrument records', () => {
    expect(instrumentsLine([])).toBe('Instruments: none recorded for this bench.');
    expect(instrumentsLine([{ ...meter, calibration: 'not-recorded', calibrationDueOn: null }])).toMatch(/no calibration due date recorded/);
  });
});
