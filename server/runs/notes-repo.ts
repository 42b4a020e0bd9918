import { QueryTypes, type Sequelize } from 'sequelize';
import type { NoteRevision } from '../../shared/schemas/api-runs.js';
import type { AnnotationEvent, RunEvent } from '../../shared/schemas/run-event.js';
import { parseStoredRunEvent } from './stored-run-event.js';

/** A stored event with its author, as a note change needs it. */
export interface StoredEventRow {
  id: number;
  runId: number;
  event: RunEvent;
  createdById: number | null;
}

/** What one change to a note records. */
export interface NoteChangeRecord {
  runId: number;
  eventId: number;
  previous: AnnotationEvent;
  next: AnnotationEvent | null;
  changedById: number;
  changedByName: string;
}

/** Notes on runs: change or remove one, keeping every change in run_note_revisions. */
export class NotesRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** One stored event of a run, or null. */
  async find(runId: number, eventId: number): Promise<StoredEventRow | null> {
    const rows = await this.sequelize.query<{ id: number; runId: number; data: string; createdById: number | null }>(
      'SELECT id, runId, data, createdById FROM run_events WHERE id = ? AND runId = ?',
      { replacements: [eventId, runId], type: QueryTypes.SELECT },
    );
    const row = rows[0];
    return row ? { id: row.id, runId: row.runId, event: parseStoredRunEvent(row.data), createdById: row.createdById } : null;
  }

  /** Writes the change (new text, or removal) and its revision in one transaction. */
  async apply(change: NoteChangeRecord): Promise<void> {
    await this.sequelize.transaction(async (transaction) => {
      await this.sequelize.query(
        `INSERT INTO run_note_revisions (runId, eventId, action, previousText, newText, elapsedSeconds, changedById, changedByName, changedAt)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, NOW(3))`,
        {
          replacements: [change.runId, change.eventId, change.next ? 'edited' : 'removed', change.previous.text, change.next?.text ?? null, change.previous.elapsedSeconds, change.changedById, change.changedByName],
          type: QueryTypes.INSERT,
          transaction,
        },
      );
      if (change.next) {
        await this.sequelize.query('UPDATE run_events SET data = ? WHERE id = ?', { replacements: [JSON.stringify(change.next), change.eventId], transaction });
      } else {
        await this.sequelize.query('DELETE FROM run_events WHERE id = ?', { replacements: [change.eventId], transaction });
      }
    });
  }

  /** Every change to the run's notes, oldest first. */
  async revisions(runId: number): Promise<NoteRevision[]> {
    const rows = await this.sequelize.query<{
      id: number; runId: number; eventId: number; action: string; elapsedSeconds: number; previousText: string; newText: string | null;
      changedById: number | null; changedByName: string; changedAt: Date | string;
    }>('SELECT * FROM run_note_revisions WHERE runId = ? ORDER BY id', { replacements: [runId], type: QueryTypes.SELECT });
    return rows.map((r) => ({
      id: r.id, runId: r.runId, eventId: r.eventId, action: r.action === 'removed' ? 'removed' : 'edited', elapsedSeconds: r.elapsedSeconds,
      previousText: r.previousText, newText: r.newText, changedBy: r.changedById, changedByName: r.changedByName,
      changedAt: new Date(r.changedAt).toISOString(),
    }));
  }
}
