import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { formatElapsedClock } from '../../../lib/units';
import { useAddRunNote } from '../api/add-note';

const MAX_NOTE_CHARS = 2000;
const CLOCK = /^(\d+):([0-5]\d):([0-5]\d)$/;

/** "01:02:03" → seconds, or undefined for an empty field, or NaN when malformed. */
export function parseRunClock(text: string): number | undefined {
  const trimmed = text.trim();
  if (!trimmed) return undefined;
  const m = CLOCK.exec(trimmed);
  return m ? Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]) : Number.NaN;
}

/** Why a note's time cannot be used (malformed, or after the run ended), or null when it can. */
export function noteTimeProblem(t: number | undefined, durationSeconds: number | null): string | null {
  if (t === undefined) return null;
  if (Number.isNaN(t)) return 'Give the time as h:mm:ss, e.g. 1:05:00, or leave it empty for the end of the run.';
  if (durationSeconds !== null && t > durationSeconds) return `The run lasted ${formatElapsedClock(durationSeconds)}: give a time within it, or leave it empty for the end.`;
  return null;
}

/** A note on a finished run: what the pack looked like opened, a photo's file name, a doubt. */
export function RunNoteForm({ runId, durationSeconds = null }: { runId: number; durationSeconds?: number | null }) {
  const add = useAddRunNote(runId);
  const [text, setText] = useState('');
  const [at, setAt] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const t = parseRunClock(at);
    if (!text.trim()) return setError('Write the note first.');
    const problem = noteTimeProblem(t, durationSeconds);
    if (problem) return setError(problem);
    setError(null);
    add.mutate({ text: text.trim(), elapsedSeconds: t }, { onSuccess: () => { setText(''); setAt(''); } });
  };
  const message = error ?? (add.error instanceof Error ? add.error.message : null);
  return (
    <form onSubmit={submit} aria-label="Add a note to this run" className="grid gap-3 md:grid-cols-[3fr_1fr_auto] md:items-end print:hidden">
      <TextField label="Note" value={text} maxLength={MAX_NOTE_CHARS} onChange={(e) => setText(e.target.value)} placeholder="Opened: cell 3 swollen, BMS balance leads intact" />
      <TextField label="At run time (h:mm:ss)" value={at} onChange={(e) => setAt(e.target.value)} placeholder="end of run" />
      <Button type="submit" disabled={add.isPending}>
        Add note
      </Button>
      {message && (
        <p role="alert" className="text-sm text-state-cutoff md:col-span-3">
          {message}
        </p>
      )}
    </form>
  );
}
