import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import type { ProtectionRequest, ProtectionResult, ProtectionSpecInput } from '../../shared/schemas/protection-check.js';
import { PROTECTION_TRAITS } from '../../shared/schemas/protection-check.js';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { ScenarioSchema, startPtyMeter, type Scenario, type SimEvent } from '../../simulator/index.js';
import {
  checkColdCharge, checkElectricalDischarge, checkHighVoltage, checkHotCharge, checkHotDischarge,
} from '../../simulator/scenarios/protection-checks.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually, tempSpillDir } from './runs-kit.js';

/**
 * Every protection over the real serial path: the simulator's meter writes JSON lines into a
 * socat pseudo-terminal (under /tmp), the serial source reads them, the bench manager hands
 * frames to the run recorder, and the run's protection table must give back each threshold
 * and delay the scenario's BMS was set to, delays within one sample period. The simulator's
 * own BMS trips and releases are the reference. Thresholds are the scenarios' settings; the
 * trade's usual values behind them: LFP packs commonly refuse charge near 0 °C (common
 * practice), 2.5 V and 3.65 V a cell are the usual LFP limits (from memory).
 */
const SAMPLE_PERIOD_S = 1; // every check scenario's meter period

let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext({ attachments: [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() })] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
});
afterAll(async () => {
  await t?.close();
});

interface Played {
  runId: number;
  rows: ProtectionResult[];
  frames: Frame[];
  sim: SimEvent[];
  summary: { verdict: string; chargeAh: number; dischargeAh: number; percentRatedAh: number | null };
}

/** Plays a scenario to its end into a protection-check run on a fresh bench; returns what the server made of it. */
async function play(input: unknown, checks: ProtectionRequest[], specs: ProtectionSpecInput[] = []): Promise<Played> {
  const scenario: Scenario = ScenarioSchema.parse(input);
  const link = `/tmp/kneepoint-protection-${process.pid}-${scenario.name}`;
  const meter = await startPtyMeter({ scenario, format: 'jsonl', linkPath: link, autoplay: false, seed: 3 });
  try {
    const bench = (await admin.post('/api/benches').send({ name: `Check ${scenario.name}`, source: { kind: 'serial', path: link, baudRate: 115200, format: { kind: 'jsonl' } } }).expect(201)).body.bench;
    const battery = (
      await tech.post('/api/batteries').send({ label: scenario.name, brand: 'Northgate test packs', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20, protectionSpecs: specs }).expect(201)
    ).body.battery;
    const manager = t.ctx.services.benchManager!;
    await eventually(async () => expect(manager.getStatus(bench.id).state).toMatch(/connected|receiving/));
    const run = (
      await tech.post('/api/runs').send({ benchId: bench.id, batteryId: battery.id, name: scenario.title, kind: 'protection-check', stopWhen: 'manual', protectionChecks: checks }).expect(201)
    ).body.run;
    const frames: Frame[] = [];
    for (;;) {
      const sample = await meter.tick();
      if (!sample) break;
      frames.push(sample.frame);
      if (frames.length % 200 === 0) await eventually(async () => expect(manager.getStatus(bench.id).framesOk).toBeGreaterThanOrEqual(frames.length - 5), 10_000, 5);
    }
    await eventually(async () => expect(manager.getStatus(bench.id).framesOk).toBeGreaterThanOrEqual(frames.length), 10_000, 5);
    const done = (await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200)).body.run;
    await admin.delete(`/api/benches/${bench.id}`);
    return { runId: run.id, rows: done.summary.protections, frames, sim: meter.simulation.bench.events, summary: done.summary };
  } finally {
    await meter.stop();
  }
}

/** The largest change of a check's signal between two readings from the crossing to the trip (the drift over the delay). */
function driftPerReading(row: ProtectionResult, frames: Frame[], fromT: number, toT: number): number {
  const signal = (f: Frame) => (PROTECTION_TRAITS[row.protection].signal === 'volts' ? f.volts : PROTECTION_TRAITS[row.protection].signal === 'amps' ? f.amps : f.temps!.cell!);
  let most = 0;
  for (let i = 1; i < frames.length; i++) if (frames[i]!.t >= fromT && frames[i]!.t <= toT) most = Math.max(most, Math.abs(signal(frames[i]!) - signal(frames[i - 1]!)));
  return most;
}

/** Checks one row against the simulator: delay within one sample, threshold within the drift over the delay plus a sample, resume time as the BMS's. */
function expectGivenBack(p: Played, row: ProtectionResult, protection: string, simProtection: string, delaySeconds: number): void {
  const trip = p.sim.find((e) => e.kind === 'bms-trip' && e.protection === simProtection)!;
  const release = p.sim.find((e) => e.kind === 'bms-release' && e.protection === simProtection && e.t > trip.t);
  expect(row.protection).toBe(protection);
  expect(row.outcome).toBe('pass');
  expect(Math.abs(row.measuredDelaySeconds! - delaySeconds)).toBeLessThanOrEqual(SAMPLE_PERIOD_S);
  const drift = driftPerReading(row, p.frames, trip.t - delaySeconds - 2 * SAMPLE_PERIOD_S, trip.t + SAMPLE_PERIOD_S);
  expect(Math.abs(row.measuredValue! - row.expectedValue)).toBeLessThanOrEqual(drift * (delaySeconds + SAMPLE_PERIOD_S) + 1e-9);
  if (release) expect(Math.abs(row.resumeSeconds! - (release.t - trip.t))).toBeLessThanOrEqual(SAMPLE_PERIOD_S);
  expect(row.window!.fromSeconds).toBeLessThanOrEqual(trip.t);
}

describe('protection checks over the real serial path give back the BMS settings', () => {
  it('cold-charge inhibit, charging resuming after warming, and a PWM heater with its mean and peak current', async () => {
    const bms = checkColdCharge.bms!;
    const heater = checkColdCharge.pack.heater!;
    const p = await play(checkColdCharge, [
      { protection: 'cold-charge', thresholdValue: bms.coldChargeBelowCelsius, delaySeconds: bms.coldChargeDelaySeconds, releaseValue: bms.coldChargeReleaseCelsius, channel: 'cell' },
      { protection: 'heater-on', thresholdValue: heater.onBelowCelsius, channel: 'cell' },
      { protection: 'heater-off', thresholdValue: heater.offAboveCelsius, channel: 'cell' },
    ]);
    expect(p.summary.verdict).toBe('not-applicable');
    expect(p.summary.percentRatedAh).toBeNull();
    expect(p.summary.chargeAh).toBeGreaterThan(0);
    const [cold, on, off] = p.rows;
    expectGivenBack(p, cold!, 'cold-charge', 'cold-charge', bms.coldChargeDelaySeconds);
    // Charging resumes once the pack has warmed past the release temperature (within a sample's warming).
    expect(cold!.releaseValue!).toBeGreaterThanOrEqual(bms.coldChargeReleaseCelsius - 0.05);
    expect(cold!.releaseValue!).toBeLessThan(bms.coldChargeReleaseCelsius + 0.1);
    const simOn = p.sim.find((e) => e.kind === 'heater-on')!;
    const simOff = p.sim.find((e) => e.kind === 'heater-off')!;
    expect(on).toMatchObject({ protection: 'heater-on', outcome: 'pass' });
    expect(off).toMatchObject({ protection: 'heater-off', outcome: 'pass' });
    expect(Math.abs(on!.measuredValue! - simOn.tempCelsius!)).toBeLessThan(0.1);
    expect(Math.abs(off!.measuredValue! - simOff.tempCelsius!)).toBeLessThan(0.1);
    // PWM 2 s on / 1 s off: the mean is about two thirds of the peak (V²/R at the charger's voltage).
    expect(off!.meanHeaterAmps! / off!.peakHeaterAmps!).toBeGreaterThan(0.6);
    expect(off!.meanHeaterAmps! / off!.peakHeaterAmps!).toBeLessThan(0.73);
  }, 240_000);

  it('over-temperature on discharge and on charge', async () => {
    const bms = checkHotDischarge.bms!;
    const d = await play(checkHotDischarge, [{ protection: 'over-temp-discharge', thresholdValue: bms.overTempCelsius, delaySeconds: bms.overTempDelaySeconds, channel: 'cell' }]);
    expectGivenBack(d, d.rows[0]!, 'over-temp-discharge', 'over-temperature', bms.overTempDelaySeconds);
    const c = await play(checkHotCharge, [{ protection: 'over-temp-charge', thresholdValue: bms.overTempCelsius, delaySeconds: bms.overTempDelaySeconds, channel: 'cell' }]);
    expectGivenBack(c, c.rows[0]!, 'over-temp-charge', 'over-temperature', bms.overTempDelaySeconds);
  }, 240_000);

  it('over-current, low-voltage cutoff and recovery (thresholds from the pack\'s record), high-voltage cutoff', async () => {
    const bms = checkElectricalDischarge.bms!;
    const cells = checkElectricalDischarge.pack.cellsInSeries;
    // Nothing typed on the run but the protections: thresholds and delays come from the pack's record.
    const e = await play(checkElectricalDischarge, [{ protection: 'over-current' }, { protection: 'low-voltage' }], [
      // A 45 A step on a 40 A limit: the trip value is the step's current, so the record states a 5 A tolerance.
      { protection: 'over-current', thresholdValue: bms.overCurrentAmps, delaySeconds: bms.overCurrentDelaySeconds, thresholdTolerance: 5 },
      { protection: 'low-voltage', thresholdValue: bms.cellUnderVolts * cells, delaySeconds: bms.underVoltDelaySeconds },
    ]);
    expect(e.rows[0]).toMatchObject({ protection: 'over-current', expectedValue: 40, measuredValue: 45, thresholdTolerance: 5, outcome: 'pass' });
    expect(Math.abs(e.rows[0]!.measuredDelaySeconds! - bms.overCurrentDelaySeconds)).toBeLessThanOrEqual(SAMPLE_PERIOD_S);
    expect(Math.abs(e.rows[0]!.resumeSeconds! - bms.overCurrentRecoverySeconds)).toBeLessThanOrEqual(SAMPLE_PERIOD_S);
    expectGivenBack(e, e.rows[1]!, 'low-voltage', 'under-voltage', bms.underVoltDelaySeconds);
    expect(Math.abs(e.rows[1]!.resumeSeconds! - bms.underVoltRecoverySeconds)).toBeLessThanOrEqual(SAMPLE_PERIOD_S);

    const hv = checkHighVoltage.bms!;
    const h = await play(checkHighVoltage, [{ protection: 'high-voltage', thresholdValue: hv.cellOverVolts * cells, delaySeconds: hv.overVoltDelaySeconds }]);
    expectGivenBack(h, h.rows[0]!, 'high-voltage', 'over-voltage', hv.overVoltDelaySeconds);

    // The pack's record: every protection checked on its runs, latest run first.
    const batteryId = (await tech.get(`/api/runs/${e.runId}`).expect(200)).body.run.batteryId;
    const record = (await tech.get(`/api/batteries/${batteryId}/protections`).expect(200)).body;
    expect(record.rows.map((r: { protection: string }) => r.protection)).toEqual(['over-current', 'low-voltage']);
    expect(record.specs).toHaveLength(2);
  }, 240_000);

  it('refuses a protection with no threshold on the run or in the pack\'s record, and a capacity run with protections', async () => {
    const bench = (await admin.post('/api/benches').send({ name: 'Check refusals', source: { kind: 'none' } }).expect(201)).body.bench;
    const battery = (await tech.post('/api/batteries').send({ label: 'No specs', brand: 'Northgate test packs', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20 }).expect(201)).body.battery;
    const base = { benchId: bench.id, batteryId: battery.id, name: 'Refused', stopWhen: 'manual' };
    const missing = await tech.post('/api/runs').send({ ...base, kind: 'protection-check', protectionChecks: [{ protection: 'cold-charge' }] }).expect(400);
    expect(missing.body.error.fields.protectionChecks[0]).toMatch(/cold-charge inhibit.*pack's record/);
    const nothing = await tech.post('/api/runs').send({ ...base, kind: 'protection-check' }).expect(400);
    expect(nothing.body.error.fields.protectionChecks[0]).toMatch(/Nothing to check/);
    await tech.post('/api/runs').send({ ...base, protectionChecks: [{ protection: 'cold-charge', thresholdValue: 0 }] }).expect(400);
    await tech.post('/api/batteries').send({ label: 'Twice', brand: 'X', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20, protectionSpecs: [{ protection: 'cold-charge', thresholdValue: 0 }, { protection: 'cold-charge', thresholdValue: 1 }] }).expect(400);
  });
});
