import { QueryTypes, type Sequelize } from 'sequelize';
import { planSteps } from '../../shared/measure/programme-plan.js';
import { programmeRoundTrips } from '../../shared/measure/programme-round-trip.js';
import { ProgrammeInputSchema, type ProgrammeInput } from '../../shared/schemas/programme.js';
import { StepResultSchema, type CommandLogRow, type ProgrammeRunState, type RunProgramme, type StepResult } from '../../shared/schemas/programme-run.js';
import { LEGACY_RUN_TIME_KEYS, withCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import { utcDateTime } from '../db/utc-datetime.js';

interface RunProgrammeRow {
  runId: number;
  programmeId: number | null;
  programme: string | object;
  state: ProgrammeRunState;
  currentIndex: number | null;
  stepStartedAtMs: number | string | null;
  results: string | object;
  failReason: string | null;
  floorVolts: number;
  watchdogArmed: string | object;
  cautionsAcknowledgedBy: string;
}

const json = (v: string | object): unknown => (typeof v === 'string' ? JSON.parse(v) : v);

/** What the runner saves as a programme moves on. */
export interface RunProgrammeProgress {
  state: ProgrammeRunState;
  currentIndex: number | null;
  stepStartedAtMs: number | null;
  results: StepResult[];
  failReason: string | null;
  watchdogArmed: string[];
}

/** A run's programme, its progress and step results, and its command log. */
export class RunProgrammesRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Records that a run follows a programme (a copy of it), with who acknowledged the cautions. */
  async create(runId: number, programmeId: number, programme: ProgrammeInput, floorVolts: number, acknowledgedBy: string): Promise<void> {
    const now = utcDateTime(new Date());
    await this.sequelize.query(
      `INSERT INTO run_programmes (runId, programmeId, programme, state, results, floorVolts, watchdogArmed, cautionsAcknowledgedBy, cautionsAcknowledgedAt, updatedAt)
       VALUES (?, ?, ?, 'starting', '[]', ?, '[]', ?, ?, ?)`,
      { replacements: [runId, programmeId, JSON.stringify(programme), floorVolts, acknowledgedBy, now, now] },
    );
  }

  /** Saves where the programme stands. */
  async save(runId: number, p: RunProgrammeProgress): Promise<void> {
    await this.sequelize.query(
      'UPDATE run_programmes SET state = ?, currentIndex = ?, stepStartedAtMs = ?, results = ?, failReason = ?, watchdogArmed = ?, updatedAt = ? WHERE runId = ?',
      { replacements: [p.state, p.currentIndex, p.stepStartedAtMs, JSON.stringify(p.results), p.failReason, JSON.stringify(p.watchdogArmed), utcDateTime(new Date()), runId] },
    );
  }

  /** A run's programme as the API shows it, or null when the run follows none. */
  async get(runId: number, nowMs: number): Promise<RunProgramme | null> {
    const [row] = await this.sequelize.query<RunProgrammeRow>('SELECT * FROM run_programmes WHERE runId = ?', { replacements: [runId], type: QueryTypes.SELECT });
    if (!row) return null;
    const programme = ProgrammeInputSchema.parse(json(row.programme));
    const results = StepResultSchema.array().parse(withCurrentKeys(json(row.results), LEGACY_RUN_TIME_KEYS));
    return {
      runId: row.runId, programmeId: row.programmeId, programme, stepLabels: planSteps(programme.steps).map((s) => s.label),
      state: row.state, currentIndex: row.currentIndex, stepStartedAtMs: row.stepStartedAtMs === null ? null : Number(row.stepStartedAtMs),
      serverNowMs: nowMs, results, roundTrips: programmeRoundTrips(results), failReason: row.failReason, floorVolts: row.floorVolts,
      watchdogArmed: json(row.watchdogArmed) as string[], cautionsAcknowledgedBy: row.cautionsAcknowledgedBy,
    };
  }

  /** Runs whose programme was running when the server stopped. */
  async unfinished(): Promise<number[]> {
    const rows = await this.sequelize.query<{ runId: number }>("SELECT runId FROM run_programmes WHERE state IN ('starting', 'running', 'paused')", { type: QueryTypes.SELECT });
    return rows.map((r) => r.runId);
  }

  /** Marks a programme failed (the server stopped under it). */
  async fail(runId: number, reason: string): Promise<void> {
    await this.sequelize.query("UPDATE run_programmes SET state = 'failed', currentIndex = NULL, stepStartedAtMs = NULL, failReason = ?, updatedAt = ? WHERE runId = ?", {
      replacements: [reason, utcDateTime(new Date()), runId],
    });
  }

  /** Appends command exchanges to a run's command log (one statement). */
  async appendCommands(runId: number, rows: readonly CommandLogRow[]): Promise<void> {
    if (rows.length === 0) return;
    const cut = (s: string | null) => (s === null ? null : s.slice(0, 500));
    await this.sequelize.query(`INSERT INTO run_command_log (runId, atMs, instrumentId, sent, reply, problem) VALUES ${rows.map(() => '(?, ?, ?, ?, ?, ?)').join(', ')}`, {
      replacements: rows.flatMap((r) => [runId, r.atMs, r.instrumentId.slice(0, 64), cut(r.sent), cut(r.reply), cut(r.problem)]),
    });
  }

  /** A run's command log, oldest first, at most `limit` rows after `afterId`. */
  async commands(runId: number, afterId: number, limit: number): Promise<Array<CommandLogRow & { id: number }>> {
    const rows = await this.sequelize.query<CommandLogRow & { id: number | string; atMs: number | string }>(
      'SELECT id, atMs, instrumentId, sent, reply, problem FROM run_command_log WHERE runId = ? AND id > ? ORDER BY id LIMIT ?',
      { replacements: [runId, afterId, limit], type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ ...r, id: Number(r.id), atMs: Number(r.atMs) }));
  }
}
