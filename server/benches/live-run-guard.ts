import type { AppContext } from '../app-context.js';
import { ConflictError } from '../domain/domain-errors.js';
import { RunsRepo } from '../runs/runs-repo.js';
import '../runs/runs-services.js';

/** The run live on a bench: the recorder knows best; without it, the runs repository's stored state decides. */
async function liveRunOn(ctx: AppContext, benchId: number): Promise<number | undefined> {
  const recorder = ctx.services.runRecorder;
  if (recorder) return recorder.runOnBench(benchId);
  return new RunsRepo(ctx.sequelize).liveRunIdOnBench(benchId);
}

/** Refuses (a ConflictError) to remove a bench while a run records on it: its readings would stop mid-run. */
export async function assertNoLiveRun(ctx: AppContext, benchId: number): Promise<void> {
  const runId = await liveRunOn(ctx, benchId);
  if (runId !== undefined) {
    throw new ConflictError(`Bench ${benchId} is recording run ${runId}; stop or abort that run before deleting the bench`);
  }
}
