import { useQuery } from '@tanstack/react-query';
import { batteryQueryOptions } from '../../../lib/queries/batteries';
import { benchQueryOptions } from '../../../lib/queries/benches';

/** GET /api/batteries/:id: the pack a run tested, for the report. */
export function useRunBattery(batteryId: number | null) {
  return useQuery(batteryQueryOptions(batteryId));
}

/** GET /api/benches/:id: where the run was recorded. */
export function useRunBench(benchId: number | null) {
  return useQuery(benchQueryOptions(benchId));
}
