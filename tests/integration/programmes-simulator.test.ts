import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/benches/attach-bench-manager.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import { SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../shared/schemas/instrument-presets.js';
import type { ProgrammeInput } from '../../shared/schemas/programme.js';
import type { RunProgramme } from '../../shared/schemas/programme-run.js';
import { startSimulatedBench, type SimulatedBench } from '../../simulator/index.js';
import { benchControlLfp12v } from '../../simulator/scenarios/bench-control-lfp-12v.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually, tempSpillDir } from './runs-kit.js';

/**
 * A full capacity programme end to end: the simulator's meter (JSON lines, its own clock) and
 * its electronic load and supply (SCPI) on socat pseudo-terminals under /tmp, the bench's
 * meter and instruments set up through the API, and the server driving them step by step.
 */
const TIMEOUT_MS = 240_000;
/** Simulated seconds per real second: a 1 h discharge takes 30 s. */
const SPEED = 120;
const link = (name: string) => `/tmp/kp-prog-${process.pid}-${name}`;
// A made-up 4-cell LFP pack of 5 Ah (demo values), 60 % charged, on the bench-control scenario.
const RATED_AH = 5;
const PROGRAMME: ProgrammeInput = {
  name: 'Full capacity, 4s LFP 5 Ah',
  chemistry: 'lfp',
  cellsInSeries: 4,
  maxCurrentAmps: 20,
  steps: [
    { kind: 'charge', volts: 14.4, currentAmps: 5, taperAmps: 0.5 },
    { kind: 'rest', maxSeconds: 2 },
    { kind: 'discharge', mode: 'cc', value: 5, endVolts: 11.6 },
    { kind: 'rest', maxSeconds: 2 },
  ],
};

let t: TestContext;
let sim: SimulatedBench;
let admin: SignedInAgent;
let tech: SignedInAgent;

beforeAll(async () => {
  sim = await startSimulatedBench({
    scenario: { ...benchControlLfp12v, pack: { ...benchControlLfp12v.pack, ratedAh: RATED_AH, initialSoc: 0.6 } },
    format: 'jsonl',
    linkPath: link('meter'),
    loadLinkPath: link('load'),
    supplyLinkPath: link('supply'),
    speed: SPEED,
  });
  t = await createTestContext({ attachments: [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() }), attachProgrammes] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
}, 60_000);

afterAll(async () => {
  await t?.close();
  await sim?.stop();
});

describe('a programme on the simulator through SCPI over socat', { timeout: TIMEOUT_MS }, () => {
  it('charge, rest, discharge, rest: each step within 0.5 % of the simulator\u2019s own truth; the bench ends safe', async () => {
    const source = { kind: 'serial', path: link('meter'), format: { kind: 'jsonl' } };
    const benchId = (await admin.post('/api/benches').send({ name: 'Controlled bench', source }).expect(201)).body.bench.id as number;
    const driver = (role: 'load' | 'supply') => ({ protocol: 'scpi', id: `sim-${role}`, role, port: { path: link(role) }, commands: role === 'load' ? SIM_LOAD_SCPI : SIM_SUPPLY_SCPI, replyTimeoutMs: 500 });
    await admin.put(`/api/benches/${benchId}/instruments`).send({ load: driver('load'), supply: driver('supply') }).expect(200);
    const batteryId = (await admin.post('/api/batteries').send({ label: 'Pack P-5', brand: 'Ferrowatt', chemistry: 'lfp', cellsInSeries: 4, ratedAh: RATED_AH, bmsRatedAmps: 20 }).expect(201)).body.battery.id;
    const programmeId = (await tech.post('/api/programmes').send(PROGRAMME).expect(201)).body.programme.id;
    const runId = (await tech.post('/api/runs').send({ benchId, batteryId, name: 'Capacity by programme', stopWhen: 'manual' }).expect(201)).body.run.id;
    await eventually(async () => expect((await tech.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('recording'));
    await tech.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(201);

    const done = await eventually(
      async () => {
        const p = (await tech.get(`/api/runs/${runId}/programme`).expect(200)).body.programme as RunProgramme;
        expect(['finished', 'failed', 'aborted']).toContain(p.state);
        return p;
      },
      TIMEOUT_MS - 30_000,
      500,
    );
    expect(done.failReason).toBeNull();
    expect(done.results.map((r) => r.cause)).toEqual(['taper', 'time', 'end-voltage', 'time']);
    expect(done.watchdogArmed).toEqual(['sim-load', 'sim-supply']);
    const [charge, , discharge] = done.results;
    // The simulator's own truth: Ah and Wh through each instrument while its output was on.
    const chargeTruth = sim.supply.totals;
    const dischargeTruth = sim.load.totals;
    const within = (measured: number, truth: number) => Math.abs(measured - truth) / truth;
    expect(within(charge!.chargeAh, chargeTruth.ah)).toBeLessThan(0.005);
    expect(within(charge!.chargeWh, chargeTruth.wh)).toBeLessThan(0.005);
    expect(within(discharge!.dischargeAh, dischargeTruth.ah)).toBeLessThan(0.005);
    expect(within(discharge!.dischargeWh, dischargeTruth.wh)).toBeLessThan(0.005);
    expect(sim.load.outputOn).toBe(false);
    expect(sim.supply.outputOn).toBe(false);
    await eventually(async () => expect((await tech.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('finished'));
    const log = (await tech.get(`/api/runs/${runId}/command-log`).expect(200)).body.commands as Array<{ sent: string; problem: string | null }>;
    expect(log.map((c) => c.sent)).toEqual(expect.arrayContaining(['SYST:WDOG 5', 'VOLT 14.4', 'CURR 5', 'INP ON', 'INP OFF', 'OUTP ON', 'OUTP OFF']));
    expect(log.filter((c) => c.problem !== null)).toEqual([]);
  });
});
