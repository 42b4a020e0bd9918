import type { ScenarioInput } from '../scenario/schema.js';
import { lfpBms, lfpThermal } from './lfp-defaults.js';

/**
 * Short protection-check scenarios (fictional packs, invented settings) for timing each
 * protection: every one drives a signal past a BMS setting whose threshold and delay are
 * stated here, so a test can ask the measurement core to give them back. The meter is ideal
 * (no noise, fine steps) so only the sample period limits what can be measured.
 */
const IDEAL_METER = { readingPeriodSeconds: 1, voltsNoise: 0, ampsNoise: 0, tempNoise: 0, voltsStep: 0.0001, ampsStep: 0.0001, tempStep: 0.0001 };
/** A small, quickly cooled pack so temperature protections act within minutes. */
const FAST_THERMAL = { heatCapacityJPerK: 1500, toAmbientKPerW: 0.4 };

const pack = (over: Partial<ScenarioInput['pack']> = {}): ScenarioInput['pack'] => ({
  label: 'Northgate check pack 12.8 V 20 Ah', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20, initialSoc: 0.5, initialTempCelsius: 25,
  thermal: lfpThermal(4, 20), ...over,
});

/** Cold charge in a −10 °C chamber: charge inhibit below 0 °C after 5 s, PWM heater on below 2 °C, off above 7 °C, charging again at 3 °C. */
export const checkColdCharge: ScenarioInput = {
  name: 'check-cold-charge',
  title: 'Protection check: cold-charge inhibit and a PWM heater',
  // heater on below −1 °C and off above 7 °C: this pack's own (invented) thermostat.
  description: 'Charging at 10 A while the chamber cools the pack through 0 °C; the heater film brings it back.',
  pack: pack({ initialTempCelsius: 1, thermal: FAST_THERMAL, heater: { watts: 80, ratedVolts: 12.8, onBelowCelsius: -1, offAboveCelsius: 7, pwm: { onSeconds: 2, offSeconds: 1 } } }),
  bms: lfpBms({ coldChargeBelowCelsius: 0, coldChargeDelaySeconds: 5, coldChargeReleaseCelsius: 3 }),
  ambient: [{ atSeconds: 0, tempCelsius: -10 }],
  // The charger feeds the heater first: 10 A leaves the cells about 3 A in a heater on slot.
  program: [{ kind: 'charge', charger: { cvVolts: 14.2, ccAmps: 10 }, maxSeconds: 2400 }],
  meter: IDEAL_METER,
};

const hotAmbient = [{ atSeconds: 0, tempCelsius: 80 }, { atSeconds: 400, tempCelsius: 80 }, { atSeconds: 401, tempCelsius: 10 }];

/** Over-temperature on discharge: 20 A in an 80 °C chamber, cutoff 8 s after 60 °C, reconnect below 50 °C. */
export const checkHotDischarge: ScenarioInput = {
  name: 'check-hot-discharge',
  title: 'Protection check: over-temperature on discharge',
  description: 'Discharging at 20 A in a hot chamber that is then cooled.',
  pack: pack({ initialTempCelsius: 50, thermal: FAST_THERMAL }),
  bms: lfpBms({ overTempCelsius: 60, overTempDelaySeconds: 8, overTempReleaseCelsius: 50 }),
  ambient: hotAmbient,
  program: [{ kind: 'discharge', load: { mode: 'cc', amps: 10 }, maxSeconds: 900 }],
  meter: IDEAL_METER,
};

/** Over-temperature on charge: 5 A charge in the same chamber. */
export const checkHotCharge: ScenarioInput = {
  ...checkHotDischarge,
  name: 'check-hot-charge',
  title: 'Protection check: over-temperature on charge',
  description: 'Charging at 5 A in a hot chamber that is then cooled.',
  pack: pack({ initialTempCelsius: 50, initialSoc: 0.3, thermal: FAST_THERMAL }),
  program: [{ kind: 'charge', charger: { cvVolts: 14.2, ccAmps: 5 }, maxSeconds: 900 }],
};

/** Over-current then low voltage: 45 A past a 40 A limit (1 s), then 20 A to 2.5 V a cell (2 s), reconnect after 60 s. */
export const checkElectricalDischarge: ScenarioInput = {
  name: 'check-electrical-discharge',
  title: 'Protection check: over-current, then low-voltage cutoff and recovery',
  description: 'A 45 A step past the over-current limit, then a 10 A discharge from nearly empty to the low-voltage cutoff.',
  pack: pack({ initialSoc: 0.06 }),
  bms: lfpBms({ overCurrentAmps: 40, overCurrentDelaySeconds: 1, overCurrentRecoverySeconds: 20, cellUnderVolts: 2.5, underVoltDelaySeconds: 2, underVoltRecoverySeconds: 60, cellUnderVoltsRelease: 2.55 }),
  ambient: [{ atSeconds: 0, tempCelsius: 25 }],
  program: [
    { kind: 'rest', maxSeconds: 10 },
    // The technician turns the load down to 10 A once the pack has cut off: it flows again when the BMS reconnects.
    { kind: 'discharge', load: { mode: 'cc', amps: 45 }, maxSeconds: 3 },
    { kind: 'discharge', load: { mode: 'cc', amps: 10 }, maxSeconds: 900 },
  ],
  meter: IDEAL_METER,
};

/** High voltage on charge: a 15.2 V charger past 3.65 V a cell (14.6 V), cutoff after 2 s, release at 3.5 V a cell. */
export const checkHighVoltage: ScenarioInput = {
  name: 'check-high-voltage',
  title: 'Protection check: high-voltage cutoff on charge',
  description: 'Charging a nearly full pack at 10 A on a charger set above the cell limit.',
  pack: pack({ initialSoc: 0.97 }),
  bms: lfpBms({ cellOverVolts: 3.65, overVoltDelaySeconds: 2, cellOverVoltsRelease: 3.5, overVoltRecoverySeconds: 0 }),
  ambient: [{ atSeconds: 0, tempCelsius: 25 }],
  program: [{ kind: 'charge', charger: { cvVolts: 15.2, ccAmps: 10 }, maxSeconds: 600 }],
  meter: IDEAL_METER,
};

/** Every protection-check scenario. */
export const PROTECTION_CHECK_SCENARIOS: readonly ScenarioInput[] = [checkColdCharge, checkHotDischarge, checkHotCharge, checkElectricalDischarge, checkHighVoltage];
