import { rm } from 'node:fs/promises';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../../server/auth/password.js';
import { WATCHDOG_SECONDS } from '../../../server/control/programme-executor.js';
import { migrate } from '../../../server/db/migrate.js';
import { defineCoreModels } from '../../../server/db/models/index.js';
import { provisionMariaDb, type ProvisionedMariaDb } from '../../../server/db/provisioner.js';
import { createSequelize } from '../../../server/db/sequelize.js';
import { SIM_LOAD_SCPI } from '../../../shared/schemas/instrument-presets.js';
import { startSimulatedBench, type SimulatedBench } from '../../../simulator/index.js';
import { benchControlLfp12v } from '../../../simulator/scenarios/bench-control-lfp-12v.js';
import { signInAs, TEST_PASSWORD, TEST_USERS, type SignedInAgent } from '../helpers/index.js';
import { eventually } from '../runs-kit.js';
import { freePort, ServerProcess } from './fault-kit.js';
import { quietLogger } from '../../../server/log/logger.js';

/**
 * Server killed while a programme discharges: Kneepoint in a process of its own (as users run
 * it), the simulator's meter and SCPI load on socat pseudo-terminals. After SIGKILL nothing
 * talks to the load any more, and the watchdog the programme armed in it switches it off.
 */
const DB = { database: `kp_progwd_${Date.now().toString(36)}`, user: 'kp_progwd', password: 'progwd-test-only' };
const DB_DIR = resolve('.data/test-mariadb-faults');
const DATA_DIR = resolve('.data/test-faults', DB.database);
const link = (name: string) => `/tmp/kp-progwd-${process.pid}-${name}`;
/** Simulated seconds per real second: the pack moves, but a long way from empty in this test. */
const SPEED = 10;
/** Slack over the watchdog's own time for the simulator's timer and a busy machine, ms. */
const WATCHDOG_SLACK_MS = 2000;

let dbPort: number;
let appPort: number;
let mariadb: ProvisionedMariaDb;
let server: ServerProcess;
let sim: SimulatedBench;
let admin: SignedInAgent;

beforeAll(async () => {
  dbPort = await freePort();
  mariadb = await provisionMariaDb({ baseDir: DB_DIR, port: dbPort, ...DB, grantAllDatabases: true, log: quietLogger });
  const sequelize = createSequelize(mariadb);
  await migrate(sequelize);
  await defineCoreModels(sequelize).User.create({ ...TEST_USERS.admin, passwordHash: await hashPassword(TEST_PASSWORD) });
  await sequelize.close();
  sim = await startSimulatedBench({ scenario: benchControlLfp12v, format: 'jsonl', linkPath: link('meter'), loadLinkPath: link('load'), speed: SPEED });
  appPort = await freePort();
  server = new ServerProcess({
    KNEEPOINT_MODE: 'test', KNEEPOINT_PORT: String(appPort), KNEEPOINT_DATA_DIR: DATA_DIR, KNEEPOINT_CLIENT_DIR: resolve(DATA_DIR, 'no-client'),
    KNEEPOINT_DB_PROVISION: 'false', KNEEPOINT_DB_PORT: String(dbPort), KNEEPOINT_DB_NAME: DB.database, KNEEPOINT_DB_USER: DB.user,
    KNEEPOINT_DB_PASSWORD: DB.password, SESSION_SECRET: 'programme-watchdog-session-secret-0123456789',
  });
  await server.start();
  admin = await signInAs({ url: `http://127.0.0.1:${appPort}` }, 'admin');
}, 180_000);

afterAll(async () => {
  await server?.stop('SIGTERM');
  await sim?.stop();
  const sequelize = mariadb && createSequelize(mariadb);
  await sequelize?.query(`DROP DATABASE IF EXISTS \`${DB.database}\``).catch(() => undefined);
  await sequelize?.close();
  await mariadb?.stop();
  await rm(DATA_DIR, { recursive: true, force: true });
}, 60_000);

describe('a programme when the server is killed', { timeout: 120_000 }, () => {
  it("the simulated load's own watchdog switches it off, and the restarted server marks the programme failed", async () => {
    const source = { kind: 'serial', path: link('meter'), format: { kind: 'jsonl' } };
    const benchId = (await admin.post('/api/benches').send({ name: 'Watchdog bench', source }).expect(201)).body.bench.id;
    const load = { protocol: 'scpi', id: 'sim-load', role: 'load', port: { path: link('load') }, commands: SIM_LOAD_SCPI };
    await admin.put(`/api/benches/${benchId}/instruments`).send({ load }).expect(200);
    const batteryId = (await admin.post('/api/batteries').send({ label: 'Pack W-20', brand: 'Ferrowatt', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20, bmsRatedAmps: 50 }).expect(201)).body.battery.id;
    const steps = [{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 11.6 }];
    const programmeId = (await admin.post('/api/programmes').send({ name: 'Discharge 10 A', chemistry: 'lfp', cellsInSeries: 4, maxCurrentAmps: 50, steps }).expect(201)).body.programme.id;
    const runId = (await admin.post('/api/runs').send({ benchId, batteryId, name: 'Killed mid-discharge', stopWhen: 'manual' }).expect(201)).body.run.id;
    await eventually(async () => expect((await admin.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('recording'), 30_000);
    await admin.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(201);
    await eventually(async () => expect(sim.load.outputOn).toBe(true), 15_000, 50);
    expect((await admin.get(`/api/runs/${runId}/programme`).expect(200)).body.programme.watchdogArmed).toEqual(['sim-load']);

    await server.stop('SIGKILL');
    const killedAt = Date.now();
    await eventually(async () => expect(sim.load.outputOn).toBe(false), WATCHDOG_SECONDS * 1000 + WATCHDOG_SLACK_MS, 50);
    expect(Date.now() - killedAt).toBeLessThanOrEqual(WATCHDOG_SECONDS * 1000 + WATCHDOG_SLACK_MS);
    expect(sim.load.events.at(-1)?.kind).toBe('watchdog-off');

    await server.start();
    admin = await signInAs({ url: `http://127.0.0.1:${appPort}` }, 'admin');
    const { programme } = (await admin.get(`/api/runs/${runId}/programme`).expect(200)).body;
    expect(programme).toMatchObject({ state: 'failed', failReason: expect.stringMatching(/server stopped/) });
    expect(sim.load.outputOn).toBe(false);
  });
});
