import { useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { useLiveStore } from '../../../lib/use-live';
import { refreshNotes } from './change-note';

/**
 * Follows the run's live topic while its page is open: a note added, edited or removed by
 * anyone (on this run, from any screen) shows here at once, without a reload.
 */
export function useLiveNotes(runId: number): void {
  const store = useLiveStore({ kind: 'run', id: runId });
  const queryClient = useQueryClient();
  useEffect(() => {
    const stopNotes = store.onNoteChange(() => void refreshNotes(queryClient, runId));
    const stopEvents = store.onEvent((event, live) => {
      if (live && event.type === 'annotation') void refreshNotes(queryClient, runId);
    });
    return () => {
      stopNotes();
      stopEvents();
    };
  }, [store, queryClient, runId]);
}
