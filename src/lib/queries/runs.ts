import { queryOptions } from '@tanstack/react-query';
import { RunResponseSchema, SamplesResponseSchema } from '../../../shared/schemas/api-runs';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

/** The samples' x axis: run seconds, delivered Ah or delivered Wh (the window is in its unit). */
export type SampleAxis = 't' | 'ah' | 'wh';

/** A window of run time in seconds; null ends mean "from the start" / "to the end". */
export interface SampleWindow {
  from: number | null;
  to: number | null;
}

/** The address of GET /api/runs/:id/samples for a window reduced to about `maxPoints` buckets. */
export function runSamplesPath(runId: number, window: SampleWindow, maxPoints: number, x: SampleAxis = 't'): string {
  const params = new URLSearchParams({ maxPoints: String(maxPoints) });
  if (x !== 't') params.set('x', x);
  if (window.from !== null) params.set('from', String(window.from));
  if (window.to !== null) params.set('to', String(window.to));
  return `/api/runs/${runId}/samples?${params}`;
}

/** Fetches a window of a run's readings (min/max buckets when reduced). */
export function fetchRunSamples(runId: number, window: SampleWindow, maxPoints: number, signal?: AbortSignal, x: SampleAxis = 't') {
  return api(runSamplesPath(runId, window, maxPoints, x), { schema: SamplesResponseSchema, signal });
}

/** GET /api/runs/:id/samples reduced to about `maxPoints` min/max buckets (one per pixel). */
export const samplesQueryOptions = (runId: number, window: SampleWindow, maxPoints: number, x: SampleAxis = 't') =>
  queryOptions({
    queryKey: x === 't' ? queryKeys.runs.samples(runId, window.from, window.to, maxPoints) : [...queryKeys.runs.samples(runId, window.from, window.to, maxPoints), x],
    queryFn: () => fetchRunSamples(runId, window, maxPoints, undefined, x),
  });

/** GET /api/runs/:id: one run with its summary (the live page and the run page). */
export const runQueryOptions = (runId: number) =>
  queryOptions({
    queryKey: queryKeys.runs.detail(runId),
    queryFn: () => api(`/api/runs/${runId}`, { schema: RunResponseSchema }).then((b) => b.run),
  });
