import { describe, expect, it } from 'vitest';
import { createRunPipeline } from '../../shared/measure/run-pipeline.js';
import { loadScenario } from '../scenario/registry.js';
import { createSimulation } from './simulation.js';

/**
 * The simulator's frames through the measurement core's run pipeline (integrator + detector):
 * what the core detects must match what the model did.
 */
describe('simulated runs through the measurement core', () => {
  it('the core sees the protection cutoff and times the reconnect as the BMS did', () => {
    const scenario = loadScenario('lfp-12v-100ah-cp-cutoff');
    const sim = createSimulation(scenario, { seed: 11 });
    const pipeline = createRunPipeline({ chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100, ratedWh: 1280 });
    const { events } = pipeline.pushMany(sim.frames());
    const trip = sim.bench.events.find((e) => e.kind === 'bms-trip')!;
    const cutoff = events.find((e) => e.type === 'cutoff');
    const recovery = events.find((e) => e.type === 'recovery');
    expect(cutoff && cutoff.type === 'cutoff' && cutoff.cause).toBe('protection');
    expect(Math.abs(cutoff!.elapsedSeconds - trip.t)).toBeLessThanOrEqual(5);
    // The detector confirms over a few readings, so allow a few sample periods either way.
    expect(recovery && recovery.type === 'recovery' && Math.abs(recovery.recoverySeconds - scenario.bms!.underVoltRecoverySeconds)).toBeLessThanOrEqual(5);
    expect(Math.abs(pipeline.totals().dischargeWh / sim.bench.totals.dischargedWh - 1)).toBeLessThan(0.001);
  });

  it('the core sees each heater cycle the model ran', () => {
    const sim = createSimulation(loadScenario('lfp-48v-30ah-pwm-heater'), { seed: 12 });
    const { events } = createRunPipeline({ chemistry: 'lfp', cellsInSeries: 16, ratedAh: 30 }).pushMany(sim.frames());
    const modelOns = sim.bench.events.filter((e) => e.kind === 'heater-on');
    const coreOns = events.filter((e) => e.type === 'heater-on');
    expect(coreOns.length).toBe(modelOns.length);
    coreOns.forEach((on, i) => expect(Math.abs(on.elapsedSeconds - modelOns[i].t)).toBeLessThanOrEqual(5));
  }, 30_000); // hours of simulated charge at 1 Hz
});
