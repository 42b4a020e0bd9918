import { useQuery } from '@tanstack/react-query';
import { batteriesQueryOptions } from '../../../lib/queries/batteries';

/** GET /api/batteries, for linking an imported run to a pack. */
export function useBatteryChoices(enabled: boolean) {
  return useQuery({ ...batteriesQueryOptions(), enabled });
}
