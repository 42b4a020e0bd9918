import type { SimInstrumentSpec } from './sim-instrument.js';

/** The simulator's electronic load (fictional maker and model): all four modes, 60 A, 150 V. */
export const SIM_LOAD_SPEC: SimInstrumentSpec = {
  role: 'load',
  idn: 'Kneepoint,KP-SIM-LOAD,SIML000001,0.1',
  modes: ['cc', 'cp', 'cr', 'cv'],
  maxAmps: 60,
  maxVolts: 150,
};

/** The simulator's supply / charger (fictional): CV with a current limit, or CC; 30 A, 80 V. */
export const SIM_SUPPLY_SPEC: SimInstrumentSpec = {
  role: 'supply',
  idn: 'Kneepoint,KP-SIM-PSU,SIMP000001,0.1',
  modes: ['cc', 'cv'],
  maxAmps: 30,
  maxVolts: 80,
};
