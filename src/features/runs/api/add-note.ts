import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** POST /api/runs/:id/events: a note on a recorded run (technicians), e.g. after opening the pack. */
export function useAddRunNote(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ text, t }: { text: string; t?: number }) =>
      api(`/api/runs/${runId}/events`, { method: 'POST', body: t === undefined ? { text } : { text, t } }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.events(runId) }),
  });
}
