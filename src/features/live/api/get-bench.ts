import { useQuery } from '@tanstack/react-query';
import { benchQueryOptions } from '../../../lib/queries/benches';

export { benchQueryOptions };

/** One bench and its source status. */
export function useBench(benchId: number) {
  return useQuery(benchQueryOptions(benchId));
}
