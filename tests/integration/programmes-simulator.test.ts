import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import { WATCHDOG_SECONDS } from '../../server/control/programme-executor.js';
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
let benchId: number;
let batteryId: number;

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
  const source = { kind: 'serial', path: link('meter'), format: { kind: 'jsonl' } };
  benchId = (await admin.post('/api/benches').send({ name: 'Controlled bench', source }).expect(201)).body.bench.id as number;
  const driver = (role: 'load' | 'supply') => ({ protocol: 'scpi', id: `sim-${role}`, role, port: { path: link(role) }, commands: role === 'load' ? SIM_LOAD_SCPI : SIM_SUPPLY_SCPI, replyTimeoutMs: 500 });
  await admin.put(`/api/benches/${benchId}/instruments`).send({ load: driver('load'), supply: driver('supply') }).expect(200);
  batteryId = (await admin.post('/api/batteries').send({ label: 'Pack P-5', brand: 'Ferrowatt', chemistry: 'lfp', cellsInSeries: 4, ratedAh: RATED_AH, bmsRatedAmps: 20 }).expect(201)).body.battery.id;
}, 60_000);

/** A run on the controlled bench following a new programme of `steps`; resolves once the programme has started. */
async function follow(name: string, steps: ProgrammeInput['steps']): Promise<number> {
  const programmeId = (await tech.post('/api/programmes').send({ ...PROGRAMME, name, steps }).expect(201)).body.programme.id;
  const runId = (await tech.post('/api/runs').send({ benchId, batteryId, name, stopWhen: 'manual' }).expect(201)).body.run.id;
  await eventually(async () => expect((await tech.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('recording'), 30_000);
  await tech.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(201);
  return runId;
}

const programmeOf = async (runId: number) => (await tech.get(`/api/runs/${runId}/programme`).expect(200)).body.programme as RunProgramme;

afterAll(async () => {
  await t?.close();
  await sim?.stop();
});

describe('a programme on the simulator through SCPI over socat', { timeout: TIMEOUT_MS }, () => {
  it('meter unplugged mid-discharge: the load is off within 2 s, the programme failed safe with the reason', async () => {
    const runId = await follow('Silent meter', [{ kind: 'discharge', mode: 'cc', value: 5, endVolts: 11.6 }]);
    await eventually(async () => expect(sim.load.outputOn).toBe(true), 10_000, 20);
    await sim.meter.unplug();
    const unpluggedAt = Date.now();
    await eventually(async () => expect(sim.load.outputOn).toBe(false), 5000, 20);
    expect(Date.now() - unpluggedAt).toBeLessThanOrEqual(2000);
    expect(sim.load.events.at(-1)?.kind).toBe('output-off');
    await eventually(async () => expect(await programmeOf(runId)).toMatchObject({ state: 'failed', failReason: expect.stringMatching(/meter silent/) }));
    await sim.meter.replug();
  });

  it('the load answers garbage: the step fails safe with an event naming the reason; the load, obeying nothing, is switched off by its watchdog', async () => {
    const runId = await follow('Garbage load', [{ kind: 'discharge', mode: 'cc', value: 5, endVolts: 11.6 }]);
    await eventually(async () => expect(sim.load.outputOn).toBe(true), 10_000, 20);
    sim.load.fault = 'garbage';
    await eventually(async () => expect((await programmeOf(runId)).state).toBe('failed'), 5000, 50);
    const reason = (await programmeOf(runId)).failReason!;
    expect(reason).toMatch(/^sim-load: .*garbage reply/);
    const events = (await tech.get(`/api/runs/${runId}/events`).expect(200)).body.events as Array<{ event: { type: string; phase?: string; reason?: string } }>;
    expect(events.map((e) => e.event).filter((e) => e.type === 'programme-step').at(-1)).toMatchObject({ phase: 'fail', reason });
    await eventually(async () => expect(sim.load.outputOn).toBe(false), (WATCHDOG_SECONDS + 2) * 1000, 50);
    expect(sim.load.events.at(-1)?.kind).toBe('watchdog-off');
    sim.load.fault = undefined;
  });

  it('charge, rest, discharge, rest: each step within 0.5 % of the simulator\u2019s own truth; the bench ends safe', async () => {
    const loadBefore = { ...sim.load.totals };
    const supplyBefore = { ...sim.supply.totals };
    const runId = await follow(PROGRAMME.name, PROGRAMME.steps);
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
    const chargeTruth = { ah: sim.supply.totals.ah - supplyBefore.ah, wh: sim.supply.totals.wh - supplyBefore.wh };
    const dischargeTruth = { ah: sim.load.totals.ah - loadBefore.ah, wh: sim.load.totals.wh - loadBefore.wh };
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
