/**
 * Run report PDF benchmark (issue 14): a 24-hour run at 10 Hz (864,000 readings) made by the
 * real run pipeline and archived through the real block path (encodeChunk + writeBatch), then
 * its report made as GET /api/runs/:id/report.pdf makes it: the run, 600 min/max buckets from
 * the readings service, its events, its review history, the lab settings, pdfkit (server/reports/run-report.ts).
 * Target: under 2 s. Then the pack report as GET /api/batteries/:id/report.pdf makes it, for a pack
 * with PACK_RUNS capacity runs and PACK_PHOTOS teardown photos (thumbnails from sharp, as uploads store
 * them). Figures go to docs/benchmarks.md.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import sharp from 'sharp';
import type { Sequelize } from 'sequelize';
import type { RunSummary } from '../shared/schemas/run-summary.js';
import { createRunPipeline } from '../shared/measure/run-pipeline.js';
import { summarizeRun } from '../shared/measure/summarize-run.js';
import type { Reading } from '../shared/schemas/reading.js';
import type { RunEvent } from '../shared/schemas/run-event.js';
import { COMPACT_READINGS, writeBatch } from '../server/archive/chunk-store.js';
import { encodeChunk } from '../server/archive/chunk-encode.js';
import { readingsToColumns } from '../server/readings/reading-columns.js';
import { RunsRepo } from '../server/runs/runs-repo.js';
import { InspectionRepo } from '../server/inspection/inspection-repo.js';
import { PhotoFiles } from '../server/photos/photo-files.js';
import { PhotosRepo } from '../server/photos/photos-repo.js';
import { packReportPdf } from '../server/reports/pack-report.js';
import { runReportPdf } from '../server/reports/run-report.js';
import { defineCoreModels, type CoreModels } from '../server/db/models/index.js';
import { openBenchDb } from './bench-db.js';

const HZ = 10;
const HOURS = 24;
const READINGS = HOURS * 3600 * HZ;
const ROUNDS = 5;
/** Capacity runs and photos of the benchmark pack: years of monthly tests and a full teardown. */
const PACK_RUNS = 60;
const PACK_PHOTOS = 24;
const PHOTO_SIZE_PX = { width: 1600, height: 1200 };
const THUMB_FIT_PX = 320;
const METER = { voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.02 };

/** Prints and returns the report figures. */
export async function run(): Promise<Record<string, string | number>> {
  const db = await openBenchDb('pdf');
  try {
    const p = createRunPipeline({ endVolts: 10, ratedAh: 100 });
    const readings: Reading[] = [];
    const events: RunEvent[] = [];
    for (let i = 0; i < READINGS; i++) {
      const t = i / HZ;
      const r = p.push({ t, volts: 13.3 - t * 2e-5 + Math.sin(i) * 0.002, amps: 4 + Math.cos(i / 7) * 0.01, temps: { cell: 23 + t / 20_000 }, clock: 'device' });
      if (r.reading) readings.push(r.reading);
      events.push(...r.events);
    }
    const repo = new RunsRepo(db.sequelize);
    const created = await repo.create({
      name: 'Bench 24 h report', tags: [], origin: 'import', benchId: null, batteryId: null, state: 'finished', createdById: null, startedAt: new Date(),
      config: { kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', targetAh: null, targetWh: null, afterRecoverySeconds: 0, meterAccuracy: METER },
    });
    const summary = summarizeRun({ snapshot: p.snapshot(), events, meterAccuracy: METER });
    for (let at = 0; at < readings.length; at += COMPACT_READINGS) {
      const part = readings.slice(at, at + COMPACT_READINGS);
      const last = at + part.length >= readings.length;
      await writeBatch(db.sequelize, { runId: created.id, block: encodeChunk(at, readingsToColumns(part)), events: last ? events.map((event, eventSeq) => ({ eventSeq, event })) : [], patch: { readingsCount: at + part.length, ...(last && { summary }) } });
    }
    const models = defineCoreModels(db.sequelize);
    const deps = { sequelize: db.sequelize, models };
    const times: number[] = [];
    let bytes = 0;
    for (let i = 0; i < ROUNDS; i++) {
      const t0 = performance.now();
      const pdf = await runReportPdf(deps, (await repo.get(created.id))!, new Date());
      times.push(performance.now() - t0);
      bytes = pdf.length;
    }
    times.sort((a, b) => a - b);
    const medianMs = times[Math.floor(times.length / 2)]!;
    console.log(`report.pdf of ${READINGS} readings: median ${medianMs.toFixed(0)} ms of ${ROUNDS} (max ${times[times.length - 1]!.toFixed(0)} ms), ${(bytes / 1e3).toFixed(0)} kB`);
    const pack = await packFigures(db.sequelize, models, repo, summary);
    return { readings: READINGS, reportMedianMs: Math.round(medianMs), reportMaxMs: Math.round(times[times.length - 1]!), pdfKB: Math.round(bytes / 1e3), ...pack };
  } finally {
    await db.close();
  }
}

/** Times the pack report of a pack with PACK_RUNS capacity runs and PACK_PHOTOS photos. */
async function packFigures(sequelize: Sequelize, models: CoreModels, repo: RunsRepo, summary: RunSummary): Promise<Record<string, number>> {
  const dataDir = mkdtempSync(join(tmpdir(), 'kneepoint-pdf-bench-'));
  try {
    const battery = await models.Battery.create({ label: 'Bench pack NG-B1', brand: 'Corvane', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, ratedWh: 1280 });
    for (let i = 0; i < PACK_RUNS; i++) {
      const run = await repo.create({
        name: `Monthly capacity ${i + 1}`, tags: [], origin: 'import', benchId: null, batteryId: battery.id, state: 'finished', createdById: null, startedAt: new Date(Date.UTC(2020, i, 1)),
        config: { kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', targetAh: null, targetWh: null, afterRecoverySeconds: 0, meterAccuracy: METER },
      });
      await sequelize.query('UPDATE runs SET summary = ? WHERE id = ?', { replacements: [JSON.stringify(summary), run.id] });
    }
    const files = new PhotoFiles(dataDir);
    const photos = new PhotosRepo(sequelize);
    const [item] = await new InspectionRepo(sequelize).items();
    for (let i = 0; i < PACK_PHOTOS; i++) {
      const picture = sharp({ create: { ...PHOTO_SIZE_PX, channels: 3, background: { r: 40 + i * 5, g: 90, b: 120 } } });
      const full = await picture.clone().jpeg().toBuffer();
      const thumb = await picture.clone().resize(THUMB_FIT_PX, THUMB_FIT_PX, { fit: 'inside' }).jpeg().toBuffer();
      const key = files.newKey();
      await files.write(key, { format: 'jpeg', widthPx: PHOTO_SIZE_PX.width, heightPx: PHOTO_SIZE_PX.height, full, web: full, thumb });
      await photos.insert({ batteryId: battery.id, itemId: i % 2 === 0 && item ? item.id : null, storageKey: key, fileName: `teardown-${i + 1}.jpg`, format: 'jpeg', widthPx: PHOTO_SIZE_PX.width, heightPx: PHOTO_SIZE_PX.height, bytes: full.length, createdBy: null });
    }
    const times: number[] = [];
    let bytes = 0;
    for (let i = 0; i < ROUNDS; i++) {
      const t0 = performance.now();
      const pdf = (await packReportPdf({ sequelize, models, dataDir }, battery.id, false, new Date()))!;
      times.push(performance.now() - t0);
      bytes = pdf.length;
    }
    times.sort((a, b) => a - b);
    const medianMs = times[Math.floor(times.length / 2)]!;
    console.log(`pack report.pdf of ${PACK_RUNS} runs, ${PACK_PHOTOS} photos: median ${medianMs.toFixed(0)} ms of ${ROUNDS} (max ${times[times.length - 1]!.toFixed(0)} ms), ${(bytes / 1e3).toFixed(0)} kB`);
    return { packRuns: PACK_RUNS, packPhotos: PACK_PHOTOS, packReportMedianMs: Math.round(medianMs), packReportMaxMs: Math.round(times[times.length - 1]!), packPdfKB: Math.round(bytes / 1e3) };
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}
