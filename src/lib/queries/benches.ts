import { queryOptions } from '@tanstack/react-query';
import { BenchListResponseSchema, BenchResponseSchema } from '../../../shared/schemas/bench';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

/** GET /api/benches: every bench with its source status. */
export const benchesQueryOptions = () =>
  queryOptions({
    queryKey: queryKeys.benches.list(),
    queryFn: () => api('/api/benches', { schema: BenchListResponseSchema }).then((b) => b.benches),
  });

/** GET /api/benches/:id: one bench and its source status (live page, setup form, a run's report). */
export const benchQueryOptions = (benchId: number | null) =>
  queryOptions({
    queryKey: queryKeys.benches.detail(benchId),
    queryFn: () => api(`/api/benches/${benchId}`, { schema: BenchResponseSchema }).then((b) => b.bench),
    enabled: benchId !== null,
  });
