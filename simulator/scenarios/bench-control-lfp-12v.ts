import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

/** Hours the bench waits for commands: long enough for a full charge, rest, discharge, rest, recharge. */
const IDLE_HOURS = 24;

/**
 * A pack on a bench with a simulated electronic load and supply: the program is one long
 * rest, and the instruments (commanded over their own ports) load and charge the pack.
 */
export const benchControlLfp12v: ScenarioInput = {
  name: 'bench-control-lfp-12v',
  title: 'Ferrowatt 12.8 V 20 Ah LFP on a controlled bench (load and supply)',
  description:
    'Half-charged 4-cell LFP pack at rest; the simulated load and supply on their own ports ' +
    'discharge and charge it when commanded (SCPI or Modbus). The BMS protects as usual.',
  pack: {
    label: 'Ferrowatt 12.8 V 20 Ah',
    chemistry: 'lfp',
    cellsInSeries: 4,
    ratedAh: 20,
    initialSoc: 0.5,
    initialTempCelsius: 23,
    thermal: lfpThermal(4, 20),
  },
  bms: lfpBms(),
  ambient: [{ atSeconds: 0, tempCelsius: 23 }],
  program: [{ kind: 'rest', maxSeconds: IDLE_HOURS * SECONDS_PER_HOUR }],
  meter: { readingPeriodSeconds: 1 },
};
