import type { ScenarioInput } from '../scenario/schema.js';

/**
 * Reserve capacity: minutes at 25 A to 10.5 V at 27 °C (the usual rating for 12 V lead-acid
 * batteries, from memory). A lead-acid battery has no BMS: the load's end voltage stops the test.
 */
export const leadAcid12vReserve: ScenarioInput = {
  name: 'lead-acid-12v-reserve',
  title: 'Hollis Power 12 V 100 Ah flooded lead-acid: reserve capacity at 25 A',
  description: 'A charged 6-cell flooded battery discharged at a constant 25 A until 10.5 V (1.75 V a cell) at 27 °C.',
  pack: {
    label: 'Hollis Power 12 V 100 Ah flooded',
    chemistry: 'lead-acid',
    cellsInSeries: 6,
    ratedAh: 100,
    capacityTolerancePct: 2,
    initialSoc: 1,
    initialTempCelsius: 27,
    // About 25 kg of lead, acid and case at roughly 1.1 kJ/(kg·K) (from memory).
    thermal: { heatCapacityJPerK: 27_000, toAmbientKPerW: 0.3 },
  },
  ambient: [{ atSeconds: 0, tempCelsius: 27 }],
  program: [{ kind: 'discharge', load: { mode: 'cc', amps: 25 }, endVolts: 10.5, maxSeconds: 6 * 3600 }, { kind: 'rest', maxSeconds: 600 }],
  meter: { readingPeriodSeconds: 1, voltsNoise: 0.002, ampsNoise: 0.01, tempNoise: 0.05 },
};
