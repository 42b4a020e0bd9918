import { queryOptions, useQuery } from '@tanstack/react-query';
import { RunResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';

/** GET /api/runs/:id (the live page uses it when opened by run id). */
export const liveRunQueryOptions = (runId: number) =>
  queryOptions({
    queryKey: ['runs', runId],
    queryFn: () => api(`/api/runs/${runId}`, { schema: RunResponseSchema }).then((b) => b.run),
  });

/** One run's metadata. */
export function useLiveRun(runId: number) {
  return useQuery(liveRunQueryOptions(runId));
}
