import { describe, expect, it } from 'vitest';
import { lfpBms } from '../scenarios/lfp-defaults.js';
import { BmsSchema } from '../scenario/schema.js';
import { createBms, type BmsInputs } from './bms.js';

const config = BmsSchema.parse(lfpBms());
const DT_S = 0.25;
const healthy: BmsInputs = { cellVolts: [3.3, 3.3, 3.3, 3.3], amps: 10, tempCelsius: 25 };

/** Feeds the same inputs for a number of seconds; returns the changes with their times. */
function hold(bms: ReturnType<typeof createBms>, inputs: BmsInputs, seconds: number, start = 0) {
  const out: { t: number; kind: string; protection: string; cell?: number }[] = [];
  for (let t = start; t < start + seconds - 1e-9; t += DT_S) {
    for (const change of bms.update(inputs, DT_S)) out.push({ t: t + DT_S, ...change });
  }
  return out;
}

describe('BMS', () => {
  it('opens on a low cell only after its delay, names the cell, and recovers after the recovery time', () => {
    const bms = createBms(config);
    const low = { ...healthy, cellVolts: [3.2, 3.2, 2.45, 3.2] };
    // A dip shorter than the delay is ignored (no nuisance trips).
    expect(hold(bms, low, config.underVoltDelaySeconds - 0.5)).toEqual([]);
    hold(bms, healthy, 1);
    const trips = hold(bms, low, config.underVoltDelaySeconds, 10);
    expect(trips).toEqual([{ t: 10 + config.underVoltDelaySeconds, kind: 'bms-trip', protection: 'under-voltage', cell: 2 }]);
    expect(bms.dischargeOpen).toBe(true);
    expect(bms.chargeOpen).toBe(false);
    const rested = { ...healthy, amps: 0, cellVolts: [3.1, 3.1, 2.8, 3.1] };
    const releases = hold(bms, rested, config.underVoltRecoverySeconds + 5, 20);
    expect(releases).toEqual([{ t: 20 + config.underVoltRecoverySeconds, kind: 'bms-release', protection: 'under-voltage' }]);
    expect(bms.dischargeOpen).toBe(false);
  });

  it('stays open past the recovery time while the cell is still below its release voltage', () => {
    const bms = createBms(config);
    hold(bms, { ...healthy, cellVolts: [3.2, 2.4, 3.2, 3.2] }, config.underVoltDelaySeconds);
    expect(hold(bms, { ...healthy, amps: 0, cellVolts: [3.2, 2.5, 3.2, 3.2] }, config.underVoltRecoverySeconds * 2)).toEqual([]);
    expect(bms.dischargeOpen).toBe(true);
  });

  it('blocks charging on a high cell, on cold, and both ways on heat, each after its own delay', () => {
    const high = createBms(config);
    const highTrips = hold(high, { ...healthy, amps: -10, cellVolts: [3.5, 3.7, 3.5, 3.5] }, config.overVoltDelaySeconds);
    expect(highTrips.map((c) => [c.protection, c.cell])).toEqual([['over-voltage', 1]]);
    expect(high.chargeOpen && !high.dischargeOpen).toBe(true);

    const cold = createBms(config);
    expect(hold(cold, { ...healthy, tempCelsius: -1 }, config.coldChargeDelaySeconds - DT_S)).toEqual([]);
    expect(hold(cold, { ...healthy, tempCelsius: -1 }, DT_S).map((c) => c.protection)).toEqual(['cold-charge']);
    expect(cold.chargeOpen && !cold.dischargeOpen).toBe(true);
    // Hysteresis: warming past 0 °C is not enough, the release is at coldChargeReleaseCelsius.
    expect(hold(cold, { ...healthy, tempCelsius: config.coldChargeReleaseCelsius - 0.5 }, 10)).toEqual([]);
    expect(hold(cold, { ...healthy, tempCelsius: config.coldChargeReleaseCelsius }, DT_S).map((c) => c.kind)).toEqual(['bms-release']);

    const hot = createBms(config);
    expect(hold(hot, { ...healthy, tempCelsius: config.overTempCelsius + 1 }, config.overTempDelaySeconds - DT_S)).toEqual([]);
    expect(hold(hot, { ...healthy, tempCelsius: config.overTempCelsius + 1 }, DT_S).map((c) => c.protection)).toEqual(['over-temperature']);
    expect(hot.chargeOpen && hot.dischargeOpen).toBe(true);
  });

  it('opens on over-current after its delay and closes after its recovery time', () => {
    const bms = createBms(config);
    const surge = { ...healthy, amps: config.overCurrentAmps + 20 };
    const trips = hold(bms, surge, config.overCurrentDelaySeconds);
    expect(trips.map((c) => c.protection)).toEqual(['over-current']);
    const releases = hold(bms, { ...healthy, amps: 0 }, config.overCurrentRecoverySeconds, config.overCurrentDelaySeconds);
    expect(releases).toEqual([{ t: config.overCurrentDelaySeconds + config.overCurrentRecoverySeconds, kind: 'bms-release', protection: 'over-current' }]);
  });
});
