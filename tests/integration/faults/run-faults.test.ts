import { rm } from 'node:fs/promises';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../../server/auth/password.js';
import { migrate } from '../../../server/db/migrate.js';
import { defineCoreModels } from '../../../server/db/models/index.js';
import { provisionMariaDb, type ProvisionedMariaDb } from '../../../server/db/provisioner.js';
import { createSequelize } from '../../../server/db/sequelize.js';
import { signInAs, TEST_PASSWORD, TEST_USERS, type SignedInAgent } from '../helpers/index.js';
import { eventually } from '../runs-kit.js';
import { exportColumns, freePort, JsonlMeter, missingFrames, neverDecreases, referenceTotals, ServerProcess, type ExportedRun, type SentFrame } from './fault-kit.js';
import { SECONDS_PER_HOUR } from '../../../shared/units/time.js';
import { quietLogger } from '../../../server/log/logger.js';

/**
 * The fault suite for a live run: Kneepoint in a child process of its own (server/index.ts
 * through tsx, configured by environment like `npm start`), a MariaDB of this file's own,
 * and a JSON-lines meter on a socat pseudo-terminal that the test drives and remembers.
 * Each fault asserts what was lost (compared with what the meter sent), that the run's
 * totals never went down, and that its final Wh and Ah equal an independent trapezoid of
 * the export (ml-spectra-processing's xyIntegration).
 */
const METER_PERIOD_MS = 20; // 50 readings a second
/** The promise for a server SIGKILL: at most the last 100 ms of readings lost. */
const SIGKILL_LOSS_MS = 100;
const MAX_GAP_SECONDS = 30; // the run's default gap limit
const RELATIVE = 1e-9;
const HUGE_LINE = '{"t":10,"volts":1e200,"amps":1e200}';
const DB = { database: `kp_faults_${Date.now().toString(36)}`, user: 'kp_faults', password: 'faults-test-only' };
const DB_DIR = resolve('.data/test-mariadb-faults');
const DATA_DIR = resolve('.data/test-faults', DB.database);
const LINK = `/tmp/kneepoint-faults-${process.pid}`;

let dbPort: number;
let mariadb: ProvisionedMariaDb;
let server: ServerProcess;
let meter: JsonlMeter;
let admin: SignedInAgent;
let benchId: number;
let batteryId: number;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const provision = () => provisionMariaDb({ baseDir: DB_DIR, port: dbPort, ...DB, grantAllDatabases: true, log: quietLogger });

beforeAll(async () => {
  dbPort = await freePort();
  mariadb = await provision();
  const sequelize = createSequelize(mariadb);
  await migrate(sequelize);
  await defineCoreModels(sequelize).User.create({ ...TEST_USERS.admin, passwordHash: await hashPassword(TEST_PASSWORD) });
  await sequelize.close();
  const appPort = await freePort();
  server = new ServerProcess({
    KNEEPOINT_MODE: 'test', KNEEPOINT_PORT: String(appPort), KNEEPOINT_DATA_DIR: DATA_DIR, KNEEPOINT_CLIENT_DIR: resolve(DATA_DIR, 'no-client'),
    KNEEPOINT_DB_PROVISION: 'false', KNEEPOINT_DB_PORT: String(dbPort), KNEEPOINT_DB_NAME: DB.database, KNEEPOINT_DB_USER: DB.user,
    KNEEPOINT_DB_PASSWORD: DB.password, SESSION_SECRET: 'fault-suite-session-secret-0123456789abcdef',
  });
  await server.start();
  admin = await signInAs({ url: `http://127.0.0.1:${appPort}` }, 'admin');
  meter = await JsonlMeter.open(LINK, METER_PERIOD_MS);
  const source = { kind: 'serial', path: LINK, format: { kind: 'jsonl' } };
  benchId = (await admin.post('/api/benches').send({ name: 'Fault bench (JSON lines)', source }).expect(201)).body.bench.id;
  batteryId = (await admin.post('/api/batteries').send({ label: '12.8 V 100 Ah', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100 }).expect(201)).body.battery.id;
}, 180_000);

afterAll(async () => {
  await server?.stop('SIGTERM');
  await meter?.close();
  const sequelize = mariadb && createSequelize(mariadb);
  await sequelize?.query(`DROP DATABASE IF EXISTS \`${DB.database}\``).catch(() => undefined);
  await sequelize?.close();
  await mariadb?.stop();
  await rm(DATA_DIR, { recursive: true, force: true });
}, 60_000);

/** A manual-stop run on the fault bench, and a watcher that samples its totals until told to stop. */
async function liveRun(name: string) {
  const run = (await admin.post('/api/runs').send({ benchId, batteryId, name, stopWhen: 'manual' }).expect(201)).body.run as { id: number };
  const seenWh: number[] = [];
  let watching = true;
  const watcher = (async () => {
    while (watching) {
      // While the server or its database is away the request fails: that sample is simply missing.
      const res = await admin.get(`/api/runs/${run.id}`).catch(() => null);
      const wh = res?.status === 200 ? (res.body.run.summary?.dischargeWh as number | undefined) : undefined;
      if (wh !== undefined) seenWh.push(wh);
      await sleep(150);
    }
  })();
  const from = meter.sent.length;
  return {
    id: run.id,
    seenWh,
    /** What the meter sent since the run began. */
    sent: (): SentFrame[] => meter.sent.slice(from),
    unwatch: async () => {
      watching = false;
      await watcher;
    },
  };
}

/** Starts the server again and waits until it has the meter's port open (lines sent before that reach no one). */
async function startAgain(): Promise<void> {
  await server.start();
  await eventually(async () => expect((await admin.get(`/api/benches/${benchId}`).expect(200)).body.bench.status.state).toMatch(/connected|receiving/), 30_000);
}

/** Waits until the bench has taken every line the meter wrote (its counts stop moving). */
async function settle(): Promise<void> {
  let last = -1;
  await eventually(async () => {
    const s = (await admin.get(`/api/benches/${benchId}`).expect(200)).body.bench.status;
    const seen = s.framesOk + s.framesRejected;
    const still = seen === last;
    last = seen;
    expect(still).toBe(true);
  }, 30_000, 300);
}

/** Frames the bench has taken so far (good and bad), in this server process. */
async function benchTaken(): Promise<number> {
  const s = (await admin.get(`/api/benches/${benchId}`).expect(200)).body.bench.status;
  return s.framesOk + s.framesRejected;
}

/**
 * Waits until the server has read every line the meter wrote before this call (the meter
 * plays on). On a machine so busy that the server reads its port late, the lines a SIGKILL
 * then finds unread are not readings the server accepted; this keeps them out of the count.
 */
async function caughtUp(takenAtStart: number, sentAtStart: number): Promise<void> {
  const sentNow = meter.sent.length;
  await eventually(async () => expect((await benchTaken()) - takenAtStart).toBeGreaterThanOrEqual(sentNow - sentAtStart), 30_000, 20);
}

/** Stops the run, waits for the archive to close it, and returns its export and stored figures. */
async function finish(runId: number): Promise<{ exported: ExportedRun; summary: { dischargeWh: number; dischargeAh: number }; events: { type: string }[] }> {
  await admin.post(`/api/runs/${runId}/stop`).expect(200);
  const run = await eventually(async () => {
    const r = (await admin.get(`/api/runs/${runId}`).expect(200)).body.run;
    expect(r.state).toBe('finished');
    return r;
  });
  const body = (await admin.get(`/api/runs/${runId}/export.json`).expect(200)).body;
  const events = (await admin.get(`/api/runs/${runId}/events`).expect(200)).body.events.map((e: { event: { type: string } }) => e.event);
  return { exported: exportColumns(body), summary: run.summary, events };
}

/**
 * The energy of readings a SIGKILL took before they reached the journal: a viewer may have
 * seen totals that held them (the live view runs up to 100 ms ahead of the disk), so after
 * the restart the totals may stand that much lower, and no more. Each lost reading took at
 * most two trapezoid panels of one meter period.
 */
function lostEnergyWh(missing: readonly SentFrame[]): number {
  return missing.reduce((wh, f) => wh + (2 * f.volts * f.amps * METER_PERIOD_MS) / 1000 / SECONDS_PER_HOUR, 0);
}

/** The largest step down in a series of totals (0 when it never goes down). */
function largestStepBack(values: readonly number[]): number {
  let top = -Infinity;
  let worst = 0;
  for (const v of values) {
    worst = Math.max(worst, top - v);
    top = Math.max(top, v);
  }
  return worst;
}

/**
 * The checks every fault ends with: the totals viewers saw never went down (by more than
 * `lostWh`, the readings a SIGKILL took), the stored totals never go down reading by
 * reading, and the final figures equal the reference trapezoid of the export.
 */
function expectSoundTotals(r: Awaited<ReturnType<typeof finish>>, seenWh: number[], lostWh = 0): void {
  expect(r.exported.t.length).toBeGreaterThan(0);
  expect(seenWh.length).toBeGreaterThan(3);
  expect(largestStepBack(seenWh)).toBeLessThanOrEqual(lostWh);
  expect(neverDecreases(r.exported.dischargeWh)).toBe(true);
  expect(neverDecreases(r.exported.dischargeAh)).toBe(true);
  const reference = referenceTotals(r.exported, MAX_GAP_SECONDS);
  expect(Math.abs(r.summary.dischargeWh - reference.wh) / reference.wh).toBeLessThan(RELATIVE);
  expect(Math.abs(r.summary.dischargeAh - reference.ah) / reference.ah).toBeLessThan(RELATIVE);
}

describe('fault suite: a live run through server and database faults', () => {
  it('server SIGKILL mid-run loses at most the last 100 ms of readings', async () => {
    const taken = await benchTaken();
    const run = await liveRun('SIGKILL mid-run');
    const sentBefore = meter.sent.length;
    meter.play();
    await sleep(3000);
    await caughtUp(taken, sentBefore);
    const killedAtMs = performance.now();
    const killed = server.stop('SIGKILL');
    meter.pause(); // nobody listens until the server is back
    await killed;
    await startAgain();
    meter.play();
    await sleep(2000);
    meter.pause();
    await settle();
    await run.unwatch();
    const r = await finish(run.id);

    const missing = missingFrames(run.sent(), r.exported);
    console.log(`[faults] ${run.sent().length} readings sent, ${missing.length} lost${missing.length ? ` (sent ${missing.map((f) => Math.round(killedAtMs - f.sentAtMs)).join(', ')} ms before the SIGKILL)` : ''}`);
    expect(missing.filter((f) => f.sentAtMs < killedAtMs - SIGKILL_LOSS_MS)).toEqual([]);
    expect(missing.length).toBeLessThanOrEqual(SIGKILL_LOSS_MS / METER_PERIOD_MS + 1);
    expect(r.events.filter((e) => e.type === 'gap')).toEqual([]);
    expectSoundTotals(r, run.seenWh, lostEnergyWh(missing));
  }, 120_000);

  it('two restarts mid-run (SIGTERM, start, twice) lose nothing and end with the totals of a run never restarted', async () => {
    const run = await liveRun('Two restarts');
    for (let restart = 0; restart < 2; restart++) {
      meter.play();
      await sleep(2000);
      meter.pause();
      await settle();
      await server.stop('SIGTERM');
      await startAgain();
    }
    meter.play();
    await sleep(2000);
    meter.pause();
    await settle();
    await run.unwatch();
    const r = await finish(run.id);

    expect(missingFrames(run.sent(), r.exported)).toEqual([]);
    expect(r.events.filter((e) => e.type === 'gap')).toEqual([]);
    expectSoundTotals(r, run.seenWh);
    // Never restarted: the same trapezoid over every frame the meter sent.
    const sent = run.sent();
    const straight = referenceTotals({ t: sent.map((f) => f.t), volts: sent.map((f) => f.volts), amps: sent.map((f) => f.amps), dischargeWh: [], dischargeAh: [] }, MAX_GAP_SECONDS);
    expect(Math.abs(r.summary.dischargeWh - straight.wh) / straight.wh).toBeLessThan(RELATIVE);
    expect(Math.abs(r.summary.dischargeAh - straight.ah) / straight.ah).toBeLessThan(RELATIVE);
  }, 180_000);

  it('a huge value mid-run is one bad frame; nothing else is lost and the run stops cleanly', async () => {
    const before = (await admin.get(`/api/benches/${benchId}`).expect(200)).body.bench.status.framesRejected as number;
    const run = await liveRun('Huge value');
    meter.play();
    await sleep(1000);
    meter.sendRaw(HUGE_LINE);
    await sleep(1000);
    meter.pause();
    await settle();
    const status = (await admin.get(`/api/benches/${benchId}`).expect(200)).body.bench.status;
    expect(status.framesRejected).toBe(before + 1);
    expect(status.lastRejection).toBe('volts 1e+200 beyond ±2000 V');
    expect((await admin.get('/api/runs').expect(200)).body.runs.map((x: { id: number }) => x.id)).toContain(run.id);
    await run.unwatch();
    const r = await finish(run.id);

    expect(missingFrames(run.sent(), r.exported)).toEqual([]);
    expect(Math.max(...r.exported.volts)).toBeLessThan(14);
    expectSoundTotals(r, run.seenWh);
  }, 120_000);

  it('database away, then server SIGKILL: the journal keeps every reading but the last 100 ms', async () => {
    const run = await liveRun('Database away, then SIGKILL');
    meter.play();
    await sleep(1500);
    await mariadb.stop(); // the server records on: readings go to memory and the journal
    await sleep(2500);
    const killedAtMs = performance.now();
    const killed = server.stop('SIGKILL');
    meter.pause();
    await killed;
    mariadb = await provision();
    await startAgain();
    meter.play();
    await sleep(1500);
    meter.pause();
    await settle();
    await run.unwatch();
    const r = await finish(run.id);

    const missing = missingFrames(run.sent(), r.exported);
    console.log(`[faults] ${run.sent().length} readings sent, ${missing.length} lost${missing.length ? ` (sent ${missing.map((f) => Math.round(killedAtMs - f.sentAtMs)).join(', ')} ms before the SIGKILL)` : ''}`);
    expect(missing.filter((f) => f.sentAtMs < killedAtMs - SIGKILL_LOSS_MS)).toEqual([]);
    expect(missing.length).toBeLessThanOrEqual(SIGKILL_LOSS_MS / METER_PERIOD_MS + 1);
    expectSoundTotals(r, run.seenWh, lostEnergyWh(missing));
  }, 180_000);
});
