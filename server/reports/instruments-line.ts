import type { RunInstrument } from '../../shared/schemas/instrument.js';

const STATE_WORDS: Record<RunInstrument['calibration'], (i: RunInstrument) => string> = {
  'in-date': (i) => `calibrated, due ${i.calibrationDueOn}`,
  overdue: (i) => `CALIBRATION OVERDUE (was due ${i.calibrationDueOn})`,
  'not-recorded': () => 'no calibration due date recorded',
};

/** The report's line naming the instruments a run used and their calibration state when it started. */
export function instrumentsLine(instruments: readonly RunInstrument[]): string {
  if (instruments.length === 0) return 'Instruments: none recorded for this bench.';
  const parts = instruments.map((i) => `${i.kind} ${i.make} ${i.model} (serial ${i.serialNumber}), ${STATE_WORDS[i.calibration](i)}`);
  return `Instruments: ${parts.join('; ')}.`;
}
