import { queryOptions } from '@tanstack/react-query';
import { RunResponseSchema, ReadingsResponseSchema, type ReadingsAxis } from '../../../shared/schemas/api-runs';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

/** The readings' x axis: run seconds, delivered Ah or delivered Wh (the window is in its unit). */
export type ReadingAxis = ReadingsAxis;

/** A window of run time in seconds; null ends mean "from the start" / "to the end". */
export interface ReadingWindow {
  from: number | null;
  to: number | null;
}

/** The address of GET /api/runs/:id/readings for a window reduced to about `maxPoints` buckets. */
export function runReadingsPath(runId: number, window: ReadingWindow, maxPoints: number, x: ReadingAxis = 'elapsedSeconds'): string {
  const params = new URLSearchParams({ maxPoints: String(maxPoints) });
  if (x !== 'elapsedSeconds') params.set('x', x);
  if (window.from !== null) params.set('from', String(window.from));
  if (window.to !== null) params.set('to', String(window.to));
  return `/api/runs/${runId}/readings?${params}`;
}

/** Fetches a window of a run's readings (min/max buckets when reduced). */
export function fetchRunReadings(runId: number, window: ReadingWindow, maxPoints: number, signal?: AbortSignal, x: ReadingAxis = 'elapsedSeconds') {
  return api(runReadingsPath(runId, window, maxPoints, x), { schema: ReadingsResponseSchema, signal });
}

/** GET /api/runs/:id/readings reduced to about `maxPoints` min/max buckets (one per pixel). */
export const readingsQueryOptions = (runId: number, window: ReadingWindow, maxPoints: number, x: ReadingAxis = 'elapsedSeconds') =>
  queryOptions({
    queryKey: x === 'elapsedSeconds' ? queryKeys.runs.readings(runId, window.from, window.to, maxPoints) : [...queryKeys.runs.readings(runId, window.from, window.to, maxPoints), x],
    queryFn: () => fetchRunReadings(runId, window, maxPoints, undefined, x),
  });

/** GET /api/runs/:id: one run with its summary (the live page and the run page). */
export const runQueryOptions = (runId: number) =>
  queryOptions({
    queryKey: queryKeys.runs.detail(runId),
    queryFn: () => api(`/api/runs/${runId}`, { schema: RunResponseSchema }).then((b) => b.run),
  });
