import { useMutation, useQueryClient } from '@tanstack/react-query';
import { RunResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** POST /api/runs/:id/stop: finish the run, or abort it. */
export function stopRun({ runId, abort }: { runId: number; abort: boolean }) {
  return api(`/api/runs/${runId}/stop`, { method: 'POST', body: { abort }, schema: RunResponseSchema }).then((b) => b.run);
}

/** Mutation for the stop and abort buttons. */
export function useStopRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: stopRun, onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.all }) });
}
