import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { BatterySchema, type BatteryInput, type BatteryPatch } from '../../../../shared/schemas/battery';
import { api } from '../../../lib/api-client';
import { batteriesQueryOptions, protectionRecordQueryOptions } from '../../../lib/queries/batteries';
import { queryKeys } from '../../../lib/queries/query-keys';

const BATTERIES_KEY = queryKeys.batteries.all;

export { batteriesQueryOptions };

/** Every registered pack. */
export function useBatteries() {
  return useQuery(batteriesQueryOptions());
}

/** One pack's protection record (every protection checked across its runs, latest first). */
export function useProtectionRecord(batteryId: number) {
  return useQuery(protectionRecordQueryOptions(batteryId));
}

/** POST /api/batteries (technician): register a pack. */
export function useCreateBattery() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: BatteryInput) =>
      api('/api/batteries', { method: 'POST', body, schema: z.object({ battery: BatterySchema }) }).then((b) => b.battery),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: BATTERIES_KEY }),
  });
}

/** PATCH /api/batteries/:id (technician): correct a pack's record. */
export function useUpdateBattery() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, patch }: { id: number; patch: BatteryPatch }) =>
      api(`/api/batteries/${id}`, { method: 'PATCH', body: patch, schema: z.object({ battery: BatterySchema }) }).then((b) => b.battery),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: BATTERIES_KEY }),
  });
}
