import type { AppContext } from '../app-context.js';
import type { SnapshotSource } from '../live/live-hub.js';
import type { RunRecorder } from '../runs/run-recorder.js';
import type { RunsRepo } from '../runs/runs-repo.js';
import '../benches/bench-services.js';

/**
 * What the live hub shows a new subscriber: a bench's status from the bench manager, a run
 * as the recorder holds it while it records, else as the database has it.
 */
export function liveSnapshotSource(ctx: AppContext, recorder: RunRecorder, repo: RunsRepo): SnapshotSource {
  return {
    benchStatus: (id) => ctx.services.benchManager?.getStatus(id) ?? null,
    benchRun: (benchId) => {
      const runId = recorder.runOnBench(benchId);
      const s = runId === undefined ? undefined : recorder.session(runId);
      return s ? recorder.liveView(s) : null;
    },
    run: async (id) => {
      const s = recorder.session(id);
      if (s) return { run: recorder.liveView(s), events: s.events };
      const run = await repo.get(id);
      return run ? { run, events: (await repo.events(id)).map((e) => e.event) } : null;
    },
  };
}
