import type { Logger } from '../app-context.js';
import type { RunRecorder } from '../runs/run-recorder.js';
import type { RunsRepo } from '../runs/runs-repo.js';
import type { ReadingJournal, RecoveredRun } from './reading-journal.js';

/**
 * At start, after the recorder resumed its live runs from the archive: hands each live
 * run the journalled readings the archive does not hold yet, and deletes the journals of
 * runs the archive holds in full. A journal with readings of a run that is no longer live
 * and not archived is kept and logged for a person (it cannot be replayed into a closed run).
 */
export async function replayJournal(recovered: readonly RecoveredRun[], journal: ReadingJournal, recorder: RunRecorder, repo: RunsRepo, log: Logger): Promise<void> {
  for (const { runId, records } of recovered) {
    const session = recorder.session(runId);
    if (session) {
      const archived = session.readingsCount;
      journal.archived(runId, archived);
      const replayed = recorder.replay(runId, records.map((r) => ({ index: r.i, frame: r.f, arrivalSeconds: r.a })));
      if (replayed > 0) log.info(`run ${runId}: ${replayed} journalled readings replayed after the ${archived} archived`);
      continue;
    }
    const run = await repo.get(runId);
    const last = records[records.length - 1]?.i ?? -1;
    if (!run || last < run.readingsCount) await journal.discard(runId);
    else log.warn(`journal: run ${runId} is ${run.state} with ${last + 1 - run.readingsCount} readings only in its journal; kept for a person to look at`);
  }
}
