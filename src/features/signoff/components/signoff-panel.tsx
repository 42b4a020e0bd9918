import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { TextField } from '../../../components/ui/field';
import { SignoffBlockView } from '../../../components/ui/signoff-block';
import { Loading, QueryError } from '../../../components/ui/status';
import { hasRole, type Role } from '../../../lib/roles';
import { useReviewStep, useSignoffs } from '../api/signoffs';

const ACTION_TEXT = { ready: 'Marked ready for review', signed: 'Signed off' } as const;

/**
 * The run's review: its sign-off block, the step the person's role allows (a technician marks
 * the run ready, an admin signs it with a comment) and every earlier mark and sign-off.
 */
export function SignoffPanel({ runId, role, formatTime }: { runId: number; role: Role | undefined; formatTime: (iso: string) => string }) {
  const history = useSignoffs(runId);
  const step = useReviewStep(runId);
  const [comment, setComment] = useState('');
  if (history.isPending) return <Loading label="Loading sign-offs…" />;
  if (history.isError) return <QueryError error={history.error} what="The sign-offs" />;
  const h = history.data;
  const signed = h.entries.find((e) => e.action === 'signed' && e.state === 'current') ?? null;
  const canMark = hasRole(role, 'technician') && (h.status === 'none' || h.status === 'superseded');
  const canSign = hasRole(role, 'admin') && h.status === 'ready';
  const submit = (e: FormEvent) => {
    e.preventDefault();
    step.mutate(canSign ? { action: 'sign', comment, contentHash: h.currentHash } : { action: 'ready', comment }, { onSuccess: () => setComment('') });
  };
  return (
    <Card className="flex flex-col gap-4">
      <SignoffBlockView block={{ status: h.status, signed }} formatTime={formatTime} />
      {(canMark || canSign) && (
        <form onSubmit={submit} aria-label={canSign ? 'Sign off this run' : 'Mark this run ready for review'} className="flex flex-col gap-3 print:hidden">
          <TextField
            label={canSign ? 'Sign-off comment' : 'Comment for the reviewer (optional)'}
            value={comment}
            maxLength={2000}
            required={canSign}
            onChange={(e) => setComment(e.target.value)}
          />
          <div>
            <Button type="submit" disabled={step.isPending || (canSign && comment.trim() === '')}>
              {canSign ? 'Sign off' : 'Mark ready for review'}
            </Button>
          </div>
          {step.isError && (
            <p role="alert" className="text-sm text-state-cutoff">
              {step.error.message}
            </p>
          )}
        </form>
      )}
      <div>
        <h3 className="font-semibold">Review history</h3>
        {h.entries.length === 0 ? (
          <p className="text-sm text-ink-muted">No marks or sign-offs yet.</p>
        ) : (
          <ol className="mt-2 flex flex-col gap-2 text-sm" aria-label="Review history">
            {h.entries.map((e) => (
              <li key={e.id} className="rounded-lg border border-line p-3">
                <p>
                  <strong>{ACTION_TEXT[e.action]}</strong> by {e.byName} ({e.byRole}) · {formatTime(e.at)} ·{' '}
                  <span className={e.state === 'current' ? 'font-semibold' : 'text-ink-muted'}>{e.state === 'current' ? 'current' : 'superseded'}</span>
                </p>
                {e.comment && <p className="mt-1 whitespace-pre-wrap">{e.comment}</p>}
              </li>
            ))}
          </ol>
        )}
      </div>
    </Card>
  );
}
