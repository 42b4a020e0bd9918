import { useQuery } from '@tanstack/react-query';
import { RunEventsResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';
import { runQueryOptions } from '../../../lib/queries/runs';

export { runQueryOptions };

/** One run with its summary. */
export function useRun(runId: number) {
  return useQuery(runQueryOptions(runId));
}

/** GET /api/runs/:id/events: the stored timeline. */
export const runEventsQueryOptions = (runId: number) => ({
  queryKey: queryKeys.runs.events(runId),
  queryFn: () => api(`/api/runs/${runId}/events`, { schema: RunEventsResponseSchema }).then((b) => b.events),
});

/** The run's stored timeline. */
export function useRunEvents(runId: number) {
  return useQuery(runEventsQueryOptions(runId));
}
