import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { ListRunsResponseSchema } from '../../../../shared/schemas/api-runs';
import type { RunState } from '../../../../shared/schemas/run';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

export interface RunsFilter {
  q?: string;
  state?: RunState;
  tag?: string;
  batteryId?: number;
  limit: number;
  offset: number;
}

function toSearch(filter: RunsFilter): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(filter)) if (value !== undefined && value !== '') params.set(key, String(value));
  return params.toString();
}

/** GET /api/runs with search and filters done on the server. */
export const runsQueryOptions = (filter: RunsFilter) =>
  queryOptions({
    queryKey: queryKeys.runs.list(filter),
    queryFn: () => api(`/api/runs?${toSearch(filter)}`, { schema: ListRunsResponseSchema }),
    placeholderData: keepPreviousData,
  });

/** A page of runs. */
export function useRuns(filter: RunsFilter) {
  return useQuery(runsQueryOptions(filter));
}
