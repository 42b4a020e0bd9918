import type { AnnotationEvent } from '../../shared/schemas/run-event.js';
import type { Role } from '../../shared/schemas/user.js';
import { ConflictError, ForbiddenError, notFound } from '../domain/domain-errors.js';
import type { NoteChangeRecord, NotesRepo } from './notes-repo.js';

/** Who asks for a change. */
export interface NoteEditor {
  id: number;
  name: string;
  role: Role;
}

/** Hears every applied change (the recorder updates a live run and tells its viewers). */
export type NoteChangeListener = (change: NoteChangeRecord) => void;

/**
 * Edits (`text`) or removes (`text` null) a note on a run. Only notes change, and only by
 * their author or an admin; the text before the change is kept in the run's note history.
 */
export async function changeNote(
  repo: NotesRepo,
  runId: number,
  eventId: number,
  text: string | null,
  editor: NoteEditor,
  onChanged: NoteChangeListener,
): Promise<NoteChangeRecord> {
  const stored = await repo.find(runId, eventId);
  if (!stored) throw notFound(`Event ${eventId} of run ${runId}`);
  if (stored.event.type !== 'annotation') throw new ConflictError('Only notes can be changed; the detector’s events are the record');
  if (editor.role !== 'admin' && stored.createdById !== editor.id) throw new ForbiddenError('Only the note’s author or a lab manager may change it');
  const previous: AnnotationEvent = stored.event;
  const next: AnnotationEvent | null = text === null ? null : { ...previous, text };
  const change: NoteChangeRecord = { runId, eventId, previous, next, changedById: editor.id, changedByName: editor.name };
  await repo.apply(change);
  onChanged(change);
  return change;
}
