import { QueryTypes, type Sequelize } from 'sequelize';
import type { ProtectionRecordRow } from '../../shared/schemas/protection-check.js';
import type { Run } from '../../shared/schemas/run.js';
import { rowToRun } from '../runs/runs-repo.js';

/** Longest record returned: many years of weekly checks on one pack. */
const MAX_RUNS = 500;

/**
 * A pack's protection record: every protection checked across its protection-check runs,
 * latest run first (a live run with its figures so far, through `live`), each run's
 * protections in the order the run listed them.
 */
export async function protectionRecord(sequelize: Sequelize, batteryId: number, live: (run: Run) => Run): Promise<ProtectionRecordRow[]> {
  const rows = await sequelize.query<Parameters<typeof rowToRun>[0]>(
    `SELECT id, name, tags, origin, benchId, batteryId, kind, state, config, readingsCount, summary, startedAt, endedAt, createdById, createdAt, updatedAt
       FROM runs WHERE batteryId = ? AND kind = 'protection-check' ORDER BY COALESCE(startedAt, createdAt) DESC, id DESC LIMIT ?`,
    { replacements: [batteryId, MAX_RUNS], type: QueryTypes.SELECT },
  );
  return rows.map(rowToRun).map(live).flatMap((run) =>
    (run.summary?.protections ?? []).map((result) => ({
      ...result, runId: run.id, runName: run.name, runState: run.state, startedAt: run.startedAt, endedAt: run.endedAt,
    })),
  );
}
