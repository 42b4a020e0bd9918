import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  BenchResponseSchema,
  SerialPortListResponseSchema,
  type CreateBenchRequest,
  type UpdateBenchRequest,
} from '../../../../shared/schemas/bench';
import { api } from '../../../lib/api-client';
import { benchQueryOptions } from '../../../lib/queries/benches';
import { queryKeys } from '../../../lib/queries/query-keys';

const BENCHES_KEY = queryKeys.benches.all;

/** GET /api/benches/:id for the edit form. */
export function useBenchForEdit(benchId: number | null) {
  return useQuery(benchQueryOptions(benchId));
}

/** POST /api/benches or PATCH /api/benches/:id (admin). */
export function useSaveBench(benchId: number | null) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateBenchRequest | UpdateBenchRequest) =>
      api(benchId === null ? '/api/benches' : `/api/benches/${benchId}`, {
        method: benchId === null ? 'POST' : 'PATCH',
        body,
        schema: BenchResponseSchema,
      }).then((b) => b.bench),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: BENCHES_KEY }),
  });
}

/** DELETE /api/benches/:id (admin). */
export function useDeleteBench() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (benchId: number) => api(`/api/benches/${benchId}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: BENCHES_KEY }),
  });
}

/** POST /api/benches/:id/restart (admin): reopen the source now instead of waiting for back-off. */
export function useRestartBench() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (benchId: number) => api(`/api/benches/${benchId}/restart`, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: BENCHES_KEY }),
  });
}

/** GET /api/benches/ports (admin): serial ports the server can see. */
export function useSerialPorts(enabled: boolean) {
  return useQuery({
    queryKey: queryKeys.benches.serialPorts(),
    queryFn: () => api('/api/benches/ports', { schema: SerialPortListResponseSchema }),
    enabled,
  });
}
