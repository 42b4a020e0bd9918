import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { BenchResponseSchema } from '../../../../shared/schemas/bench';
import { BatterySchema } from '../../../../shared/schemas/battery';
import { api } from '../../../lib/api-client';

/** GET /api/batteries/:id: the pack a run tested, for the report. */
export function useRunBattery(batteryId: number | null) {
  return useQuery({
    queryKey: ['batteries', batteryId],
    queryFn: () => api(`/api/batteries/${batteryId}`, { schema: z.object({ battery: BatterySchema }) }).then((b) => b.battery),
    enabled: batteryId !== null,
  });
}

/** GET /api/benches/:id: where the run was recorded. */
export function useRunBench(benchId: number | null) {
  return useQuery({
    queryKey: ['benches', benchId],
    queryFn: () => api(`/api/benches/${benchId}`, { schema: BenchResponseSchema }).then((b) => b.bench),
    enabled: benchId !== null,
  });
}
