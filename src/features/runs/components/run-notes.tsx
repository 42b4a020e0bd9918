import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { StoredRunEvent } from '../../../../shared/schemas/api-runs';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { formatLabTime, useLabSettings } from '../../../lib/lab-settings';
import type { Role } from '../../../lib/roles';
import { formatElapsedClock } from '../../../lib/units';
import { noteHistoryQueryOptions, useChangeNote } from '../api/change-note';

const MAX_NOTE_CHARS = 2000;

/** Who is looking: a note changes only for its author or an admin (the server says the same). */
export interface NoteViewer {
  id: number;
  role: Role;
}

function mayChange(note: StoredRunEvent, viewer: NoteViewer | null): boolean {
  return viewer !== null && (viewer.role === 'admin' || (viewer.role === 'technician' && note.createdBy === viewer.id));
}

/** One note with, for its author or an admin, Edit and Remove. */
function NoteRow({ runId, note, editable }: { runId: number; note: StoredRunEvent; editable: boolean }) {
  const change = useChangeNote(runId);
  const [draft, setDraft] = useState<string | null>(null);
  if (note.event.type !== 'annotation') return null;
  const event = note.event;
  const remove = () => {
    if (window.confirm('Remove this note? The run keeps what it said in its note history.')) change.mutate({ eventId: note.id, text: null });
  };
  return (
    <li className="flex flex-col gap-2 border-l-4 border-line py-1 pl-3 text-sm">
      <span className="flex flex-wrap items-baseline gap-2">
        <span className="num text-ink-muted">{formatElapsedClock(event.elapsedSeconds)}</span>
        {draft === null && <span className="text-ink">{event.text}</span>}
        {event.author && <span className="text-ink-muted">— {event.author}</span>}
      </span>
      {draft !== null ? (
        <form
          aria-label="Edit the note"
          className="flex flex-col gap-2 md:flex-row md:items-end"
          onSubmit={(e) => {
            e.preventDefault();
            if (draft.trim()) change.mutate({ eventId: note.id, text: draft.trim() }, { onSuccess: () => setDraft(null) });
          }}
        >
          <div className="flex-1">
            <TextField label="Note" value={draft} maxLength={MAX_NOTE_CHARS} onChange={(e) => setDraft(e.target.value)} />
          </div>
          <Button type="submit" disabled={change.isPending || !draft.trim()}>
            Save note
          </Button>
          <Button variant="secondary" onClick={() => setDraft(null)}>
            Cancel
          </Button>
        </form>
      ) : (
        editable && (
          <span className="flex gap-2 print:hidden">
            <Button variant="secondary" onClick={() => setDraft(event.text)} aria-label={`Edit note: ${event.text}`}>
              Edit
            </Button>
            <Button variant="secondary" onClick={remove} aria-label={`Remove note: ${event.text}`}>
              Remove
            </Button>
          </span>
        )
      )}
      {change.error instanceof Error && (
        <p role="alert" className="text-state-cutoff">
          {change.error.message}
        </p>
      )}
    </li>
  );
}

/** The run's notes (editable by their author or an admin) and the history of every change to them. */
export function RunNotes({ runId, events, viewer }: { runId: number; events: readonly StoredRunEvent[]; viewer: NoteViewer | null }) {
  const settings = useLabSettings();
  const history = useQuery(noteHistoryQueryOptions(runId));
  const notes = events.filter((e) => e.event.type === 'annotation');
  const revisions = history.data ?? [];
  return (
    <section aria-label="Notes" className="flex flex-col gap-3">
      <h3 className="font-semibold">Notes</h3>
      {notes.length === 0 ? (
        <p className="text-sm text-ink-muted">No notes on this run.</p>
      ) : (
        <ul className="flex flex-col gap-2">
          {notes.map((n) => (
            <NoteRow key={n.id} runId={runId} note={n} editable={mayChange(n, viewer)} />
          ))}
        </ul>
      )}
      {revisions.length > 0 && (
        <details className="text-sm">
          <summary className="inline-flex min-h-11 cursor-pointer items-center font-semibold">Note history ({revisions.length} changes)</summary>
          <ol aria-label="Note history" className="mt-2 flex flex-col gap-1">
            {revisions.map((r) => (
              <li key={r.id} className="text-ink-muted">
                <span className="num">{formatLabTime(r.changedAt, settings.timeZone)}</span> · {r.changedByName}{' '}
                {r.action === 'edited' ? 'edited' : 'removed'} the note at <span className="num">{formatElapsedClock(r.elapsedSeconds)}</span>: “{r.previousText}”
                {r.newText !== null && <> → “{r.newText}”</>}
              </li>
            ))}
          </ol>
        </details>
      )}
    </section>
  );
}
