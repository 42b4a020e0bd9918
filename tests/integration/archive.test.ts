import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { provisionMariaDb, type ProvisionedMariaDb } from '../../server/db/provisioner.js';
import { BATTERY_OPTIONAL_DEFAULTS } from '../../server/db/models/battery.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { benchModel } from '../../server/benches/bench-model.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { chunkExtent, readChunks } from '../../server/archive/chunk-store.js';
import { RunsRepo } from '../../server/runs/runs-repo.js';
import { testConfig } from './helpers/index.js';
import { eventually, ManualFeed, tempSpillDir } from './runs-kit.js';
import { quietLogger } from '../../server/log/logger.js';

// A MariaDB of this file's own (its own folder and port), so stopping it mid-run never
// disturbs the shared test server.
const OUTAGE_DB_DIR = resolve('.data/test-mariadb-outage');
const OUTAGE_DB_PORT = 3318;
// A fresh database each time (dropped after), so runs left by an earlier attempt never resume here.
const DB = { database: `kp_outage_${Date.now().toString(36)}`, user: 'kp_outage', password: 'outage-test-only' };
const provision = () => provisionMariaDb({ baseDir: OUTAGE_DB_DIR, port: OUTAGE_DB_PORT, ...DB, grantAllDatabases: true, log: quietLogger });

const spillDir = tempSpillDir();
let mariadb: ProvisionedMariaDb;
let server: RunningServer;
let feed: ManualFeed;
const quiet = { info: () => {}, warn: () => {}, error: () => {} };

async function start(): Promise<RunningServer> {
  feed = new ManualFeed();
  return startServer({
    config: testConfig(mariadb, { dataDir: resolve('.data/test-app-outage') }),
    database: mariadb,
    port: 0,
    // A small memory bound so an outage of a few thousand readings reaches the disk spill.
    attachments: [liveAttachment({ feed, spillDir, memoryLimitBytes: 16 * 1024 })],
    log: quiet,
  });
}

const AMPS = 2;
const frame = (s: number) => ({ t: 10_000 + s, volts: 13 - s * 1e-5, amps: AMPS, clock: 'device' as const });

beforeAll(async () => {
  mariadb = await provision();
  server = await start();
});
afterAll(async () => {
  await server?.ctx.sequelize.query(`DROP DATABASE IF EXISTS \`${DB.database}\``).catch(() => undefined);
  await server?.close();
  await mariadb?.stop();
});

async function newRun(name: string, benchId: number) {
  // A bench row without a source: this test drives frames by hand.
  await benchModel(server.ctx.sequelize).findOrCreate({ where: { id: benchId }, defaults: { id: benchId, name: `Outage bench ${benchId}`, source: JSON.stringify({ kind: 'none' }), enabled: true, notes: '' } });
  const battery = await server.ctx.models.Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: name, brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 20, createdById: null });
  return server.ctx.services.runRecorder!.start(
    { benchId, batteryId: battery.id, name, tags: [], kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual', tempProtections: [], protectionChecks: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
    null,
  );
}

async function storedTimes(s: RunningServer, runId: number): Promise<number[]> {
  const parts = await readChunks(s.ctx.sequelize, runId, -Number.MAX_VALUE, Number.MAX_VALUE, ['t']);
  return parts.flatMap((p) => Array.from(p.t!));
}

describe('archive under trouble', () => {
  it('loses no reading while the database is down, and writes them all when it returns', async () => {
    const run = await newRun('Outage run', 1);
    const recorder = server.ctx.services.runRecorder!;
    for (let s = 0; s < 1000; s++) feed.emit(1, frame(s));
    recorder.flushAll();
    await eventually(async () => expect((await chunkExtent(server.ctx.sequelize, run.id))?.count).toBe(1000));

    await mariadb.stop();
    for (let s = 1000; s < 6000; s++) {
      feed.emit(1, frame(s));
      if (s % 100 === 99) recorder.flushAll(); // batches as the 1 s timer would make them
    }
    await eventually(async () => expect(readdirSync(spillDir).filter((f) => f.endsWith('.batch.json')).length).toBeGreaterThan(0));

    mariadb = await provision();
    await eventually(async () => expect((await chunkExtent(server.ctx.sequelize, run.id))?.count).toBe(6000), 60_000);
    await eventually(async () => expect(readdirSync(spillDir).filter((f) => f.endsWith('.batch.json'))).toEqual([]));
    const times = await storedTimes(server, run.id);
    expect(times).toEqual(Array.from({ length: 6000 }, (_, s) => 10_000 + s)); // every reading, once, in order

    const ended = await recorder.stop(run.id, false);
    // 5999 s at a constant 2 A: 2 × 5999 / 3600 Ah (constant current, exact).
    expect(ended.summary!.dischargeAh).toBeCloseTo((AMPS * 5999) / 3600, 9);
  }, 120_000);

  it('resumes a recording run after a server restart, totals continuing', async () => {
    const run = await newRun('Restart run', 2);
    for (let s = 0; s < 500; s++) feed.emit(2, frame(s));
    await server.close();

    server = await start();
    const session = server.ctx.services.runRecorder!.session(run.id);
    expect(session?.readingsCount).toBe(500);
    expect(session?.state).toBe('recording');
    expect(session!.pipeline.totals().dischargeAh).toBeCloseTo((AMPS * 499) / 3600, 12);
    for (let s = 500; s < 1000; s++) feed.emit(2, frame(s));
    const ended = await server.ctx.services.runRecorder!.stop(run.id, false);
    // Continuous 1 s steps across the restart: 999 s at 2 A.
    expect(ended.summary!.dischargeAh).toBeCloseTo((AMPS * 999) / 3600, 9);
    expect(ended.readingsCount).toBe(1000);
    await eventually(async () => expect((await new RunsRepo(server.ctx.sequelize).get(run.id))?.state).toBe('finished'));
    expect(await storedTimes(server, run.id)).toEqual(Array.from({ length: 1000 }, (_, s) => 10_000 + s));
  }, 120_000);
});
