import { useState } from 'react';
import { useShortcut } from '../../lib/use-shortcut';

const SHORTCUTS = [
  ['N', 'Write a note on the run (bench page)'],
  ['F', 'Full-screen room view of the bench, and back'],
  ['S', 'Silence a sounding alarm in this browser (it stays unacknowledged)'],
  ['A', 'Acknowledge a sounding alarm for everyone (recorded with your name)'],
  ['Esc', 'Leave the room view'],
  ['?', 'Show or hide this list'],
] as const;

/** "?" opens the list of keyboard shortcuts, for hands that should not hunt for a mouse. */
export function ShortcutHelp() {
  const [open, setOpen] = useState(false);
  useShortcut('?', () => setOpen((o) => !o));
  useShortcut('Escape', () => setOpen(false), open);
  if (!open) return null;
  return (
    <div role="dialog" aria-modal="true" aria-label="Keyboard shortcuts" className="fixed inset-0 z-50 flex items-center justify-center bg-black/50 p-4" onClick={() => setOpen(false)}>
      <div className="w-full max-w-md rounded-2xl border border-line bg-surface-raised p-6 shadow-xl" onClick={(e) => e.stopPropagation()}>
        <h2 className="mb-4 text-lg font-bold">Keyboard shortcuts</h2>
        <dl className="flex flex-col gap-2">
          {SHORTCUTS.map(([key, what]) => (
            <div key={key} className="flex items-center gap-4">
              <dt>
                <kbd className="num inline-flex min-w-10 justify-center rounded-md border border-line px-2 py-1 font-bold">{key}</kbd>
              </dt>
              <dd className="text-ink-muted">{what}</dd>
            </div>
          ))}
        </dl>
        <button type="button" onClick={() => setOpen(false)} className="mt-6 min-h-11 w-full rounded-lg border border-line font-semibold">
          Close
        </button>
      </div>
    </div>
  );
}
