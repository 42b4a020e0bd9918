import { useRef, useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { useShortcut } from '../../../lib/use-shortcut';
import { useAnnotate } from '../api/annotate';

const MAX_NOTE_CHARS = 2000;

/** A technician's note on the run, stamped at the latest reading. N focuses it from anywhere. */
export function AnnotationBox({ runId }: { runId: number }) {
  const [text, setText] = useState('');
  const inputRef = useRef<HTMLTextAreaElement>(null);
  const annotate = useAnnotate();
  useShortcut('n', () => inputRef.current?.focus());

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const note = text.trim();
    if (!note) return;
    // Saved: leave the box, so the next key press is a shortcut again (F, A), not more note.
    annotate.mutate({ runId, text: note }, { onSuccess: () => { setText(''); inputRef.current?.blur(); } });
  };

  return (
    <form onSubmit={submit} className="flex flex-col gap-2" aria-label="Add a note">
      <label htmlFor="run-note" className="text-sm font-medium text-ink-muted">
        Note on this run <kbd className="num rounded border border-line px-1 text-xs">N</kbd>
      </label>
      <textarea
        id="run-note"
        ref={inputRef}
        value={text}
        maxLength={MAX_NOTE_CHARS}
        onChange={(e) => setText(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === 'Enter' && !e.shiftKey) submit(e);
          if (e.key === 'Escape') inputRef.current?.blur();
        }}
        rows={2}
        placeholder="Fan on, ambient 22 °C, pack warm at the negative terminal…"
        className="w-full rounded-lg border border-line bg-surface-sunken p-3 text-base text-ink placeholder:text-ink-faint focus:border-accent focus:outline-none"
      />
      {annotate.isError && (
        <p role="alert" className="text-sm text-state-cutoff">
          {annotate.error instanceof Error ? annotate.error.message : 'The note was not saved.'}
        </p>
      )}
      <Button type="submit" disabled={annotate.isPending || !text.trim()}>
        Add note
      </Button>
    </form>
  );
}
