import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { SignoffHistoryResponseSchema } from '../../../../shared/schemas/signoff';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/**
 * GET /api/runs/:id/signoffs: where the run stands and every mark and sign-off. Asked again
 * whenever the page's copy of the run or its events changes (a rename, a note), since such a
 * change can supersede the sign-off.
 */
export function useSignoffs(runId: number) {
  const client = useQueryClient();
  useEffect(
    () =>
      client.getQueryCache().subscribe((event) => {
        if (event.type !== 'updated' || event.action.type !== 'success') return;
        const key = event.query.queryKey;
        const runOrEvents = key[0] === 'runs' && key[1] === runId && (key.length === 2 || key[2] === 'events');
        if (runOrEvents) void client.invalidateQueries({ queryKey: queryKeys.runs.signoffs(runId) });
      }),
    [client, runId],
  );
  return useQuery({
    queryKey: queryKeys.runs.signoffs(runId),
    queryFn: () => api(`/api/runs/${runId}/signoffs`, { schema: SignoffHistoryResponseSchema }),
  });
}

/** POST ready (technician) or a sign-off (admin); the answer is the new history. */
export function useReviewStep(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (step: { action: 'ready'; comment: string } | { action: 'sign'; comment: string; contentHash: string }) =>
      step.action === 'ready'
        ? api(`/api/runs/${runId}/signoffs/ready`, { method: 'POST', body: { comment: step.comment }, schema: SignoffHistoryResponseSchema })
        : api(`/api/runs/${runId}/signoffs`, { method: 'POST', body: { comment: step.comment, contentHash: step.contentHash }, schema: SignoffHistoryResponseSchema }),
    onSuccess: (history) => queryClient.setQueryData(queryKeys.runs.signoffs(runId), history),
  });
}
