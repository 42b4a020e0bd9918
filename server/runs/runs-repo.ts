import { QueryTypes, type Sequelize } from 'sequelize';
import { z } from 'zod';
import type { ListRunsQuery, StoredRunEvent } from '../../shared/schemas/api-runs.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import { RunSummarySchema, type RunSummary } from '../../shared/schemas/run-summary.js';
import { summaryWithCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import { parseStoredRunEvent } from './stored-run-event.js';
import { TempProtectionSchema } from '../../shared/schemas/measure-config.js';
import { ProtectionExpectationSchema } from '../../shared/schemas/protection-check.js';
import { EndVoltsSchema, RunAlarmsSchema, RunKindSchema, StopWhenSchema, LIVE_RUN_STATES, type Run, type RunState } from '../../shared/schemas/run.js';
import { BenchSourceConfigSchema, sourceCadenceSeconds } from '../../shared/schemas/bench.js';
import { utcDateTime } from '../db/utc-datetime.js';
import { MeterAccuracySchema, readMeterAccuracy } from '../../shared/schemas/meter-accuracy.js';
import type { SourceFacts } from './measure-config.js';

/** Settings of a run kept together in the `config` column (JSON). */
export const RunConfigSchema = z.object({
  kind: RunKindSchema,
  endVolts: EndVoltsSchema.nullable(),
  acceptancePercent: z.number(),
  alarms: RunAlarmsSchema,
  stopWhen: StopWhenSchema,
  tempProtections: z.array(TempProtectionSchema).optional(),
  protectionChecks: z.array(ProtectionExpectationSchema).optional(),
  targetAh: z.number().nullable(),
  targetWh: z.number().nullable(),
  afterRecoverySeconds: z.number(),
  protectionEndsTest: z.boolean().optional(),
  /** Absent in runs stored before gap limits could be typed: the source's cadence decides. */
  maxGapSeconds: z.number().nullable().optional(),
  /** Lead-acid: initial electrolyte temperature, °C, for the correction to 25 °C (absent on older runs). */
  electrolyteTempCelsius: z.number().nullable().optional(),
  /** The bench meter's stated accuracy when the run started (absent on older runs and imports: no uncertainty). */
  meterAccuracy: MeterAccuracySchema.nullable().optional(),
});
export type RunConfig = z.infer<typeof RunConfigSchema>;

interface RunRow {
  id: number;
  name: string;
  tags: string;
  origin: 'live' | 'import';
  benchId: number | null;
  batteryId: number | null;
  kind: string;
  state: RunState;
  config: string;
  readingsCount: number;
  summary: string | null;
  pipelineState: string | null;
  startedAt: Date | string | null;
  endedAt: Date | string | null;
  createdById: number | null;
  createdAt: Date | string;
  updatedAt: Date | string;
}

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

/**
 * A stored summary, or null when it is missing or unreadable: one bad row (say figures
 * written before non-finite values were kept out) must not make every run list fail.
 */
function storedSummary(text: string | null): RunSummary | null {
  if (!text) return null;
  try {
    const parsed = RunSummarySchema.safeParse(summaryWithCurrentKeys(JSON.parse(text)));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

/** Turns a database row into the API's Run. */
export function rowToRun(row: RunRow): Run {
  const config = RunConfigSchema.parse(JSON.parse(row.config));
  return {
    id: row.id,
    name: row.name,
    tags: JSON.parse(row.tags) as string[],
    origin: row.origin,
    benchId: row.benchId,
    batteryId: row.batteryId,
    ...config,
    state: row.state,
    readingsCount: Number(row.readingsCount),
    summary: storedSummary(row.summary),
    startedAt: iso(row.startedAt),
    endedAt: iso(row.endedAt),
    createdBy: row.createdById,
    createdAt: iso(row.createdAt)!,
    updatedAt: iso(row.updatedAt)!,
  };
}

export interface NewRun {
  name: string;
  tags: string[];
  origin: 'live' | 'import';
  benchId: number | null;
  batteryId: number | null;
  state: RunState;
  config: RunConfig;
  createdById: number | null;
  startedAt: Date | null;
}

const RUN_COLUMNS = 'id, name, tags, origin, benchId, batteryId, kind, state, config, readingsCount, summary, startedAt, endedAt, createdById, createdAt, updatedAt';

/** Data access for runs and their events (readings live in the archive). */
export class RunsRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Inserts a run and returns it. */
  async create(run: NewRun): Promise<Run> {
    const [id] = await this.sequelize.query(
      `INSERT INTO runs (name, tags, origin, benchId, batteryId, kind, state, config, startedAt, createdById, createdAt, updatedAt)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, NOW(3), NOW(3))`,
      {
        replacements: [run.name, JSON.stringify(run.tags), run.origin, run.benchId, run.batteryId, run.config.kind, run.state, JSON.stringify(run.config), utcDateTime(run.startedAt), run.createdById],
        type: QueryTypes.INSERT,
      },
    );
    return (await this.get(Number(id)))!;
  }

  /** One run, or null. */
  async get(id: number): Promise<Run | null> {
    const rows = await this.sequelize.query<RunRow>(`SELECT ${RUN_COLUMNS} FROM runs WHERE id = ?`, { replacements: [id], type: QueryTypes.SELECT });
    return rows[0] ? rowToRun(rows[0]) : null;
  }

  /** The archived recorder state of a run (JSON text), for resuming after a restart. */
  async getPipelineState(id: number): Promise<string | null> {
    const rows = await this.sequelize.query<{ pipelineState: string | null }>('SELECT pipelineState FROM runs WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    return rows[0]?.pipelineState ?? null;
  }

  /** Runs still armed or recording (to resume after a restart), oldest first. */
  async listLive(): Promise<Run[]> {
    const rows = await this.sequelize.query<RunRow>(`SELECT ${RUN_COLUMNS} FROM runs WHERE origin = 'live' AND state IN (?) ORDER BY id`, {
      replacements: [LIVE_RUN_STATES],
      type: QueryTypes.SELECT,
    });
    return rows.map(rowToRun);
  }

  /** The newest run the database calls live on a bench (armed to recovered), if any. */
  async liveRunIdOnBench(benchId: number): Promise<number | undefined> {
    const rows = await this.sequelize.query<{ id: number }>('SELECT id FROM runs WHERE benchId = ? AND state IN (?) ORDER BY id DESC LIMIT 1', {
      replacements: [benchId, LIVE_RUN_STATES],
      type: QueryTypes.SELECT,
    });
    return rows[0]?.id;
  }

  /** Search and filter, newest first. `q` matches the name; `tag` one tag exactly. */
  async list(q: ListRunsQuery): Promise<{ runs: Run[]; total: number }> {
    const where: string[] = [];
    const values: unknown[] = [];
    if (q.q) {
      where.push('name LIKE ?');
      values.push(`%${q.q.replace(/[\\%_]/g, (c) => '\\' + c)}%`);
    }
    if (q.tag) {
      // tags is a JSON array of strings: match one element exactly.
      where.push('JSON_CONTAINS(tags, ?)');
      values.push(JSON.stringify(q.tag));
    }
    if (q.batteryId) {
      where.push('batteryId = ?');
      values.push(q.batteryId);
    }
    if (q.benchId) {
      where.push('benchId = ?');
      values.push(q.benchId);
    }
    if (q.state) {
      where.push('state = ?');
      values.push(q.state);
    }
    const clause = where.length ? `WHERE ${where.join(' AND ')}` : '';
    const rows = await this.sequelize.query<RunRow>(`SELECT ${RUN_COLUMNS} FROM runs ${clause} ORDER BY id DESC LIMIT ? OFFSET ?`, {
      replacements: [...values, q.limit, q.offset],
      type: QueryTypes.SELECT,
    });
    const [count] = await this.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM runs ${clause}`, { replacements: values, type: QueryTypes.SELECT });
    return { runs: rows.map(rowToRun), total: Number(count?.n ?? 0) };
  }

  /** Renames or retags a run. */
  async patch(id: number, p: { name?: string; tags?: string[] }): Promise<Run | null> {
    const sets: string[] = [];
    const values: unknown[] = [];
    if (p.name !== undefined) {
      sets.push('name = ?');
      values.push(p.name);
    }
    if (p.tags !== undefined) {
      sets.push('tags = ?');
      values.push(JSON.stringify(p.tags));
    }
    await this.sequelize.query(`UPDATE runs SET ${sets.join(', ')}, updatedAt = NOW(3) WHERE id = ?`, { replacements: [...values, id] });
    return this.get(id);
  }

  /** True when the ingest area's benches table has this id. */
  async benchExists(id: number): Promise<boolean> {
    const rows = await this.sequelize.query('SELECT id FROM benches WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    return rows.length > 0;
  }

  /** What a run needs of a bench (its source's poll period, its load threshold), or null when there is no such bench. */
  async benchSourceFacts(id: number): Promise<SourceFacts | null> {
    const rows = await this.sequelize.query<{ source: string; loadOnAmps: number | null; meterAccuracy: string | null }>('SELECT source, loadOnAmps, meterAccuracy FROM benches WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    if (rows.length === 0) return null;
    let raw: unknown = null;
    try {
      raw = JSON.parse(rows[0]!.source);
    } catch {
      // A stored source that no longer reads has no known cadence; the run falls back to the default limit.
    }
    const source = BenchSourceConfigSchema.safeParse(raw);
    const loadOnAmps = rows[0]!.loadOnAmps === null ? null : Number(rows[0]!.loadOnAmps);
    return { cadenceSeconds: source.success ? sourceCadenceSeconds(source.data) : null, loadOnAmps, meterAccuracy: readMeterAccuracy(rows[0]!.meterAccuracy) };
  }

  /** Every event of a run in time order. */
  async events(runId: number): Promise<StoredRunEvent[]> {
    const rows = await this.sequelize.query<{ id: number; runId: number; data: string; createdAt: Date | string; createdById: number | null }>(
      'SELECT id, runId, data, createdAt, createdById FROM run_events WHERE runId = ? ORDER BY elapsedSeconds, id',
      { replacements: [runId], type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ id: r.id, runId: r.runId, event: parseStoredRunEvent(r.data), createdAt: iso(r.createdAt)!, createdBy: r.createdById }));
  }

  /** Stores an event outside the recorder's batches (annotations); returns it with its id. */
  async insertEvent(runId: number, event: RunEvent, createdById: number | null): Promise<StoredRunEvent> {
    const [id] = await this.sequelize.query(
      'INSERT INTO run_events (runId, eventSeq, type, elapsedSeconds, data, createdById, createdAt) VALUES (?, NULL, ?, ?, ?, ?, NOW(3))',
      { replacements: [runId, event.type, event.elapsedSeconds, JSON.stringify(event), createdById], type: QueryTypes.INSERT },
    );
    const rows = await this.sequelize.query<{ createdAt: Date | string }>('SELECT createdAt FROM run_events WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    return { id: Number(id), runId, event, createdAt: iso(rows[0]?.createdAt ?? new Date())!, createdBy: createdById };
  }

}
