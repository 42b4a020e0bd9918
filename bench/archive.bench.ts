/**
 * Archive benchmark (issue 5): a 24-hour run at 10 Hz (864,000 readings) written and read
 * back two ways — plain rows (multi-row INSERT, PRIMARY KEY (runId, t)) and chunked gzip'd
 * Float64 column blocks (the layout the product uses) — then `readings` for a 1,000-pixel
 * chart and a full CSV export from the block layout. Figures go to docs/archive.md.
 */
import { performance } from 'node:perf_hooks';
import { Writable } from 'node:stream';
import { QueryTypes, type Sequelize } from 'sequelize';
import { createRunPipeline } from '../shared/measure/run-pipeline.js';
import type { Reading } from '../shared/schemas/reading.js';
import { COMPACT_READINGS, readChunks, writeBatch } from '../server/archive/chunk-store.js';
import { encodeChunk } from '../server/archive/chunk-encode.js';
import { readingsToColumns } from '../server/readings/reading-columns.js';
import { exportMeta } from '../server/runs/export-meta.js';
import { streamCsvExport } from '../server/runs/export-stream.js';
import { RunsRepo } from '../server/runs/runs-repo.js';
import { runReadings } from '../server/runs/readings-service.js';
import { openBenchDb } from './bench-db.js';

const HZ = 10;
const HOURS = 24;
const READINGS = HOURS * 3600 * HZ;
const ROWS_PER_INSERT = 2000;
const READINGS_ROUNDS = 5;

/** A plausible day-long discharge with a little noise, through the real pipeline. */
function makeReadings(): Reading[] {
  const p = createRunPipeline({ endVolts: 10 });
  const out: Reading[] = [];
  for (let i = 0; i < READINGS; i++) {
    const t = i / HZ;
    const r = p.push({ t, volts: 13.3 - t * 2e-5 + Math.sin(i) * 0.002, amps: 4 + Math.cos(i / 7) * 0.01, temps: { cell: 23 + t / 20_000 }, clock: 'device' });
    if (r.reading) out.push(r.reading);
  }
  return out;
}

async function newRunId(sequelize: Sequelize, name: string): Promise<number> {
  const run = await new RunsRepo(sequelize).create({
    name, tags: [], origin: 'import', benchId: null, batteryId: null, state: 'finished', createdById: null, startedAt: new Date(),
    config: { kind: 'custom', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
  });
  return run.id;
}

async function tableBytes(sequelize: Sequelize, table: string): Promise<number> {
  await sequelize.query(`ANALYZE TABLE ${table}`);
  const [row] = await sequelize.query<{ b: number }>(
    'SELECT DATA_LENGTH + INDEX_LENGTH AS b FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ?',
    { replacements: [table], type: QueryTypes.SELECT },
  );
  return Number(row?.b ?? 0);
}

async function plainRows(sequelize: Sequelize, readings: Reading[]) {
  await sequelize.query(`CREATE TABLE bench_rows (runId INT NOT NULL, t DOUBLE NOT NULL, volts DOUBLE, amps DOUBLE, tempCelsius DOUBLE,
    dischargeWh DOUBLE, dischargeAh DOUBLE, PRIMARY KEY (runId, t)) ENGINE=InnoDB`);
  const w0 = performance.now();
  for (let at = 0; at < readings.length; at += ROWS_PER_INSERT) {
    const part = readings.slice(at, at + ROWS_PER_INSERT);
    const values = part.map((r) => `(1,${r.elapsedSeconds},${r.volts},${r.amps},${r.temps?.cell ?? 'NULL'},${r.dischargeWh},${r.dischargeAh})`).join(',');
    await sequelize.query(`INSERT INTO bench_rows VALUES ${values}`);
  }
  const writeSeconds = (performance.now() - w0) / 1000;
  const r0 = performance.now();
  const rows = await sequelize.query<{ t: number }>('SELECT t, volts, amps, tempCelsius, dischargeWh, dischargeAh FROM bench_rows WHERE runId = 1 ORDER BY t', { type: QueryTypes.SELECT, raw: true });
  const readSeconds = (performance.now() - r0) / 1000;
  if (rows.length !== readings.length) throw new Error(`plain rows: read ${rows.length}`);
  return { writeSeconds, readSeconds, bytes: await tableBytes(sequelize, 'bench_rows') };
}

async function blocks(sequelize: Sequelize, readings: Reading[], runId: number) {
  const w0 = performance.now();
  for (let at = 0; at < readings.length; at += COMPACT_READINGS) {
    const part = readings.slice(at, at + COMPACT_READINGS);
    const block = encodeChunk(at, readingsToColumns(part));
    await writeBatch(sequelize, { runId, block, events: [], patch: { readingsCount: at + part.length } });
  }
  const writeSeconds = (performance.now() - w0) / 1000;
  const r0 = performance.now();
  const parts = await readChunks(sequelize, runId, -Number.MAX_VALUE, Number.MAX_VALUE);
  const readSeconds = (performance.now() - r0) / 1000;
  const n = parts.reduce((s, p) => s + p.elapsedSeconds!.length, 0);
  if (n !== readings.length) throw new Error(`blocks: read ${n}`);
  return { writeSeconds, readSeconds, bytes: await tableBytes(sequelize, 'run_reading_chunks') };
}

/** Prints and returns the archive figures. */
export async function run(): Promise<Record<string, string | number>> {
  const db = await openBenchDb('archive');
  try {
    const g0 = performance.now();
    const readings = makeReadings();
    console.log(`generated ${readings.length} readings through the run pipeline in ${((performance.now() - g0) / 1000).toFixed(2)} s`);
    const runId = await newRunId(db.sequelize, 'Bench 24 h');
    const rows = await plainRows(db.sequelize, readings);
    console.log(`plain rows:    write ${rows.writeSeconds.toFixed(2)} s (${Math.round(READINGS / rows.writeSeconds)}/s), read ${rows.readSeconds.toFixed(2)} s, ${(rows.bytes / 1e6).toFixed(1)} MB`);
    const blk = await blocks(db.sequelize, readings, runId);
    console.log(`column blocks: write ${blk.writeSeconds.toFixed(2)} s (${Math.round(READINGS / blk.writeSeconds)}/s), read ${blk.readSeconds.toFixed(2)} s, ${(blk.bytes / 1e6).toFixed(1)} MB`);

    const times: number[] = [];
    for (let i = 0; i < READINGS_ROUNDS; i++) {
      const s0 = performance.now();
      const res = await runReadings(db.sequelize, runId, { maxPoints: 1000, x: 'elapsedSeconds' });
      times.push(performance.now() - s0);
      if (res.x.length !== 1000) throw new Error('readings: wrong bucket count');
    }
    times.sort((a, b) => a - b);
    const readingsMs = times[Math.floor(times.length / 2)]!;
    console.log(`readings (1,000 px over 864k readings): median ${readingsMs.toFixed(0)} ms of ${READINGS_ROUNDS}`);

    let bytes = 0;
    const sink = new Writable({ write: (chunk: Buffer, _e, cb) => ((bytes += chunk.length), cb()) });
    const e0 = performance.now();
    const meta = await exportMeta(db.sequelize, (await new RunsRepo(db.sequelize).get(runId))!, async () => null);
    await streamCsvExport(sink, db.sequelize, meta);
    const exportSeconds = (performance.now() - e0) / 1000;
    console.log(`export.csv: ${exportSeconds.toFixed(2)} s, ${(bytes / 1e6).toFixed(1)} MB`);
    return {
      readings: READINGS,
      rowsWriteSeconds: +rows.writeSeconds.toFixed(2),
      rowsPerS: Math.round(READINGS / rows.writeSeconds),
      rowsReadSeconds: +rows.readSeconds.toFixed(2),
      rowsMB: +(rows.bytes / 1e6).toFixed(1),
      blocksWriteSeconds: +blk.writeSeconds.toFixed(2),
      blocksPerS: Math.round(READINGS / blk.writeSeconds),
      blocksReadSeconds: +blk.readSeconds.toFixed(2),
      blocksMB: +(blk.bytes / 1e6).toFixed(1),
      readings1000pxMs: Math.round(readingsMs),
      exportCsvSeconds: +exportSeconds.toFixed(2),
      exportCsvMB: +(bytes / 1e6).toFixed(1),
    };
  } finally {
    await db.close();
  }
}
