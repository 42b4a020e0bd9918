import { queryOptions, useQuery } from '@tanstack/react-query';
import { BenchListResponseSchema } from '../../../../shared/schemas/bench';
import { api } from '../../../lib/api-client';

/** GET /api/benches: every bench with its source status. */
export const benchesQueryOptions = () =>
  queryOptions({
    queryKey: ['benches'],
    queryFn: () => api('/api/benches', { schema: BenchListResponseSchema }).then((b) => b.benches),
  });

/** The lab's benches. */
export function useBenches() {
  return useQuery(benchesQueryOptions());
}
