import type { Sequelize } from 'sequelize';
import { CAPACITY_FACTOR_CELSIUS_RANGE, inCapacityFactorRange } from '../../shared/measure/lead-acid-correction.js';
import { createRunPipeline } from '../../shared/measure/run-pipeline.js';
import { summarizeRun } from '../../shared/measure/summarize-run.js';
import type { ImportResponse } from '../../shared/schemas/api-runs.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { CutoffEvent, RecoveryEvent, RunEvent } from '../../shared/schemas/run-event.js';
import { COMPACT_READINGS, writeBatch } from '../archive/chunk-store.js';
import { encodeChunk } from '../archive/chunk-encode.js';
import { readingsToColumns } from '../archive/reading-columns.js';
import { HttpError } from '../http/http-error.js';
import { csvRecords, sniffDelimiter } from './import-csv.js';
import { createRowParser, type ColumnOverrides } from './import-headers.js';
import { importNotices } from './import-notices.js';
import { decideCurrentSign, type SignDecision } from './import-sign.js';
import { surveyFile } from './import-survey.js';
import { isAbsoluteTime } from './import-time.js';
import { measureConfigFor, type BatteryFacts } from './measure-config.js';
import type { RunConfig, RunsRepo } from './runs-repo.js';

export interface ImportRequest {
  filePath: string;
  name: string;
  tags: string[];
  battery: BatteryFacts | null;
  endVolts?: number;
  currentSign: 'discharge-positive' | 'discharge-negative' | 'auto';
  /** Column names, time format and temperature units chosen on the form. */
  columns: ColumnOverrides;
  userId: number;
  /** The lab's zone, for dates written without one. */
  timeZone?: string;
  /** Share of rated capacity to pass, % (the form's, defaulting to the lab's setting). */
  acceptancePercent: number;
  /** Lead-acid: initial electrolyte temperature, °C. */
  electrolyteTempCelsius?: number;
  /** A step longer than this is a gap; omitted: judged against the file's cadence. */
  maxGapSeconds?: number;
}

/** The sign as stated, or as the file's energy each way tells it. */
function settleSign(req: ImportRequest, tally: Parameters<typeof decideCurrentSign>[0]): SignDecision {
  if (req.currentSign === 'discharge-negative') return { flip: true, reason: 'negative amps are discharge (as chosen)' };
  if (req.currentSign === 'discharge-positive') return { flip: false, reason: 'positive amps are discharge (as chosen)' };
  return decideCurrentSign(tally);
}

/**
 * Imports a logged run from a CSV on disk in two streaming passes (check, then integrate
 * and archive), so a file of a million rows never sits in memory and a bad file leaves
 * nothing behind. The run's figures come from the same pipeline as live runs.
 */
export async function importRun(sequelize: Sequelize, repo: RunsRepo, req: ImportRequest): Promise<ImportResponse> {
  const electrolyte = req.electrolyteTempCelsius;
  if (electrolyte !== undefined && !inCapacityFactorRange(electrolyte)) {
    const { min, max } = CAPACITY_FACTOR_CELSIUS_RANGE;
    throw new HttpError(400, `Electrolyte temperature ${electrolyte} °C is outside the correction table (${min.toFixed(1)} to ${max.toFixed(1)} °C)`, { electrolyteTempCelsius: ['outside the table'] });
  }
  const delimiter = await sniffDelimiter(req.filePath);
  const survey = await surveyFile(req.filePath, delimiter, req.columns, req.timeZone ?? 'UTC');
  const { plan, rows, duplicates, medianStepSeconds } = survey;
  const sign = settleSign(req, survey.sign);
  const config: RunConfig = {
    kind: 'capacity-discharge',
    endVolts: req.endVolts ? { mode: 'absolute', volts: req.endVolts } : null,
    acceptancePercent: req.acceptancePercent,
    alarms: { onCutoff: false },
    stopWhen: 'manual',
    targetAh: null,
    targetWh: null,
    afterRecoverySeconds: 0,
    electrolyteTempCelsius: electrolyte ?? null,
    maxGapSeconds: req.maxGapSeconds ?? null,
  };
  // "Started" is the first reading when the file says when that was.
  const startedAt = isAbsoluteTime(plan.time.format, survey.firstT) ? new Date(survey.firstT * 1000) : null;
  const run = await repo.create({
    name: req.name, tags: req.tags, origin: 'import', benchId: null, batteryId: req.battery?.id ?? null,
    state: 'recording', config, createdById: req.userId, startedAt,
  });
  try {
    // Gaps are judged against the file's own cadence (its median interval) unless a limit was typed.
    const pipeline = createRunPipeline(measureConfigFor(config, req.battery, { cadenceSeconds: medianStepSeconds }));
    const maxGapSeconds = pipeline.gapLimit.seconds;
    const events: RunEvent[] = [];
    let pending: Reading[] = [];
    let seq = 0;
    const flush = async () => {
      if (!pending.length) return;
      const block = encodeChunk(seq - pending.length, readingsToColumns(pending));
      pending = [];
      await writeBatch(sequelize, { runId: run.id, block, events: [], patch: { readingsCount: seq } });
    };
    const parse = createRowParser(plan);
    let header = true;
    for await (const { fields, line } of csvRecords(req.filePath, delimiter)) {
      if (header) {
        header = false;
        continue;
      }
      const row = parse(fields, line);
      const frame: Frame = { t: row.t, volts: row.volts, amps: sign.flip ? -row.amps : row.amps, clock: 'device', ...(row.tempCelsius !== null ? { temps: { cell: row.tempCelsius } } : {}) };
      const out = pipeline.push(frame);
      if (!out.reading) continue;
      pending.push(out.reading);
      seq++;
      for (const e of out.events) events.push(e);
      if (pending.length >= COMPACT_READINGS) await flush();
    }
    await flush();
    const summary = summarizeRun({
      snapshot: pipeline.snapshot(), events, acceptancePercent: req.acceptancePercent,
      price: req.battery?.price ?? null, massKg: req.battery?.massKg ?? null, leadAcidTempCelsius: electrolyte ?? null,
    });
    await writeBatch(sequelize, {
      runId: run.id, block: null, events: events.map((event, eventSeq) => ({ eventSeq, event })),
      patch: { state: 'finished', summary, readingsCount: seq, endedAt: new Date() },
    });
    const cutoff = summary.capacityEndSeconds !== null ? events.find((e): e is CutoffEvent => e.type === 'cutoff' && e.t === summary.capacityEndSeconds) ?? null : null;
    const recovery = events.find((e): e is RecoveryEvent => e.type === 'recovery') ?? null;
    const totals = pipeline.totals();
    return {
      run: (await repo.get(run.id))!,
      summary: {
        energyWh: summary.capacityWh ?? totals.dischargeWh,
        dischargeAh: summary.capacityAh ?? totals.dischargeAh,
        durationSeconds: summary.durationSeconds,
        cutoff: cutoff ? { atSeconds: cutoff.t, volts: cutoff.volts } : null,
        recoverySeconds: recovery?.recoverySeconds ?? null,
        rows,
        duplicateTimes: duplicates,
        medianIntervalSeconds: medianStepSeconds,
        maxGapSeconds,
        notices: importNotices({ plan, sign, duplicates, medianStepSeconds, maxGapSeconds, gapsFromForm: req.maxGapSeconds !== undefined }),
        ...(req.battery ? { percentOfRated: summary.percentRatedAh } : {}),
      },
      fullSummary: summary,
    };
  } catch (err) {
    // Nothing half-imported stays behind (chunks and events go with the run).
    await sequelize.query('DELETE FROM runs WHERE id = ?', { replacements: [run.id] }).catch(() => undefined);
    throw err;
  }
}
