import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { samplesQueryOptions, type SampleWindow, type SampleAxis } from '../../../lib/queries/runs';

export { samplesQueryOptions, type SampleWindow, type SampleAxis };

/** A window of a run's readings; the previous window stays on screen while the next loads. */
export function useRunSamples(runId: number, window: SampleWindow, maxPoints: number) {
  return useQuery({ ...samplesQueryOptions(runId, window, maxPoints), placeholderData: keepPreviousData });
}
