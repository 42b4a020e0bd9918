import { useMutation, useQueryClient } from '@tanstack/react-query';
import { RunResponseSchema, type StartRunRequest } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** POST /api/runs: arm a run on a bench (technician). */
export function startRun(body: StartRunRequest) {
  return api('/api/runs', { method: 'POST', body, schema: RunResponseSchema }).then((b) => b.run);
}

/** Mutation for the start-run form. */
export function useStartRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: startRun, onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.all }) });
}
