import { useQuery } from '@tanstack/react-query';
import { batteriesQueryOptions } from '../../../lib/queries/batteries';

/** GET /api/batteries, for the start-run form's pack picker. */
export function useBatteryOptions(enabled: boolean) {
  return useQuery({ ...batteriesQueryOptions(), enabled });
}
