import { QueryTypes } from 'sequelize';
import { LIVE_RUN_STATES } from '../../shared/schemas/run.js';
import type { AppContext } from '../app-context.js';
import { HttpError } from '../http/http-error.js';
import '../runs/runs-services.js';

/** The run live on a bench: the recorder knows best; without it, the stored state decides. */
async function liveRunOn(ctx: AppContext, benchId: number): Promise<number | undefined> {
  const recorder = ctx.services.runRecorder;
  if (recorder) return recorder.runOnBench(benchId);
  const rows = await ctx.sequelize.query<{ id: number }>('SELECT id FROM runs WHERE benchId = ? AND state IN (?) ORDER BY id DESC LIMIT 1', {
    replacements: [benchId, LIVE_RUN_STATES],
    type: QueryTypes.SELECT,
  });
  return rows[0]?.id;
}

/** Refuses (409) to remove a bench while a run records on it: its readings would stop mid-run. */
export async function assertNoLiveRun(ctx: AppContext, benchId: number): Promise<void> {
  const runId = await liveRunOn(ctx, benchId);
  if (runId !== undefined) {
    throw new HttpError(409, `Bench ${benchId} is recording run ${runId}; stop or abort that run before deleting the bench`);
  }
}
