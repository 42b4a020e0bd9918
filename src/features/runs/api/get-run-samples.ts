import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { SamplesResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';

/** A window of run time in seconds; null ends mean "from the start" / "to the end". */
export interface SampleWindow {
  from: number | null;
  to: number | null;
}

/** GET /api/runs/:id/samples reduced to about `maxPoints` min/max buckets (one per pixel). */
export const samplesQueryOptions = (runId: number, window: SampleWindow, maxPoints: number) =>
  queryOptions({
    queryKey: ['runs', runId, 'samples', window.from, window.to, maxPoints],
    queryFn: () => {
      const params = new URLSearchParams({ maxPoints: String(maxPoints) });
      if (window.from !== null) params.set('from', String(window.from));
      if (window.to !== null) params.set('to', String(window.to));
      return api(`/api/runs/${runId}/samples?${params}`, { schema: SamplesResponseSchema });
    },
  });

/** A window of a run's readings; the previous window stays on screen while the next loads. */
export function useRunSamples(runId: number, window: SampleWindow, maxPoints: number) {
  return useQuery({ ...samplesQueryOptions(runId, window, maxPoints), placeholderData: keepPreviousData });
}
