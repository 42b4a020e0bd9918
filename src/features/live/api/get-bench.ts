import { queryOptions, useQuery } from '@tanstack/react-query';
import { BenchResponseSchema } from '../../../../shared/schemas/bench';
import { api } from '../../../lib/api-client';

/** GET /api/benches/:id: the bench and its source status. */
export const benchQueryOptions = (benchId: number) =>
  queryOptions({
    queryKey: ['benches', benchId],
    queryFn: () => api(`/api/benches/${benchId}`, { schema: BenchResponseSchema }).then((b) => b.bench),
  });

/** One bench. */
export function useBench(benchId: number) {
  return useQuery(benchQueryOptions(benchId));
}
