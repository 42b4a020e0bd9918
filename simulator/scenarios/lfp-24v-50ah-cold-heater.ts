import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/** A heated 24 V LFP pack charged in a cold chamber: cold-charge inhibit and heater cycling. */
export const lfp24v50ahColdHeater: ScenarioInput = {
  name: 'lfp-24v-50ah-cold-heater',
  title: 'Kestrel Energy 25.6 V 50 Ah LFP with heater pad: charging at −10 °C',
  description:
    'An 8-cell LFP pack at −4 °C in a −10 °C chamber on a 10 A / 28.8 V charger. The BMS blocks ' +
    'charging below 0 °C; the 60 W pad runs from the charger below 0 °C and stops above 5 °C.',
  pack: {
    label: 'Kestrel Energy 25.6 V 50 Ah heated',
    chemistry: 'lfp',
    cellsInSeries: 8,
    ratedAh: 50,
    capacityTolerancePct: 1,
    initialSoc: 0.3,
    initialTempC: -4,
    thermal: lfpThermal(8, 50),
    heater: { watts: 60, ratedVolts: 25.6, onBelowC: 0, offAboveC: 5 },
  },
  bms: lfpBms({ overCurrentAmps: 100 }),
  ambient: [{ atS: 0, tempC: -10 }],
  program: [{ kind: 'charge', charger: { cvVolts: 28.8, ccAmps: 10, termAmps: 1 }, maxS: 3 * 3600, stopWhen: 'charged' }],
  meter: { samplePeriodS: 1, voltsNoise: 0.003, ampsNoise: 0.01, tempNoise: 0.05 },
};
