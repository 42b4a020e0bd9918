import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** POST /api/runs/:id/events: a technician's note at the latest reading (or at `t`). */
export function annotate({ runId, text, t }: { runId: number; text: string; t?: number }) {
  return api(`/api/runs/${runId}/events`, { method: 'POST', body: t === undefined ? { text } : { text, t } });
}

/** Mutation for the annotation box; the note comes back to every viewer over the socket. */
export function useAnnotate() {
  return useMutation({ mutationFn: annotate });
}
