import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { NoteHistoryResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** GET /api/runs/:id/note-history: every edit and removal of the run's notes. */
export const noteHistoryQueryOptions = (runId: number) => ({
  queryKey: queryKeys.runs.noteHistory(runId),
  queryFn: () => api(`/api/runs/${runId}/note-history`, { schema: NoteHistoryResponseSchema }).then((b) => b.revisions),
});

/** Fetches the run's timeline and note history again (after a change here or by another viewer). */
export function refreshNotes(queryClient: QueryClient, runId: number): Promise<unknown> {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: queryKeys.runs.events(runId) }),
    queryClient.invalidateQueries({ queryKey: queryKeys.runs.noteHistory(runId) }),
  ]);
}

/** PATCH (new text) or DELETE (text null) /api/runs/:id/events/:eventId: the note's author or an admin. */
export function useChangeNote(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ eventId, text }: { eventId: number; text: string | null }) =>
      text === null
        ? api(`/api/runs/${runId}/events/${eventId}`, { method: 'DELETE' })
        : api(`/api/runs/${runId}/events/${eventId}`, { method: 'PATCH', body: { text } }),
    onSuccess: () => refreshNotes(queryClient, runId),
  });
}
