import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/** A poor meter: noisy readings, lost and damaged frames, and a USB cable pulled for 45 s. */
export const noisyMeterUnplug: ScenarioInput = {
  name: 'noisy-meter-unplug',
  title: 'Noisy meter with dropouts and a USB unplug (12.8 V 50 Ah LFP at 20 A)',
  description:
    'Half an hour of a 20 A discharge read by a coarse, noisy meter that loses 2 % of its frames, ' +
    'garbles 1 % and is unplugged at 10 minutes for 45 s.',
  pack: {
    label: 'Kestrel Energy 12.8 V 50 Ah',
    chemistry: 'lfp',
    cellsInSeries: 4,
    ratedAh: 50,
    initialSoc: 0.9,
    initialTempCelsius: 21,
    thermal: lfpThermal(4, 50),
  },
  bms: lfpBms(),
  ambient: [{ atSeconds: 0, tempCelsius: 21 }],
  program: [{ kind: 'discharge', load: { mode: 'cc', amps: 20 }, maxSeconds: 1800 }, { kind: 'rest', maxSeconds: 300 }],
  meter: {
    readingPeriodSeconds: 1,
    voltsNoise: 0.02,
    ampsNoise: 0.08,
    tempNoise: 0.3,
    voltsStep: 0.01,
    ampsStep: 0.01,
    tempStep: 0.5,
    dropProbability: 0.02,
    corruptProbability: 0.01,
    unplugs: [{ atSeconds: 600, forSeconds: 45 }],
  },
};
