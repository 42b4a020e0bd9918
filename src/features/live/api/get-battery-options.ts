import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { BatterySchema } from '../../../../shared/schemas/battery';
import { api } from '../../../lib/api-client';

/** GET /api/batteries, for the start-run form's pack picker. */
export function useBatteryOptions(enabled: boolean) {
  return useQuery({
    queryKey: ['batteries'],
    queryFn: () => api('/api/batteries', { schema: z.object({ batteries: z.array(BatterySchema) }) }).then((b) => b.batteries),
    enabled,
  });
}
