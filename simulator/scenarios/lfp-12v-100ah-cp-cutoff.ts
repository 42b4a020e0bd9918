import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/** A 12 V LFP capacity test on an inverter-like constant-power load, to BMS cutoff and reconnect. */
export const lfp12v100ahCpCutoff: ScenarioInput = {
  name: 'lfp-12v-100ah-cp-cutoff',
  title: 'Voltara 12.8 V 100 Ah LFP: 600 W constant power to cutoff, then recovery',
  description:
    'Fully charged 4-cell LFP pack discharged at 600 W until its BMS disconnects on a low cell, ' +
    'then rested with the load off; the BMS reconnects after its 60 s recovery time.',
  pack: {
    label: 'Voltara 12.8 V 100 Ah',
    chemistry: 'lfp',
    cellsInSeries: 4,
    ratedAh: 100,
    capacityFactor: 1.02,
    capacityTolerancePct: 1.5,
    initialSoc: 1,
    initialTempCelsius: 23,
    thermal: lfpThermal(4, 100),
  },
  bms: lfpBms(),
  ambient: [{ atSeconds: 0, tempCelsius: 23 }],
  program: [
    { kind: 'discharge', load: { mode: 'cp', watts: 600 }, maxSeconds: 4 * 3600, stopWhen: 'bms-trip' },
    { kind: 'rest', maxSeconds: 900 },
  ],
  meter: { readingPeriodSeconds: 1, voltsNoise: 0.002, ampsNoise: 0.02, tempNoise: 0.05 },
};
