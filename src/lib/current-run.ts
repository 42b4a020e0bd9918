import { useQuery } from '@tanstack/react-query';
import { ListRunsResponseSchema } from '../../shared/schemas/api-runs';
import { LIVE_RUN_STATES, type Run } from '../../shared/schemas/run';
import { api } from './api-client';

/** How often a bench asks whether a run was started on it from another screen. */
const CURRENT_RUN_POLL_MS = 5_000;

/** True while the server is still recording or watching the run. */
export function isLiveRun(run: Run | null | undefined): run is Run {
  return !!run && LIVE_RUN_STATES.includes(run.state);
}

/**
 * The newest run on a bench (GET /api/runs?benchId=…&limit=1, newest first), polled at a low
 * rate. Its state then arrives live on the run's own topic.
 */
export function useLatestBenchRun(benchId: number) {
  return useQuery({
    queryKey: ['runs', 'latest-on-bench', benchId],
    queryFn: () =>
      api(`/api/runs?benchId=${benchId}&limit=1`, { schema: ListRunsResponseSchema }).then((b) => b.runs[0] ?? null),
    refetchInterval: CURRENT_RUN_POLL_MS,
  });
}
