import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { BatterySchema } from '../../../../shared/schemas/battery';
import { api } from '../../../lib/api-client';

/** GET /api/batteries, for linking an imported run to a pack. */
export function useBatteryChoices(enabled: boolean) {
  return useQuery({
    queryKey: ['batteries'],
    queryFn: () => api('/api/batteries', { schema: z.object({ batteries: z.array(BatterySchema) }) }).then((b) => b.batteries),
    enabled,
  });
}
