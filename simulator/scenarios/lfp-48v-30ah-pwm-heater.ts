import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/**
 * Our own heated-pack design (fictional brand, invented figures): a 16-cell 51.2 V 30 Ah LFP
 * pack whose heater film is driven by pulse-width modulation, 2 s on and 1 s off, from the
 * charger. The BMS blocks charging below 0 °C and releases at 3 °C; the heater switches on
 * below 2 °C and off above 7 °C.
 */
export const lfp48v30ahPwmHeater: ScenarioInput = {
  name: 'lfp-48v-30ah-pwm-heater',
  title: 'Corvane Power 51.2 V 30 Ah LFP with a PWM heater film: charging at −15 °C',
  description:
    'A 16-cell LFP pack at −6 °C in a −15 °C chamber on a 6 A / 57.6 V charger. The BMS blocks ' +
    'charging below 0 °C; the 120 W film, pulsed 2 s on / 1 s off from the charger, runs below 2 °C and stops above 7 °C.',
  pack: {
    label: 'Corvane Power 51.2 V 30 Ah heated',
    chemistry: 'lfp',
    cellsInSeries: 16,
    ratedAh: 30,
    capacityTolerancePct: 1,
    initialSoc: 0.25,
    initialTempCelsius: -6,
    thermal: lfpThermal(16, 30),
    heater: { watts: 120, ratedVolts: 51.2, onBelowCelsius: 2, offAboveCelsius: 7, pwm: { onSeconds: 2, offSeconds: 1 } },
  },
  bms: lfpBms({ overCurrentAmps: 60 }),
  ambient: [{ atSeconds: 0, tempCelsius: -15 }],
  program: [{ kind: 'charge', charger: { cvVolts: 57.6, ccAmps: 6, termAmps: 0.6 }, maxSeconds: 4 * 3600, stopWhen: 'charged' }],
  meter: { readingPeriodSeconds: 1, voltsNoise: 0.005, ampsNoise: 0.01, tempNoise: 0.05 },
};
