import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/** A high-temperature protection check: a discharging pack in a chamber that warms past the limit. */
export const lfp12vHotCutoff: ScenarioInput = {
  name: 'lfp-12v-hot-cutoff',
  title: 'Hollis Power 12.8 V 50 Ah LFP: over-temperature cutoff in a warm chamber',
  description:
    'A 4-cell LFP pack discharging at 25 A while the chamber ramps from 45 °C to 80 °C and back ' +
    'to 30 °C. The BMS opens 10 s after the pack passes 60 °C and closes again below 50 °C.',
  pack: {
    label: 'Hollis Power 12.8 V 50 Ah',
    chemistry: 'lfp',
    cellsInSeries: 4,
    ratedAh: 50,
    initialSoc: 1,
    initialTempCelsius: 42,
    // The chamber's fan stirs the air, so the pack follows the chamber closer than in still air.
    thermal: { ...lfpThermal(4, 50), toAmbientKPerW: 0.5 },
  },
  bms: lfpBms(),
  ambient: [
    { atSeconds: 0, tempCelsius: 45 },
    { atSeconds: 1200, tempCelsius: 80 },
    { atSeconds: 4200, tempCelsius: 80 },
    { atSeconds: 6000, tempCelsius: 30 },
  ],
  program: [
    { kind: 'discharge', load: { mode: 'cc', amps: 25 }, maxSeconds: 7200, stopWhen: 'bms-trip' }, { kind: 'rest', maxSeconds: 7200, stopWhen: 'bms-release' },
    { kind: 'rest', maxSeconds: 300 },
  ],
  meter: { readingPeriodSeconds: 1, voltsNoise: 0.002, ampsNoise: 0.01, tempNoise: 0.05 },
};
