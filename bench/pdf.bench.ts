/**
 * Run report PDF benchmark (issue 14): a 24-hour run at 10 Hz (864,000 readings) made by the
 * real run pipeline and archived through the real block path (encodeChunk + writeBatch), then
 * its report made as GET /api/runs/:id/report.pdf makes it: the run, 600 min/max buckets from
 * the samples service, its events, the lab settings, pdfkit. Target: under 2 s. Figures go to docs/benchmarks.md.
 */
import { performance } from 'node:perf_hooks';
import { createRunPipeline } from '../shared/measure/run-pipeline.js';
import { summarizeRun } from '../shared/measure/summarize-run.js';
import type { Reading } from '../shared/schemas/reading.js';
import type { RunEvent } from '../shared/schemas/run-event.js';
import { COMPACT_READINGS, writeBatch } from '../server/archive/chunk-store.js';
import { encodeChunk } from '../server/archive/chunk-encode.js';
import { readingsToColumns } from '../server/readings/reading-columns.js';
import { RunsRepo } from '../server/runs/runs-repo.js';
import { runSamples } from '../server/runs/samples-service.js';
import { renderRunReportPdf } from '../server/reports/run-report-pdf.js';
import { getLabSettings } from '../server/settings/settings-service.js';
import { defineCoreModels } from '../server/db/models/index.js';
import { openBenchDb } from './bench-db.js';

const HZ = 10;
const HOURS = 24;
const READINGS = HOURS * 3600 * HZ;
const ROUNDS = 5;
const REPORT_CHART_BUCKETS = 600;
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
    const times: number[] = [];
    let bytes = 0;
    for (let i = 0; i < ROUNDS; i++) {
      const t0 = performance.now();
      const run = (await repo.get(created.id))!;
      const [samples, stored, settings] = await Promise.all([
        runSamples(db.sequelize, run.id, { maxPoints: REPORT_CHART_BUCKETS, x: 't' }),
        repo.events(run.id),
        getLabSettings(models),
      ]);
      const pdf = await renderRunReportPdf({ run, samples, events: stored, settings, madeAt: new Date() });
      times.push(performance.now() - t0);
      bytes = pdf.length;
    }
    times.sort((a, b) => a - b);
    const medianMs = times[Math.floor(times.length / 2)]!;
    console.log(`report.pdf of ${READINGS} readings: median ${medianMs.toFixed(0)} ms of ${ROUNDS} (max ${times[times.length - 1]!.toFixed(0)} ms), ${(bytes / 1e3).toFixed(0)} kB`);
    return { readings: READINGS, reportMedianMs: Math.round(medianMs), reportMaxMs: Math.round(times[times.length - 1]!), pdfKB: Math.round(bytes / 1e3) };
  } finally {
    await db.close();
  }
}
