import { useEffect } from 'react';
import { fetchRunReadings } from '../../../lib/queries/runs';
import type { LiveStore } from '../../../lib/live-store';

/** Buckets of history fetched for the live chart (two rows each: min and max). */
const BACKFILL_MAX_POINTS = 2_000;

/**
 * After every snapshot (first open, reconnect) fetch the run's archived readings before the
 * snapshot from GET /api/runs/:id/readings and put them in front of the live rows.
 */
export function useHistoryBackfill(store: LiveStore, runId: number): void {
  useEffect(() => {
    let cancelled = false;
    const controller = new AbortController();
    const stop = store.onSnapshot((firstT) => {
      fetchRunReadings(runId, { from: null, to: firstT }, BACKFILL_MAX_POINTS, controller.signal)
        .then((history) => {
          if (!cancelled) store.backfill(history);
        })
        .catch(() => undefined); // The live stream goes on; only the older part of the curve is missing.
    });
    return () => {
      cancelled = true;
      controller.abort();
      stop();
    };
  }, [store, runId]);
}
