/**
 * Import benchmark (issue 9 wants a 1,000,000-row CSV imported in under 5 s): writes a log of
 * a million rows (0.1 s cadence, time in ms, volts, amps, temperature) to disk, then runs the
 * importer the route runs (`importRun`: sniff, survey pass, integrate-and-archive pass into
 * MariaDB), and the survey pass alone to show where the time goes. Figures go to
 * docs/benchmarks.md.
 */
import { createWriteStream } from 'node:fs';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { QueryTypes } from 'sequelize';
import { sniffDelimiter } from '../server/runs/import-csv.js';
import { importRun } from '../server/runs/import-service.js';
import { surveyFile } from '../server/runs/import-survey.js';
import { RunsRepo } from '../server/runs/runs-repo.js';
import { openBenchDb } from './bench-db.js';

const ROWS = 1_000_000;
const STEP_MS = 100;
const CHUNK_ROWS = 10_000;

/** A slow constant-current discharge, as a logger would write it. */
async function writeLog(path: string): Promise<void> {
  const out = createWriteStream(path);
  out.write('Time (ms),Voltage (V),Current (A),Temp (°C)\n');
  for (let i = 0; i < ROWS; i += CHUNK_ROWS) {
    let chunk = '';
    for (let j = i; j < i + CHUNK_ROWS; j++) chunk += `${j * STEP_MS},${(13.3 - j * 2e-6).toFixed(6)},4,${(25 + (j % 50) / 100).toFixed(2)}\n`;
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
}

/** Runs the benchmark and returns its figures. */
export async function run(): Promise<Record<string, string | number>> {
  const dir = await mkdtemp(join(tmpdir(), 'kp-import-bench-'));
  const db = await openBenchDb('import');
  try {
    const path = join(dir, 'million.csv');
    await writeLog(path);
    const bytes = (await stat(path)).size;
    const c0 = process.cpuUsage();
    const s0 = performance.now();
    const delimiter = await sniffDelimiter(path);
    await surveyFile(path, delimiter, {}, 'UTC');
    const surveyMs = performance.now() - s0;
    const surveyCpu = process.cpuUsage(c0);
    const [user] = await db.sequelize.query<{ id: number }>("INSERT INTO users (email, name, role, passwordHash, createdAt, updatedAt) VALUES ('bench@northgate.example', 'Bench', 'technician', 'x', NOW(), NOW()) RETURNING id", { type: QueryTypes.SELECT });
    const c1 = process.cpuUsage();
    const i0 = performance.now();
    const res = await importRun(db.sequelize, new RunsRepo(db.sequelize), {
      filePath: path, name: 'bench million', tags: [], battery: null, currentSign: 'auto', columns: {}, userId: user!.id, timeZone: 'UTC', acceptancePercent: 95,
    });
    const importMs = performance.now() - i0;
    const importCpu = process.cpuUsage(c1);
    const cpuSeconds = (u: NodeJS.CpuUsage) => ((u.user + u.system) / 1e6).toFixed(2);
    const [load1] = loadavg();
    const figures = {
      rows: res.summary.rows,
      fileMB: (bytes / 1e6).toFixed(1),
      surveyPassSeconds: (surveyMs / 1000).toFixed(2),
      importTotalSeconds: (importMs / 1000).toFixed(2),
      rowsPerSecond: Math.round(ROWS / (importMs / 1000)),
      surveyPassCpuSeconds: cpuSeconds(surveyCpu),
      importNodeCpuSeconds: cpuSeconds(importCpu),
      loadAverage1m: load1!.toFixed(1),
      dischargeAh: res.summary.dischargeAh.toFixed(6),
    };
    console.log(figures);
    return figures;
  } finally {
    await db.close();
    await rm(dir, { recursive: true, force: true });
  }
}
