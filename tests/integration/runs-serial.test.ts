import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { loadScenario, startPtyMeter, type PtyMeter } from '../../simulator/index.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually, tempSpillDir } from './runs-kit.js';

/**
 * A whole capacity test over the real serial path: the simulator's meter writes CSV into a
 * socat pseudo-terminal (under /tmp), the ingest area's serial source reads it, the bench
 * manager hands frames to the run recorder, and the measurement core integrates and
 * detects on the server. The simulator's own physics totals are the reference.
 */
const SCENARIO = loadScenario('lfp-12v-100ah-cp-cutoff');
const SAMPLE_PERIOD_S = 1; // the scenario's meter period
const LINK = `/tmp/kneepoint-live-run-${process.pid}`;
const TOLERANCE = 0.005; // 0.5 %

let t: TestContext;
let meter: PtyMeter;
let admin: SignedInAgent;
let tech: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext({ attachments: [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() })] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
  meter = await startPtyMeter({ scenario: SCENARIO, format: 'csv', linkPath: LINK, autoplay: false, seed: 11 });
});
afterAll(async () => {
  await meter?.stop();
  await t?.close();
});

describe('a simulated capacity run over the real serial path', () => {
  it('matches the simulator\'s delivered energy within 0.5 %, with one cutoff and the scenario\'s recovery time', async () => {
    const bench = (
      await admin
        .post('/api/benches')
        .send({ name: 'Bench 3 (pty)', source: { kind: 'serial', path: LINK, baudRate: 115200, format: { kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'] } } })
        .expect(201)
    ).body.bench;
    const battery = (await tech.post('/api/batteries').send({ label: '12.8 V 100 Ah', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100 }).expect(201)).body.battery;
    const manager = t.ctx.services.benchManager!;
    await eventually(async () => expect(manager.getStatus(bench.id).state).toMatch(/connected|receiving/));
    // End voltage below the BMS's own cell limit, so the pack's protection is what cuts off; the
    // run says a trip ends the test, so it finishes 30 s after the reconnect.
    const run = (
      await tech
        .post('/api/runs')
        .send({ benchId: bench.id, batteryId: battery.id, name: 'Voltara 100 Ah at 600 W', endVolts: { mode: 'per-cell', voltsPerCell: 2.0 }, stopWhen: 'after-recovery', afterRecoverySeconds: 30, protectionEndsTest: true })
        .expect(201)
    ).body.run;

    let sent = 0;
    for (;;) {
      const sample = await meter.tick();
      if (!sample) break;
      if (!sample.lost && !sample.corrupt) sent++;
      // Keep the pseudo-terminal's buffer short: wait for the source to catch up now and then.
      if (sent % 200 === 0) await eventually(async () => expect(manager.getStatus(bench.id).framesOk).toBeGreaterThanOrEqual(sent - 5), 10_000, 5);
    }
    const done = await eventually(async () => {
      const r = (await tech.get(`/api/runs/${run.id}`).expect(200)).body.run;
      expect(r.state).toBe('finished');
      return r;
    }, 30_000);

    const sim = meter.simulation.bench;
    const events = (await tech.get(`/api/runs/${run.id}/events`).expect(200)).body.events.map((e: { event: { type: string } }) => e.event);
    const cutoffs = events.filter((e: { type: string }) => e.type === 'cutoff');
    expect(cutoffs).toHaveLength(1);
    expect(cutoffs[0].cause).toBe('protection');

    // Reference: the simulator's physics totals (its own fine-step integration of V·I),
    // up to the end of the recorded run (the run finished 30 s after the reconnect; the
    // load was already off by then, so nothing was delivered after it).
    const s = done.summary;
    expect(Math.abs(s.dischargeWh - s.chargeWh - sim.totals.netWh) / sim.totals.netWh).toBeLessThan(TOLERANCE);
    expect(Math.abs(s.dischargeAh - s.chargeAh - sim.totals.netAh) / sim.totals.netAh).toBeLessThan(TOLERANCE);

    // Recovery: the simulator's BMS trip → release time, within one sample period.
    const trip = sim.events.find((e) => e.kind === 'bms-trip')!;
    const release = sim.events.find((e) => e.kind === 'bms-release' && e.t > trip.t)!;
    expect(s.recoverySeconds).not.toBeNull();
    expect(Math.abs(s.recoverySeconds - (release.t - trip.t))).toBeLessThanOrEqual(SAMPLE_PERIOD_S);
  }, 120_000);
});
