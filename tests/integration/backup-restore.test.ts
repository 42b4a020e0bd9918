import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import mariadb from 'mariadb';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createBackup, listBackups, restoreBackup } from '../../server/backup/backup-service.js';
import { backupAttachment } from '../../server/backup/attach-backups.js';
import { createMigrator } from '../../server/db/migrate.js';
import { hashPassword } from '../../server/auth/password.js';
import { startServer, type RunningServer } from '../../server/server.js';
import type { DatabaseConfig } from '../../server/config/config.js';
import { createTestDatabase, dropTestDatabase, signInAs, testConfig, TEST_PASSWORD, TEST_USERS } from './helpers/index.js';

/**
 * A lab's backup is restorable: back up (mariadb-dump and the uploaded files), wipe the
 * database and the files, restore, and every user, run and archived reading is there again.
 */
const NASA_CSV = fileURLToPath(new URL('../fixtures/nasa-pcoe-b0005-discharge-cycle1.csv', import.meta.url));
const LONG_RUN_ROWS = 12_000; // several archive chunks of 4,096 readings

let database: DatabaseConfig;
let dataDir: string;
let backupDir: string;
let server: RunningServer | undefined;

const start = async () =>
  (server = await startServer({
    config: testConfig(database, { dataDir }), database, port: 0, attachments: [],
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  }));

/** Everything a lab would miss, read through the API: users, runs, and each run's full export. */
async function snapshot(url: string) {
  const admin = await signInAs(url, 'admin');
  const users = (await admin.get('/api/users').expect(200)).body;
  const runs = (await admin.get('/api/runs').expect(200)).body;
  const exports: Record<number, string> = {};
  for (const run of runs.runs as { id: number }[]) exports[run.id] = (await admin.get(`/api/runs/${run.id}/export.csv`).expect(200)).text;
  return { users, runs, exports };
}

async function adminQuery(sql: string): Promise<unknown> {
  const info = inject('mariadb');
  const c = await mariadb.createConnection({ host: info.host, port: info.port, user: info.user, password: info.password });
  try {
    return await c.query(sql);
  } finally {
    await c.end();
  }
}

beforeAll(async () => {
  database = await createTestDatabase();
  dataDir = mkdtempSync(join(tmpdir(), 'kp-backup-data-'));
  backupDir = mkdtempSync(join(tmpdir(), 'kp-backups-'));
});
afterAll(async () => {
  await server?.close();
  await dropTestDatabase(database.database);
  rmSync(dataDir, { recursive: true, force: true });
  rmSync(backupDir, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('backs up, and after a wipe restores every user, run, archived reading and uploaded file', async () => {
    const s = await start();
    const passwordHash = await hashPassword(TEST_PASSWORD);
    await s.ctx.models.User.bulkCreate(Object.values(TEST_USERS).map((user) => ({ ...user, passwordHash })));
    const tech = await signInAs(s.url, 'technician');
    const battery = (await tech.post('/api/batteries').send({ label: 'Backup cell', brand: 'Hollis Power', chemistry: 'nca', cellsInSeries: 1, ratedAh: 2 }).expect(201)).body.battery;
    await tech.post('/api/runs/import').field('name', 'Logged cell').field('batteryId', String(battery.id)).attach('file', NASA_CSV).expect(201);
    const rows = Array.from({ length: LONG_RUN_ROWS }, (_, i) => `${i},${(13.3 - i * 1e-5).toFixed(5)},${(20 + (i % 5) * 0.1).toFixed(1)}`);
    await tech.post('/api/runs/import').field('name', 'Long run').field('batteryId', String(battery.id))
      .attach('file', Buffer.from(`time_s,voltage_v,current_a\n${rows.join('\n')}\n`), 'long.csv').expect(201);
    const photo = Buffer.from(Array.from({ length: 5000 }, (_, i) => (i * 7) % 256));
    mkdirSync(join(dataDir, 'uploads', 'runs', '2'), { recursive: true });
    writeFileSync(join(dataDir, 'uploads', 'runs', '2', 'teardown.jpg'), photo);
    // An import's file in transit (multer's temporary name) is not kept: its readings are in the database.
    writeFileSync(join(dataDir, 'uploads', '0123456789abcdef0123456789abcdef'), 'time_s,voltage_v\n');
    const before = await snapshot(s.url);
    expect(before.runs.runs).toHaveLength(2);
    expect(before.users.users.length).toBeGreaterThanOrEqual(3);
    const chunksBefore = await adminQuery(`SELECT runId, firstSeq, count, HEX(data) AS d FROM \`${database.database}\`.run_reading_chunks ORDER BY runId, firstSeq`);
    expect((chunksBefore as unknown[]).length).toBeGreaterThan(2);

    // Three backups with retention 2: the oldest goes; the newest is complete.
    let clock = Date.parse('2026-03-01T02:00:00Z');
    const backup = () => createBackup({ db: database, dataDir, backupDir, keep: 2, now: () => new Date((clock += 3_600_000)) });
    const first = await backup();
    await backup();
    const newest = await backup();
    expect(listBackups(backupDir)).toEqual([expect.stringMatching(/kneepoint-20260301T040000Z$/), newest]);
    expect(existsSync(first)).toBe(false);
    await server!.close();
    server = undefined;

    // Wipe: the database and the files are gone.
    await adminQuery(`DROP DATABASE \`${database.database}\``);
    rmSync(join(dataDir, 'uploads'), { recursive: true, force: true });

    await restoreBackup({ db: database, dataDir, backupPath: newest });
    const after = await snapshot((await start()).url);
    expect(after.users).toEqual(before.users);
    expect(after.runs).toEqual(before.runs);
    expect(after.exports).toEqual(before.exports);
    expect(await adminQuery(`SELECT runId, firstSeq, count, HEX(data) AS d FROM \`${database.database}\`.run_reading_chunks ORDER BY runId, firstSeq`)).toEqual(chunksBefore);
    expect(readFileSync(join(dataDir, 'uploads', 'runs', '2', 'teardown.jpg')).equals(photo)).toBe(true);
    expect(readdirSync(join(dataDir, 'uploads'))).toEqual(['runs']);
    // Users can still sign in with their passwords.
    await signInAs(server!.url, 'viewer');
  }, 120_000);

  it('leaves no half-made backup when the dump fails, and refuses to restore a folder that is not a backup', async () => {
    const before = readdirSync(backupDir);
    await expect(createBackup({ db: { ...database, password: 'wrong-password' }, dataDir, backupDir, keep: 2 })).rejects.toThrow(/mariadb-dump exited with code/);
    expect(readdirSync(backupDir)).toEqual(before);
    await expect(restoreBackup({ db: database, dataDir, backupPath: dataDir })).rejects.toThrow(/not a complete Kneepoint backup/);
  });

  it('restores a backup made before the storage rename (migration 1780), then migrates it: every run, reading and export is there', async () => {
    const old = await createTestDatabase();
    const oldDataDir = mkdtempSync(join(tmpdir(), 'kp-backup-old-'));
    const oldBackupDir = mkdtempSync(join(tmpdir(), 'kp-backups-old-'));
    const quiet = { info: () => {}, warn: () => {}, error: (m: string, e?: unknown) => console.error(m, e) };
    const serve = () => startServer({ config: testConfig(old, { dataDir: oldDataDir }), database: old, port: 0, attachments: [], log: quiet });
    let s: RunningServer | undefined;
    try {
      s = await serve();
      const passwordHash = await hashPassword(TEST_PASSWORD);
      await s.ctx.models.User.bulkCreate(Object.values(TEST_USERS).map((user) => ({ ...user, passwordHash })));
      const tech = await signInAs(s.url, 'technician');
      const battery = (await tech.post('/api/batteries').send({ label: 'Old cell', brand: 'Hollis Power', chemistry: 'nca', cellsInSeries: 1, ratedAh: 2 }).expect(201)).body.battery;
      const runId = (await tech.post('/api/runs/import').field('name', 'Before the rename').field('batteryId', String(battery.id)).attach('file', NASA_CSV).expect(201)).body.run.id as number;
      const before = await snapshot(s.url);
      const readingsBefore = (await tech.get(`/api/runs/${runId}/readings?maxPoints=1000`).expect(200)).body;
      expect(readingsBefore.x).toHaveLength(197);

      // Back to the storage as it was before 1780: the old table and columns, and blocks that
      // name their run time column `elapsed`, as the archive wrote them then.
      await createMigrator(s.ctx.sequelize).down({ to: '1780-run-reading-chunks' });
      await s.close();
      s = undefined;
      const table = `\`${old.database}\`.run_sample_chunks`; // vocab-rename: keep
      await adminQuery(`UPDATE ${table} SET layout = REPLACE(layout, '"name":"elapsedSeconds"', '"name":"elapsed"')`); // vocab-rename: keep
      const oldChunks = (await adminQuery(`SELECT firstElapsed, lastElapsed, layout FROM ${table}`)) as { layout: string }[]; // vocab-rename: keep
      expect(oldChunks.length).toBeGreaterThan(0);
      for (const c of oldChunks) expect(JSON.parse(c.layout).columns.map((col: { name: string }) => col.name)).toContain('elapsed'); // vocab-rename: keep

      const backupPath = await createBackup({ db: old, dataDir: oldDataDir, backupDir: oldBackupDir, keep: 1 });
      await adminQuery(`DROP DATABASE \`${old.database}\``);
      await restoreBackup({ db: old, dataDir: oldDataDir, backupPath });

      s = await serve(); // migrates the restored database
      const migrations = (await adminQuery(`SELECT name FROM \`${old.database}\`.schema_migrations`)) as { name: string }[];
      expect(migrations.map((m) => m.name)).toContain('1780-run-reading-chunks');
      const after = await snapshot(s.url);
      expect(after.runs).toEqual(before.runs);
      expect(after.exports).toEqual(before.exports);
      expect(after.exports[runId]).toMatch(/^elapsedSeconds,t,volts,/m);
      const viewer = await signInAs(s.url, 'viewer');
      expect((await viewer.get(`/api/runs/${runId}/readings?maxPoints=1000`).expect(200)).body).toEqual(readingsBefore);
    } finally {
      await s?.close();
      await dropTestDatabase(old.database);
      rmSync(oldDataDir, { recursive: true, force: true });
      rmSync(oldBackupDir, { recursive: true, force: true });
    }
  }, 120_000);

  it('backs up on a schedule into the configured folder, keeping the newest N', async () => {
    const scheduledDir = mkdtempSync(join(tmpdir(), 'kp-scheduled-'));
    try {
      const s = await startServer({
        config: testConfig(database, { dataDir, backup: { dir: scheduledDir, everyMs: 400, keep: 2 } }), database, port: 0,
        attachments: [backupAttachment()], log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
      });
      try {
        const deadline = Date.now() + 30_000;
        while (!(s.ctx.services.backupStatus?.lastAt && listBackups(scheduledDir).length === 2 && readdirSync(scheduledDir).length === 2)) {
          if (Date.now() > deadline) throw new Error(`no scheduled backups: ${JSON.stringify(s.ctx.services.backupStatus)}`);
          await new Promise((ok) => setTimeout(ok, 200));
        }
        await new Promise((ok) => setTimeout(ok, 1500));
        expect(readdirSync(scheduledDir).filter((n) => !n.endsWith('.partial'))).toHaveLength(2);
        expect(s.ctx.services.backupStatus).toMatchObject({ lastError: null, keep: 2 });
        // The health endpoint says backups run, without naming the folder.
        const health = (await (await fetch(`${s.url}/api/health`)).json()) as { backups: unknown };
        expect(health.backups).toEqual({ everyHours: 400 / 3_600_000, lastAt: expect.any(String), failing: false });
      } finally {
        await s.close();
      }
    } finally {
      rmSync(scheduledDir, { recursive: true, force: true });
    }
  }, 60_000);
});
