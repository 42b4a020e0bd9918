import { queryOptions, useQuery } from '@tanstack/react-query';
import { RunEventsResponseSchema, RunResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';

/** GET /api/runs/:id */
export const runQueryOptions = (runId: number) =>
  queryOptions({
    queryKey: ['runs', runId],
    queryFn: () => api(`/api/runs/${runId}`, { schema: RunResponseSchema }).then((b) => b.run),
  });

/** One run with its summary. */
export function useRun(runId: number) {
  return useQuery(runQueryOptions(runId));
}

/** GET /api/runs/:id/events: the stored timeline. */
export function useRunEvents(runId: number) {
  return useQuery({
    queryKey: ['runs', runId, 'events'],
    queryFn: () => api(`/api/runs/${runId}/events`, { schema: RunEventsResponseSchema }).then((b) => b.events),
  });
}
