import type { Sequelize } from 'sequelize';
import { CAPACITY_FACTOR_CELSIUS_RANGE, inCapacityFactorRange } from '../../shared/measure/lead-acid-correction.js';
import { createRunPipeline } from '../../shared/measure/run-pipeline.js';
import { summarizeRun } from '../../shared/measure/summarize-run.js';
import type { ImportProgress, ImportResponse } from '../../shared/schemas/api-runs.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { frameProblem } from '../../shared/schemas/frame-check.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { CutoffEvent, RecoveryEvent, RunEvent } from '../../shared/schemas/run-event.js';
import { ARCHIVE_BLOCK_READINGS, encodeReadingBlock, writeArchiveBlocks, writeRunBatch, type ArchiveBlock } from '../archive/run-archive.js';
import { InvalidInputError } from '../domain/domain-errors.js';
import { readCsvRecords, sniffDelimiter } from './import-csv.js';
import { createRowParser, type ColumnOverrides, type ParsedRow } from './import-headers.js';
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
  /** Told the rows done after each chunk of the file is read (for the client's progress bar). */
  onProgress?: (progress: ImportProgress) => void;
  /** Most rows the check pass keeps for the import pass (default MAX_KEPT_ROWS); more, and the file is read again. */
  maxKeptRows?: number;
}



/** Groups of blocks (one per 1 MiB of file, about 7 blocks) queued for writing before reading waits for them. */
const MAX_GROUPS_IN_FLIGHT = 4;
/** Kept rows imported between progress reports and archive writes (about what 1 MiB of a log holds). */
const KEPT_ROWS_PER_PART = 32_768;

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
    throw new InvalidInputError(`Electrolyte temperature ${electrolyte} °C is outside the correction table (${min.toFixed(1)} to ${max.toFixed(1)} °C)`, { electrolyteTempCelsius: ['outside the table'] });
  }
  const delimiter = await sniffDelimiter(req.filePath);
  const survey = await surveyFile(req.filePath, delimiter, req.columns, req.timeZone ?? 'UTC', (rows) => req.onProgress?.({ phase: 'checking', rows, totalRows: null }), req.maxKeptRows);
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
  let writing: Promise<void> = Promise.resolve();
  try {
    // Gaps are judged against the file's own cadence (its median interval) unless a limit was typed.
    const pipeline = createRunPipeline(measureConfigFor(config, req.battery, { cadenceSeconds: medianStepSeconds }));
    const maxGapSeconds = pipeline.gapLimit.seconds;
    const events: RunEvent[] = [];
    let pending: Reading[] = [];
    let seq = 0;
    let written = 0;
    // Blocks are written while the next part of the file is read: each write waits on the
    // database's commit, and reading on meanwhile keeps both busy. The chain never rejects;
    // its first error is kept and thrown at the next chunk or at the end.
    let inFlight = 0;
    let writeError: unknown = null;
    const writeGroup = (blocks: ArchiveBlock[], readingsCount: number) => {
      inFlight++;
      writing = writing
        .then(() => (writeError === null ? writeArchiveBlocks(sequelize, run.id, blocks, { readingsCount }) : undefined))
        .catch((err: unknown) => void (writeError ??= err))
        .finally(() => void inFlight--);
    };
    /** Archives pending readings in blocks of ARCHIVE_BLOCK_READINGS (the rest too when `all`), one transaction for the lot. */
    const flush = async (all: boolean) => {
      const blocks: ArchiveBlock[] = [];
      while (pending.length >= ARCHIVE_BLOCK_READINGS || (all && pending.length > 0)) {
        const take = Math.min(ARCHIVE_BLOCK_READINGS, pending.length);
        blocks.push(encodeReadingBlock(written, pending.slice(0, take)));
        pending = pending.slice(take);
        written += take;
      }
      if (blocks.length > 0) writeGroup(blocks, written);
      if (all || inFlight >= MAX_GROUPS_IN_FLIGHT) await writing;
      if (writeError !== null) throw writeError;
    };
    let rowsRead = 0;
    /** One row to the run: its frame checked once, where it is made, like every live source's frames. */
    const take = (row: ParsedRow, line: number | null) => {
      rowsRead++;
      const frame: Frame = { t: row.t, volts: row.volts, amps: sign.flip ? -row.amps : row.amps, clock: 'device' };
      if (row.tempCelsius !== null) frame.temps = { cell: row.tempCelsius };
      const problem = frameProblem(frame);
      if (problem !== null) throw new InvalidInputError(line === null ? problem : `line ${line}: ${problem}`);
      const out = pipeline.push(frame);
      if (!out.reading) return;
      pending.push(out.reading);
      seq++;
      for (const e of out.events) events.push(e);
    };
    const afterPart = async () => {
      req.onProgress?.({ phase: 'importing', rows: rowsRead, totalRows: rows });
      await flush(false);
    };
    const { kept } = survey;
    if (kept) {
      // The check pass kept every row: no second read and parse of the file.
      const row: ParsedRow = { t: 0, volts: 0, amps: 0, tempCelsius: null };
      for (let i = 0; i < kept.count; i++) {
        row.t = kept.t(i);
        row.volts = kept.volts(i);
        row.amps = kept.amps(i);
        row.tempCelsius = kept.tempCelsius(i);
        take(row, null);
        if ((i + 1) % KEPT_ROWS_PER_PART === 0) await afterPart();
      }
    } else {
      const parse = createRowParser(plan);
      let header = true;
      await readCsvRecords(req.filePath, delimiter, (text, spans, line) => {
        if (header) {
          header = false;
          return;
        }
        take(parse(text, spans, line), line);
      }, afterPart);
    }
    await flush(true);
    const summary = summarizeRun({
      snapshot: pipeline.snapshot(), events, acceptancePercent: req.acceptancePercent,
      price: req.battery?.price ?? null, massKg: req.battery?.massKg ?? null, leadAcidTempCelsius: electrolyte ?? null,
    });
    await writeRunBatch(sequelize, {
      runId: run.id, firstSeq: seq, readings: [], events: events.map((event, eventSeq) => ({ eventSeq, event })),
      patch: { state: 'finished', summary, readingsCount: seq, endedAt: new Date() },
    });
    const cutoff = summary.capacityEndSeconds !== null ? events.find((e): e is CutoffEvent => e.type === 'cutoff' && e.elapsedSeconds === summary.capacityEndSeconds) ?? null : null;
    const recovery = events.find((e): e is RecoveryEvent => e.type === 'recovery') ?? null;
    const totals = pipeline.totals();
    return {
      run: (await repo.get(run.id))!,
      summary: {
        energyWh: summary.capacityWh ?? totals.dischargeWh,
        dischargeAh: summary.capacityAh ?? totals.dischargeAh,
        durationSeconds: summary.durationSeconds,
        cutoff: cutoff ? { atSeconds: cutoff.elapsedSeconds, volts: cutoff.volts } : null,
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
    await writing;
    // Nothing half-imported stays behind (chunks and events go with the run).
    await sequelize.query('DELETE FROM runs WHERE id = ?', { replacements: [run.id] }).catch(() => undefined);
    throw err;
  }
}
