import { useQuery } from '@tanstack/react-query';
import { runQueryOptions } from '../../../lib/queries/runs';

/** GET /api/runs/:id (the live page uses it when opened by run id). */
export const liveRunQueryOptions = runQueryOptions;

/** One run's metadata. */
export function useLiveRun(runId: number) {
  return useQuery(runQueryOptions(runId));
}
