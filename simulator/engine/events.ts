import type { Protection } from '../model/bms.js';

/** What happened inside the model, in simulated seconds: the truth the tests check against. */
export interface SimEvent {
  t: number;
  kind:
    | 'step-start'
    | 'step-end'
    | 'bms-trip'
    | 'bms-release'
    | 'heater-on'
    | 'heater-off'
    | 'unplug'
    | 'replug';
  /** Index of the program step, for step events. */
  step?: number;
  /** Why a step ended: its time ran out, or a stop condition was met. */
  reason?: 'max-time' | 'bms-trip' | 'bms-release' | 'end-volts' | 'charged';
  protection?: Protection;
  cell?: number;
  tempCelsius?: number;
}

/** Energy and charge through the pack terminals, integrated at the physics step. */
export interface SimTotals {
  /** Net energy out of the terminals (discharge positive), Wh. */
  netWh: number;
  /** Net charge out of the terminals, Ah. */
  netAh: number;
  dischargedWh: number;
  chargedWh: number;
  heaterWh: number;
}
