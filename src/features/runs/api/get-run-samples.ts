import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { samplesQueryOptions, type SampleWindow } from '../../../lib/queries/runs';

export { samplesQueryOptions, type SampleWindow };

/** A window of a run's readings; the previous window stays on screen while the next loads. */
export function useRunSamples(runId: number, window: SampleWindow, maxPoints: number) {
  return useQuery({ ...samplesQueryOptions(runId, window, maxPoints), placeholderData: keepPreviousData });
}
