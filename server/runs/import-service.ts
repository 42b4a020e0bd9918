import type { Sequelize } from 'sequelize';
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
import { csvRecords, sniffDelimiter, type Delimiter } from './import-csv.js';
import { parseRow, planColumns, type ColumnOverrides, type ColumnPlan } from './import-headers.js';
import { measureConfigFor, type BatteryFacts } from './measure-config.js';
import type { RunConfig, RunsRepo } from './runs-repo.js';

export interface ImportRequest {
  filePath: string;
  name: string;
  tags: string[];
  battery: BatteryFacts | null;
  endVolts?: number;
  currentSign: 'discharge-positive' | 'discharge-negative' | 'auto';
  columns: ColumnOverrides;
  userId: number;
  /** The lab's zone, for timestamps written without one. */
  timeZone?: string;
  /** Gap limit typed on the import form, s (absent: from the file's cadence). */
  maxGapSeconds?: number;
}

/** Pass 1: check every row and learn the sign of the current, holding nothing but counts. */
async function survey(req: ImportRequest, delimiter: Delimiter): Promise<{ plan: ColumnPlan; flip: boolean; rows: number }> {
  let headers: string[] | null = null;
  let plan: ColumnPlan | null = null;
  let rows = 0;
  let positive = 0;
  let negative = 0;
  let lastT = Number.NEGATIVE_INFINITY;
  for await (const { fields, line } of csvRecords(req.filePath, delimiter)) {
    if (!headers) {
      headers = fields;
      continue;
    }
    plan ??= { ...planColumns(headers, fields, req.columns), decimalComma: delimiter !== ',', timeZone: req.timeZone };
    if (fields.length !== headers.length) throw new HttpError(400, `line ${line}: ${fields.length} fields, the header has ${headers.length}`);
    const row = parseRow(plan, fields, line);
    // Out-of-order rows would be dropped by the integrator: refuse the file rather than lose them quietly.
    if (row.t < lastT) throw new HttpError(400, `line ${line}: time goes back (${row.t} s after ${lastT} s); rows must be in time order`);
    lastT = row.t;
    if (row.amps > 0) positive++;
    else if (row.amps < 0) negative++;
    rows++;
  }
  if (!headers) throw new HttpError(400, 'line 1: the file is empty; expected a header row');
  // A header alone (or a file that is no CSV) is reported by what is wrong with its header first.
  plan ??= { ...planColumns(headers, null, req.columns), decimalComma: delimiter !== ',', timeZone: req.timeZone };
  if (rows < 2) throw new HttpError(400, `line ${rows + 2}: at least two readings are needed after the header`);
  const flip = req.currentSign === 'discharge-negative' || (req.currentSign === 'auto' && negative > positive);
  return { plan, flip, rows };
}

/**
 * Imports a logged run from a CSV on disk in two streaming passes (check, then integrate
 * and archive), so a file of a million rows never sits in memory and a bad file leaves
 * nothing behind. The run's figures come from the same pipeline as live runs.
 */
export async function importRun(sequelize: Sequelize, repo: RunsRepo, req: ImportRequest): Promise<ImportResponse> {
  const delimiter = await sniffDelimiter(req.filePath);
  const { plan, flip, rows } = await survey(req, delimiter);
  const config: RunConfig = {
    kind: 'capacity-discharge',
    endVolts: req.endVolts ? { mode: 'absolute', volts: req.endVolts } : null,
    acceptancePercent: 100,
    alarms: { onCutoff: false },
    stopWhen: 'manual',
    targetAh: null,
    targetWh: null,
    afterRecoverySeconds: 0,
    maxGapSeconds: req.maxGapSeconds ?? null,
  };
  const run = await repo.create({
    name: req.name, tags: req.tags, origin: 'import', benchId: null, batteryId: req.battery?.id ?? null,
    state: 'recording', config, createdById: req.userId, startedAt: null,
  });
  try {
    const pipeline = createRunPipeline(measureConfigFor(config, req.battery));
    const events: RunEvent[] = [];
    let pending: Reading[] = [];
    let seq = 0;
    let firstT: number | null = null;
    const flush = async () => {
      if (!pending.length) return;
      const block = encodeChunk(seq - pending.length, readingsToColumns(pending));
      pending = [];
      await writeBatch(sequelize, { runId: run.id, block, events: [], patch: { readingsCount: seq } });
    };
    let header = true;
    for await (const { fields, line } of csvRecords(req.filePath, delimiter)) {
      if (header) {
        header = false;
        continue;
      }
      const row = parseRow(plan, fields, line);
      firstT ??= row.t;
      const frame: Frame = { t: row.t, volts: row.volts, amps: flip ? -row.amps : row.amps, clock: 'device', ...(row.tempC !== null ? { temps: { cell: row.tempC } } : {}) };
      const out = pipeline.push(frame);
      if (!out.reading) continue;
      pending.push(out.reading);
      seq++;
      for (const e of out.events) events.push(e);
      if (pending.length >= COMPACT_READINGS) await flush();
    }
    await flush();
    const summary = summarizeRun({ snapshot: pipeline.snapshot(), events, acceptancePercent: 100, price: req.battery?.price ?? null, massKg: req.battery?.massKg ?? null });
    await writeBatch(sequelize, {
      runId: run.id, block: null, events: events.map((event, eventSeq) => ({ eventSeq, event })),
      patch: { state: 'finished', summary, readingsCount: seq, endedAt: new Date(), ...(plan.time.unit === 'iso' && firstT !== null ? { startedAt: new Date(firstT * 1000) } : {}) },
    });
    const cutoff = summary.capacityEndSeconds !== null ? events.find((e): e is CutoffEvent => e.type === 'cutoff' && e.t === summary.capacityEndSeconds) ?? null : null;
    const recovery = events.find((e): e is RecoveryEvent => e.type === 'recovery') ?? null;
    const totals = pipeline.totals();
    return {
      run: (await repo.get(run.id))!,
      summary: {
        energyWh: summary.capacityWh ?? totals.dischargeWh,
        chargeAh: summary.capacityAh ?? totals.dischargeAh,
        durationS: summary.durationSeconds,
        cutoff: cutoff ? { atS: cutoff.t, volts: cutoff.volts } : null,
        recoveryS: recovery?.recoverySeconds ?? null,
        rows,
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
