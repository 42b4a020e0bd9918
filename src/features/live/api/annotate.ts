import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** POST /api/runs/:id/events: a technician's note at the latest reading (or at run time `elapsedSeconds`). */
export function annotate({ runId, text, elapsedSeconds }: { runId: number; text: string; elapsedSeconds?: number }) {
  return api(`/api/runs/${runId}/events`, { method: 'POST', body: elapsedSeconds === undefined ? { text } : { text, elapsedSeconds } });
}

/** Mutation for the annotation box; the note comes back to every viewer over the socket. */
export function useAnnotate() {
  return useMutation({ mutationFn: annotate });
}
