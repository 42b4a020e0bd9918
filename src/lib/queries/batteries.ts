import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { BatterySchema } from '../../../shared/schemas/battery';
import { ProtectionRecordResponseSchema } from '../../../shared/schemas/protection-check';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

const BatteryListSchema = z.object({ batteries: z.array(BatterySchema) });
const BatteryOneSchema = z.object({ battery: BatterySchema });

/** GET /api/batteries: every registered pack (the packs page, the start form, the importer). */
export const batteriesQueryOptions = () =>
  queryOptions({
    queryKey: queryKeys.batteries.list(),
    queryFn: () => api('/api/batteries', { schema: BatteryListSchema }).then((b) => b.batteries),
  });

/** GET /api/batteries/:id: one pack (a run's report names the pack it tested). */
export const batteryQueryOptions = (batteryId: number | null) =>
  queryOptions({
    queryKey: queryKeys.batteries.detail(batteryId),
    queryFn: () => api(`/api/batteries/${batteryId}`, { schema: BatteryOneSchema }).then((b) => b.battery),
    enabled: batteryId !== null,
  });

/** GET /api/batteries/:id/protections: the pack's protection record, latest run first (packs page, pack page, reports). */
export const protectionRecordQueryOptions = (batteryId: number) =>
  queryOptions({
    queryKey: queryKeys.batteries.protections(batteryId),
    queryFn: () => api(`/api/batteries/${batteryId}/protections`, { schema: ProtectionRecordResponseSchema }),
  });
