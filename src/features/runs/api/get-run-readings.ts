import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { readingsQueryOptions, type ReadingWindow, type ReadingAxis } from '../../../lib/queries/runs';

export { readingsQueryOptions, type ReadingWindow, type ReadingAxis };

/** A window of a run's readings; the previous window stays on screen while the next loads. */
export function useRunReadings(runId: number, window: ReadingWindow, maxPoints: number) {
  return useQuery({ ...readingsQueryOptions(runId, window, maxPoints), placeholderData: keepPreviousData });
}
