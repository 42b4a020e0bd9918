import { useState } from 'react';
import { Loading, QueryError } from '../../../components/ui/status';
import { useCommandLog } from '../api/run-programme';

/** Every command the server sent to the run's instruments and what came back, loaded when opened. */
export function CommandLog({ runId }: { runId: number }) {
  const [open, setOpen] = useState(false);
  const log = useCommandLog(runId, open);
  return (
    <details onToggle={(e) => setOpen(e.currentTarget.open)} className="text-sm">
      <summary className="min-h-11 cursor-pointer py-2 font-semibold">Command log</summary>
      {!open ? null : log.isPending ? (
        <Loading label="Loading the command log…" />
      ) : log.isError ? (
        <QueryError error={log.error} what="The command log" />
      ) : log.data.length === 0 ? (
        <p className="text-ink-muted">No commands yet.</p>
      ) : (
        <ol aria-label="Command log" className="num max-h-80 overflow-y-auto">
          {log.data.map((c) => (
            <li key={c.id} className={c.problem ? 'text-state-cutoff' : ''}>
              {new Date(c.atMs).toISOString().slice(11, 23)} {c.instrumentId} → {c.sent}
              {c.reply !== null ? ` ← ${c.reply}` : ''}
              {c.problem ? ` (${c.problem})` : ''}
            </li>
          ))}
        </ol>
      )}
    </details>
  );
}
