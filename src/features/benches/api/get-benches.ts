import { useQuery } from '@tanstack/react-query';
import { benchesQueryOptions } from '../../../lib/queries/benches';

export { benchesQueryOptions };

/** The lab's benches. */
export function useBenches() {
  return useQuery(benchesQueryOptions());
}
