import { useMutation, useQueryClient } from '@tanstack/react-query';
import { RunResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** PATCH /api/runs/:id (technician): rename or retag a run. */
export function usePatchRun(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (patch: { name?: string; tags?: string[] }) =>
      api(`/api/runs/${runId}`, { method: 'PATCH', body: patch, schema: RunResponseSchema }).then((b) => b.run),
    onSuccess: (run) => {
      queryClient.setQueryData(queryKeys.runs.detail(runId), run);
      return queryClient.invalidateQueries({ queryKey: queryKeys.runs.lists() });
    },
  });
}
