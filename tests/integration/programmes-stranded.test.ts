import { rm, unlink } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachAlarms } from '../../server/compose/alarms-root.js';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import type { Clock } from '../../server/ingest/clock.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import { BenchInstrumentsRepo } from '../../server/programmes/bench-instruments-repo.js';
import { StoredBenchInstruments } from '../../server/programmes/bench-instruments-provider.js';
import { ProgrammeRunner } from '../../server/programmes/programme-runner.js';
import { startServer, type Attachment, type RunningServer } from '../../server/server.js';
import { SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../shared/schemas/instrument-presets.js';
import type { ProgrammeInput } from '../../shared/schemas/programme.js';
import type { RunProgramme } from '../../shared/schemas/programme-run.js';
import { startSimulatedBench, type SimulatedBench } from '../../simulator/index.js';
import { benchControlLfp12v } from '../../simulator/scenarios/bench-control-lfp-12v.js';
import { dropTestDatabase } from './helpers/test-database.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually, tempSpillDir } from './runs-kit.js';

/**
 * The server stops dead in the middle of a programme step (as when its process is killed): the
 * programme's own stop path never runs, and the simulated load, which like many real ones has
 * no watchdog here, stays on. The next start must switch it off, read it back, and call a person.
 */
const TIMEOUT_MS = 180_000;
/** Simulated seconds per real second: slow enough that the pack stays far from its end meanwhile. */
const SPEED = 20;
const link = (name: string) => `/tmp/kp-strand-${process.pid}-${name}`;
// A made-up 4-cell LFP pack of 5 Ah (demo values), 60 % charged: 1 A for a few minutes takes little of it.
const RATED_AH = 5;
const DISCHARGE: ProgrammeInput = {
  name: 'Slow discharge, 4s LFP 5 Ah',
  chemistry: 'lfp',
  cellsInSeries: 4,
  maxCurrentAmps: 20,
  steps: [{ kind: 'discharge', mode: 'cc', value: 1, endVolts: 11.6 }],
};
/** The simulated instruments' commands without their watchdog command: an instrument that has none. */
const { watchdog: _loadWatchdog, ...LOAD_NO_WATCHDOG } = SIM_LOAD_SCPI;
const { watchdog: _supplyWatchdog, ...SUPPLY_NO_WATCHDOG } = SIM_SUPPLY_SCPI;

const quiet = { info: () => {}, warn: () => {}, error: (m: string, e?: unknown) => console.error(m, e) };

/**
 * The programmes attachment as a crash leaves it: on close the runner's own stop path never
 * runs (no abort, no output off), its timers stop dead and the instruments' ports just close.
 */
const crashingProgrammes: Attachment = async (_server, ctx) => {
  let dead = false;
  const clock: Clock = {
    nowMs: () => Date.now(),
    setTimeout: (fn, ms) => setTimeout(() => void (dead || fn()), ms).unref(),
    clearTimeout: (handle) => clearTimeout(handle as NodeJS.Timeout),
  };
  const instruments = new StoredBenchInstruments(new BenchInstrumentsRepo(ctx.sequelize));
  ctx.services.benchInstruments = instruments;
  const runner = new ProgrammeRunner(ctx, clock);
  await runner.failStranded();
  ctx.services.programmeRunner = runner;
  return async () => {
    dead = true;
    await instruments.close();
  };
};

const attachmentsWith = (programmes: Attachment): Attachment[] => [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() }), attachAlarms, programmes];

let first: TestContext;
/** The server running now (null between a stop and the next start). */
let server: RunningServer | null = null;
let sim: SimulatedBench;
let tech: SignedInAgent;
let benchId: number;
let batteryId: number;

/** Starts the server again on the same database, data folder and bench. */
async function restart(programmes: Attachment): Promise<void> {
  server = await startServer({ config: first.ctx.config, database: first.ctx.config.db, port: 0, attachments: attachmentsWith(programmes), log: quiet });
  tech = await signInAs(server, 'technician');
}

/** Stops the running server (the crash attachment, if it runs, leaves the programme stranded). */
async function stop(): Promise<void> {
  const running = server;
  server = null;
  await running?.close();
}

async function followOnNewRun(name: string): Promise<number> {
  const programmeId = (await tech.post('/api/programmes').send({ ...DISCHARGE, name }).expect(201)).body.programme.id;
  const runId = (await tech.post('/api/runs').send({ benchId, batteryId, name, stopWhen: 'manual' }).expect(201)).body.run.id as number;
  await eventually(async () => expect((await tech.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('recording'), 30_000);
  await tech.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(201);
  await eventually(async () => expect(sim.load.outputOn).toBe(true), 15_000, 20);
  return runId;
}

const programmeOf = async (runId: number) => (await tech.get(`/api/runs/${runId}/programme`).expect(200)).body.programme as RunProgramme;
const failedAlarms = async (runId: number) =>
  ((await tech.get(`/api/alarms?runId=${runId}`).expect(200)).body.alarms as Array<{ kind: string; priority: string; message: string }>).filter((a) => a.kind === 'programme-failed');

beforeAll(async () => {
  sim = await startSimulatedBench({
    scenario: { ...benchControlLfp12v, pack: { ...benchControlLfp12v.pack, ratedAh: RATED_AH, initialSoc: 0.6 } },
    format: 'jsonl',
    linkPath: link('meter'),
    loadLinkPath: link('load'),
    supplyLinkPath: link('supply'),
    speed: SPEED,
  });
  first = await createTestContext({ attachments: attachmentsWith(crashingProgrammes), log: quiet });
  server = first.server;
  const admin = await signInAs(first, 'admin');
  tech = await signInAs(first, 'technician');
  const source = { kind: 'serial', path: link('meter'), format: { kind: 'jsonl' } };
  benchId = (await admin.post('/api/benches').send({ name: 'Bench without watchdogs', source }).expect(201)).body.bench.id as number;
  const driver = (role: 'load' | 'supply') => ({ protocol: 'scpi', id: `sim-${role}`, role, port: { path: link(role) }, commands: role === 'load' ? LOAD_NO_WATCHDOG : SUPPLY_NO_WATCHDOG, replyTimeoutMs: 500 });
  await admin.put(`/api/benches/${benchId}/instruments`).send({ load: driver('load'), supply: driver('supply') }).expect(200);
  batteryId = (await admin.post('/api/batteries').send({ label: 'Pack S-5', brand: 'Ferrowatt', chemistry: 'lfp', cellsInSeries: 4, ratedAh: RATED_AH, bmsRatedAmps: 20 }).expect(201)).body.battery.id;
}, 60_000);

afterAll(async () => {
  await stop();
  if (first) {
    await dropTestDatabase(first.databaseName);
    await rm(first.ctx.config.dataDir, { recursive: true, force: true });
  }
  await sim?.stop();
});

describe('a programme stranded by a server stop', { timeout: TIMEOUT_MS }, () => {
  it('the next start switches the load off and reads it back, fails the programme, and raises one programme-failed alarm', async () => {
    const runId = await followOnNewRun('Stranded mid-discharge');
    expect((await programmeOf(runId)).watchdogArmed).toEqual([]);
    await stop();
    // Nothing switched the load off: without a watchdog it stays on while the server is away.
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(sim.load.outputOn).toBe(true);

    await restart(attachProgrammes);
    expect(sim.load.outputOn).toBe(false);
    expect(sim.load.events.at(-1)?.kind).toBe('output-off');
    expect(sim.supply.outputOn).toBe(false);
    const programme = await programmeOf(runId);
    expect(programme.state).toBe('failed');
    expect(programme.failReason).toBe('the server stopped while the programme ran; at restart sim-load: output confirmed off; sim-supply: output confirmed off');
    const events = (await tech.get(`/api/runs/${runId}/events`).expect(200)).body.events as Array<{ event: { type: string; phase?: string; reason?: string; outputsConfirmedOff?: boolean } }>;
    expect(events.map((e) => e.event).filter((e) => e.type === 'programme-step').at(-1)).toMatchObject({ phase: 'fail', reason: programme.failReason, outputsConfirmedOff: true });
    const alarms = await eventually(async () => {
      const found = await failedAlarms(runId);
      expect(found).toHaveLength(1);
      return found;
    });
    expect(alarms[0]!.priority).toBe('critical');
    expect(alarms[0]!.message).toBe(`Programme failed safe at step 1 (${programme.stepLabels[0]}): ${programme.failReason}. Outputs switched off.`);
    // The run itself goes on recording.
    await eventually(async () => expect((await tech.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('recording'), 30_000);

    // A second restart finds nothing stranded: still exactly one alarm.
    await stop();
    await restart(attachProgrammes);
    await new Promise((resolve) => setTimeout(resolve, 1000));
    expect(await failedAlarms(runId)).toHaveLength(1);
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
  });

  it('the load cannot be reached at the next start: start-up completes, the supply is still switched off, the alarm says the load was not confirmed off', async () => {
    await stop();
    await restart(crashingProgrammes);
    const runId = await followOnNewRun('Stranded, load unplugged');
    await stop();
    // The load's port goes away (its USB cable pulled); the meter and the supply stay.
    await unlink(link('load'));
    await restart(attachProgrammes);
    const programme = await programmeOf(runId);
    expect(programme.state).toBe('failed');
    expect(programme.failReason).toMatch(/^the server stopped while the programme ran; at restart sim-load: could not be reached \(cannot open \/tmp\/kp-strand-.*\), output not confirmed off; sim-supply: output confirmed off$/);
    // Nobody could switch the load off: it is still on, as the alarm says.
    expect(sim.load.outputOn).toBe(true);
    expect(sim.supply.outputOn).toBe(false);
    const [alarm] = await eventually(async () => {
      const found = await failedAlarms(runId);
      expect(found).toHaveLength(1);
      return found;
    });
    expect(alarm!.priority).toBe('critical');
    expect(alarm!.message).toBe(`Programme failed at step 1 (${programme.stepLabels[0]}): ${programme.failReason}. Not every output could be confirmed off: check the bench by hand.`);
  });
});
