import type { Sequelize } from 'sequelize';
import { LIVE_RUN_STATES, type Run } from '../../shared/schemas/run.js';
import { RunsRepo } from './runs-repo.js';

/** Why a run cannot be linked to a pack. */
export class RunLinkError extends Error {
  constructor(readonly reason: 'no-run' | 'live', message: string) {
    super(message);
    this.name = 'RunLinkError';
  }
}

/**
 * Files a recorded or imported run under a pack after the fact. A live run keeps its pack
 * (the recorder holds its ratings); the stored summary keeps the figures it was judged with.
 */
export async function linkRunToBattery(sequelize: Sequelize, runId: number, batteryId: number): Promise<Run> {
  const repo = new RunsRepo(sequelize);
  const run = await repo.get(runId);
  if (!run) throw new RunLinkError('no-run', `Run ${runId} not found`);
  if (LIVE_RUN_STATES.includes(run.state)) throw new RunLinkError('live', `Run ${runId} is still ${run.state}; link it once it has ended`);
  await sequelize.query('UPDATE runs SET batteryId = ?, updatedAt = NOW(3) WHERE id = ?', { replacements: [batteryId, runId] });
  return (await repo.get(runId))!;
}
