import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/** A pack whose third cell has lost a fifth of its capacity: the BMS cuts off on that cell early. */
export const lfp12vWeakCell: ScenarioInput = {
  name: 'lfp-12v-weak-cell',
  title: 'Voltara 12.8 V 100 Ah LFP with one weak cell: early cutoff at 50 A',
  description:
    'Cell 3 of 4 (index 2) holds 80 % of the others\' capacity; at 50 A it reaches the BMS ' +
    'under-voltage limit first and the pack disconnects well short of its rating.',
  pack: {
    label: 'Voltara 12.8 V 100 Ah (returned unit)',
    chemistry: 'lfp',
    cellsInSeries: 4,
    ratedAh: 100,
    initialSoc: 1,
    initialTempCelsius: 22,
    cells: [{ index: 2, capacityFactor: 0.8, resistanceFactor: 1.3 }],
    thermal: lfpThermal(4, 100),
  },
  bms: lfpBms(),
  ambient: [{ atSeconds: 0, tempCelsius: 22 }],
  program: [
    { kind: 'discharge', load: { mode: 'cc', amps: 50 }, maxSeconds: 3 * 3600, stopWhen: 'bms-trip' },
    { kind: 'rest', maxSeconds: 300 },
  ],
  meter: { readingPeriodSeconds: 1, voltsNoise: 0.002, ampsNoise: 0.02, tempNoise: 0.05 },
};
