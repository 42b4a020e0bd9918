import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** POST /api/runs/:id/events: a note on a recorded run (technicians), e.g. after opening the pack. */
export function useAddRunNote(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ text, elapsedSeconds }: { text: string; elapsedSeconds?: number }) =>
      api(`/api/runs/${runId}/events`, { method: 'POST', body: elapsedSeconds === undefined ? { text } : { text, elapsedSeconds } }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.events(runId) }),
  });
}
