import { describe, expect, it } from 'vitest';
import { integrateReadings } from '../../shared/measure/integrator.js';
import { loadScenario } from '../scenario/registry.js';
import type { Scenario } from '../scenario/schema.js';
import { createSimulation, type Simulation } from './simulation.js';

/** Hours of a 16-cell pack at 0.25 s steps: seconds of work on a loaded two-core machine. */
const SLOW_SCENARIO_TIMEOUT_MS = 60_000;
const IDEAL_METER = { voltsNoise: 0, ampsNoise: 0, tempNoise: 0, dropProbability: 0, corruptProbability: 0, unplugs: [] };

function runToEnd(sim: Simulation) {
  const readings = [];
  for (let s = sim.step(); s; s = sim.step()) readings.push(s);
  return readings;
}

describe('energy balance against the measurement core', () => {
  it.each(['lfp-12v-100ah-cp-cutoff', 'lead-acid-12v-reserve', 'lfp-48v-30ah-pwm-heater'])(
    '%s: model energy equals the integrated frames within 0.1 %%',
    (name) => {
      const sim = createSimulation(loadScenario(name), { seed: 3, meter: IDEAL_METER });
      const frames = [...sim.frames()];
      const totals = integrateReadings(frames);
      const model = sim.bench.totals;
      const modelWh = model.dischargedWh + model.chargedWh;
      expect(modelWh).toBeGreaterThan(100);
      // The acceptance: within 0.1 % (frames every 1 s, model steps of 0.25 s).
      expect(Math.abs(totals.dischargeWh - model.dischargedWh)).toBeLessThanOrEqual(0.001 * modelWh);
      expect(Math.abs(totals.chargeWh - model.chargedWh)).toBeLessThanOrEqual(0.001 * modelWh);
    },
    SLOW_SCENARIO_TIMEOUT_MS,
  );

  it('a noisy meter with quantisation still integrates to the model energy within 0.1 %', () => {
    const sim = createSimulation(loadScenario('lfp-12v-100ah-cp-cutoff'), { seed: 9 });
    const totals = integrateReadings([...sim.frames()]);
    expect(Math.abs(totals.dischargeWh / sim.bench.totals.dischargedWh - 1)).toBeLessThan(0.001);
  });
});

describe('scenarios behave as their titles promise', () => {
  it('the weak-cell pack cuts off before the same pack with healthy cells, on the weak cell', () => {
    const weak = loadScenario('lfp-12v-weak-cell');
    const healthy: Scenario = { ...weak, pack: { ...weak.pack, cells: [] } };
    const tripOf = (scenario: Scenario) => {
      const sim = createSimulation(scenario, { seed: 1 });
      runToEnd(sim);
      return sim.bench.events.find((e) => e.kind === 'bms-trip');
    };
    const weakTrip = tripOf(weak);
    const healthyTrip = tripOf(healthy);
    expect(weakTrip?.protection).toBe('under-voltage');
    expect(weakTrip?.cell).toBe(weak.pack.cells[0].index);
    expect(healthyTrip).toBeDefined();
    // The weak cell holds 80 % of the capacity: the pack should stop near 80 % of the healthy time.
    expect(weakTrip!.t).toBeLessThan(0.9 * healthyTrip!.t);
    expect(weakTrip!.t).toBeGreaterThan(0.7 * healthyTrip!.t);
  });

  it('the cold scenario turns the heater on below its on threshold, off near its off threshold, and blocks charging while cold', () => {
    const scenario = loadScenario('lfp-48v-30ah-pwm-heater');
    const sim = createSimulation(scenario, { seed: 2 });
    const readings = runToEnd(sim);
    const heater = scenario.pack.heater!;
    const ons = sim.bench.events.filter((e) => e.kind === 'heater-on');
    const offs = sim.bench.events.filter((e) => e.kind === 'heater-off');
    expect(ons.length).toBeGreaterThanOrEqual(2);
    expect(offs.length).toBeGreaterThanOrEqual(1);
    for (const on of ons) expect(on.tempCelsius!).toBeLessThan(heater.onBelowCelsius);
    for (const off of offs) expect(Math.abs(off.tempCelsius! - heater.offAboveCelsius)).toBeLessThan(0.1);
    const inhibit = sim.bench.events.find((e) => e.kind === 'bms-trip' && e.protection === 'cold-charge');
    expect(inhibit?.t).toBe(scenario.bms!.coldChargeDelaySeconds);
    // While inhibited, the meter sees only the heater's current; after release the cells charge too.
    const blocked = readings.find((s) => s.t === 60)!.frame;
    expect(blocked.amps).toBeCloseTo(-blocked.aux!.heaterAmps, 1);
    const release = sim.bench.events.find((e) => e.kind === 'bms-release' && e.protection === 'cold-charge')!;
    const charging = readings.find((s) => s.t > release.t + 5)!.frame;
    expect(charging.amps).toBeLessThan(-5);
  }, SLOW_SCENARIO_TIMEOUT_MS);

  it('the recovery scenario reconnects after its configured recovery time', () => {
    const scenario = loadScenario('lfp-12v-100ah-cp-cutoff');
    const sim = createSimulation(scenario, { seed: 4 });
    const readings = runToEnd(sim);
    const trip = sim.bench.events.find((e) => e.kind === 'bms-trip')!;
    const release = sim.bench.events.find((e) => e.kind === 'bms-release')!;
    expect(trip.protection).toBe('under-voltage');
    expect(release.t - trip.t).toBeCloseTo(scenario.bms!.underVoltRecoverySeconds, 6);
    // On the wire: 0 V while open, the pack's voltage again once it reconnects, relaxing upwards.
    const open = readings.filter((s) => s.t > trip.t && s.t < release.t);
    expect(open.every((s) => s.frame.volts < 0.1)).toBe(true);
    const after = readings.filter((s) => s.t > release.t).map((s) => s.frame.volts);
    expect(after[0]).toBeGreaterThan(10);
    expect(after[after.length - 1]).toBeGreaterThan(after[0]);
    // Rated 100 Ah at 600 W: about two hours to cutoff (12.8 V × 100 Ah / 600 W ≈ 2.1 h).
    expect(trip.t / 3600).toBeGreaterThan(1.9);
    expect(trip.t / 3600).toBeLessThan(2.4);
  });

  it('the high-temperature check cuts off 10 s after 60 °C and reconnects below 50 °C', () => {
    const scenario = loadScenario('lfp-12v-hot-cutoff');
    // An unrounded thermometer, so the first reading over the limit is the true crossing.
    const sim = createSimulation(scenario, { seed: 5, meter: { ...IDEAL_METER, tempStep: 0 } });
    const readings = runToEnd(sim);
    const trip = sim.bench.events.find((e) => e.kind === 'bms-trip')!;
    const release = sim.bench.events.find((e) => e.kind === 'bms-release')!;
    expect(trip.protection).toBe('over-temperature');
    expect(trip.tempCelsius!).toBeGreaterThan(scenario.bms!.overTempCelsius);
    const firstHot = readings.find((s) => s.frame.temps!.cell > scenario.bms!.overTempCelsius)!;
    expect(trip.t - firstHot.t).toBeGreaterThanOrEqual(scenario.bms!.overTempDelaySeconds - 1);
    expect(trip.t - firstHot.t).toBeLessThanOrEqual(scenario.bms!.overTempDelaySeconds);
    expect(release.tempCelsius!).toBeLessThanOrEqual(scenario.bms!.overTempReleaseCelsius);
  });

  it('the lead-acid reserve test stops at 10.5 V with no BMS, after a plausible reserve time', () => {
    const sim = createSimulation(loadScenario('lead-acid-12v-reserve'), { seed: 6, meter: IDEAL_METER });
    const readings = runToEnd(sim);
    const end = sim.bench.events.find((e) => e.kind === 'step-end' && e.reason === 'end-volts')!;
    expect(sim.bench.events.some((e) => e.kind === 'bms-trip')).toBe(false);
    const lastLoaded = readings.filter((s) => s.frame.amps > 1).at(-1)!;
    expect(lastLoaded.frame.volts).toBeGreaterThanOrEqual(10.49);
    expect(lastLoaded.frame.volts).toBeLessThan(10.6);
    // A 100 Ah (C/20) battery has a reserve capacity of roughly 150-200 min (trade tables, from memory).
    expect(end.t / 60).toBeGreaterThan(140);
    expect(end.t / 60).toBeLessThan(210);
  });

  it('the noisy meter loses frames, garbles some, and is silent while unplugged', () => {
    const sim = createSimulation(loadScenario('noisy-meter-unplug'), { seed: 8 });
    const readings = runToEnd(sim);
    const unplug = sim.meter.unplugs[0];
    const during = readings.filter((s) => s.t >= unplug.atSeconds && s.t < unplug.atSeconds + unplug.forSeconds);
    expect(during.length).toBe(unplug.forSeconds);
    expect(during.every((s) => s.lost === 'unplugged')).toBe(true);
    const dropped = readings.filter((s) => s.lost === 'dropped').length / readings.length;
    const corrupt = readings.filter((s) => s.corrupt).length / readings.length;
    expect(dropped).toBeGreaterThan(0.005);
    expect(dropped).toBeLessThan(0.04);
    expect(corrupt).toBeGreaterThan(0);
    expect(corrupt).toBeLessThan(0.03);
    expect(sim.bench.events.map((e) => e.kind)).toEqual(expect.arrayContaining(['unplug', 'replug']));
  });
});

describe('determinism', () => {
  it('the same seed gives the same frames; another seed gives other noise', () => {
    const scenario = loadScenario('noisy-meter-unplug');
    const a = [...createSimulation(scenario, { seed: 42 }).frames()];
    const b = [...createSimulation(scenario, { seed: 42 }).frames()];
    const c = [...createSimulation(scenario, { seed: 43 }).frames()];
    expect(b).toEqual(a);
    expect(JSON.stringify(c)).not.toEqual(JSON.stringify(a));
  });

  it('rejects an invalid scenario with the field named', () => {
    const scenario = loadScenario('lfp-12v-weak-cell');
    expect(() => createSimulation({ ...scenario, pack: { ...scenario.pack, cellsInSeries: 0 } })).toThrow(/cellsInSeries/);
  });
});
