import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { ListRunsResponseSchema, RunResponseSchema } from '../../../../shared/schemas/api-runs';
import {
  InspectionItemSchema,
  InspectionResponseSchema,
  type InspectionEntryInput,
  type InspectionRating,
} from '../../../../shared/schemas/inspection';
import { ProtectionRecordResponseSchema } from '../../../../shared/schemas/protection-check';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** Most runs one pack page lists (a pack tested weekly for ten years stays under this). */
export const PACK_RUNS_LIMIT = 500;

/** GET /api/runs?batteryId=: every run of one pack, newest first. */
export const packRunsQueryOptions = (batteryId: number) => {
  const filter = { batteryId, limit: PACK_RUNS_LIMIT };
  return queryOptions({
    queryKey: queryKeys.runs.list(filter),
    queryFn: () => api(`/api/runs?batteryId=${batteryId}&limit=${PACK_RUNS_LIMIT}`, { schema: ListRunsResponseSchema }),
  });
};

/** GET /api/runs?limit=: the latest runs of every pack, to pick one to file under a pack. */
export const recentRunsQueryOptions = () => {
  const filter = { limit: PACK_RUNS_LIMIT };
  return queryOptions({
    queryKey: queryKeys.runs.list(filter),
    queryFn: () => api(`/api/runs?limit=${PACK_RUNS_LIMIT}`, { schema: ListRunsResponseSchema }),
  });
};

/** GET /api/batteries/:id/inspection: the checklist as rated for this pack, with photos. */
export const inspectionQueryOptions = (batteryId: number) =>
  queryOptions({
    queryKey: queryKeys.batteries.inspection(batteryId),
    queryFn: () => api(`/api/batteries/${batteryId}/inspection`, { schema: InspectionResponseSchema }),
  });

/** GET /api/batteries/:id/protections: every protection checked on the pack, latest run first. */
export const protectionRecordQueryOptions = (batteryId: number) =>
  queryOptions({
    queryKey: queryKeys.batteries.protections(batteryId),
    queryFn: () => api(`/api/batteries/${batteryId}/protections`, { schema: ProtectionRecordResponseSchema }),
  });

/** GET /api/inspection-items: the lab's checklist, retired items included. */
export const inspectionItemsQueryOptions = () =>
  queryOptions({
    queryKey: queryKeys.inspectionItems,
    queryFn: () => api('/api/inspection-items', { schema: z.object({ items: z.array(InspectionItemSchema) }) }).then((b) => b.items),
  });

/** Every run of the pack. */
export function usePackRuns(batteryId: number) {
  return useQuery(packRunsQueryOptions(batteryId));
}

/** The latest runs of every pack (technicians pick one to link). */
export function useRecentRuns(enabled: boolean) {
  return useQuery({ ...recentRunsQueryOptions(), enabled });
}

/** The pack's teardown inspection. */
export function useInspection(batteryId: number) {
  return useQuery(inspectionQueryOptions(batteryId));
}

/** The lab's checklist (admin editor). */
export function useInspectionItems() {
  return useQuery(inspectionItemsQueryOptions());
}

/** PUT /api/batteries/:id/inspection/:itemId (technician): rate one item. */
export function useRateItem(batteryId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ itemId, ...body }: InspectionEntryInput & { itemId: number; rating: InspectionRating | null }) =>
      api(`/api/batteries/${batteryId}/inspection/${itemId}`, { method: 'PUT', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.batteries.inspection(batteryId) }),
  });
}

/** PUT /api/batteries/:id/runs/:runId (technician): file an ended run under this pack. */
export function useLinkRun(batteryId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (runId: number) => api(`/api/batteries/${batteryId}/runs/${runId}`, { method: 'PUT', schema: RunResponseSchema }).then((b) => b.run),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.all }),
  });
}

/** DELETE /api/photos/:id (the author or an admin). */
export function useDeletePhoto(batteryId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (photoId: number) => api(`/api/photos/${photoId}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.batteries.inspection(batteryId) }),
  });
}

/** POST and PATCH /api/inspection-items (admin): add, rename, move, retire or restore an item. */
export function useEditChecklist() {
  const queryClient = useQueryClient();
  const refresh = () => Promise.all([
    queryClient.invalidateQueries({ queryKey: queryKeys.inspectionItems }),
    queryClient.invalidateQueries({ queryKey: queryKeys.batteries.all }),
  ]);
  const add = useMutation({
    mutationFn: (title: string) => api('/api/inspection-items', { method: 'POST', body: { title } }),
    onSuccess: refresh,
  });
  const patch = useMutation({
    mutationFn: ({ id, ...change }: { id: number; title?: string; position?: number; archived?: boolean }) =>
      api(`/api/inspection-items/${id}`, { method: 'PATCH', body: change }),
    onSuccess: refresh,
  });
  return { add, patch };
}
