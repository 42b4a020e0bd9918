import { useState, type FormEvent } from 'react';
import { SHARE_DEFAULT_DAYS, SHARE_MAX_DAYS, type ShareTargetKind } from '../../../../shared/schemas/share';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { TextField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { useCreateShareLink, useRevokeShareLink, useShareLinks } from '../api/share-links';

/**
 * Links that let a client read this run's or pack's report without an account: choose how long
 * the link lives and whether prices show, copy it once (the server keeps only its hash), revoke it.
 */
export function SharePanel({ kind, targetId, formatTime }: { kind: ShareTargetKind; targetId: number; formatTime: (iso: string) => string }) {
  const links = useShareLinks(kind, targetId);
  const create = useCreateShareLink(kind, targetId);
  const revoke = useRevokeShareLink(kind, targetId);
  const [days, setDays] = useState(String(SHARE_DEFAULT_DAYS));
  const [includePrices, setIncludePrices] = useState(false);
  const [recipient, setRecipient] = useState('');
  const [madeUrl, setMadeUrl] = useState<string | null>(null);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate(
      { expiresInDays: Number(days), includePrices, recipient: recipient.trim() || undefined },
      { onSuccess: (made) => setMadeUrl(`${window.location.origin}${made.path}`) },
    );
  };
  return (
    <Card className="flex flex-col gap-4 print:hidden">
      <h2 className="font-semibold">Share with a client</h2>
      <form onSubmit={submit} aria-label="Make a share link" className="grid gap-3 md:grid-cols-[1fr_2fr_auto] md:items-end">
        <TextField label="Days the link works" type="number" min={1} max={SHARE_MAX_DAYS} value={days} onChange={(e) => setDays(e.target.value)} required />
        <TextField label="For (a reminder, not shown to them)" value={recipient} maxLength={200} onChange={(e) => setRecipient(e.target.value)} />
        <Button type="submit" disabled={create.isPending}>
          Make link
        </Button>
        <label className="flex min-h-11 items-center gap-2 text-sm md:col-span-3">
          <input type="checkbox" className="h-5 w-5" checked={includePrices} onChange={(e) => setIncludePrices(e.target.checked)} />
          Show the price and the cost per kWh
        </label>
      </form>
      {create.isError && (
        <p role="alert" className="text-sm text-state-cutoff">
          {create.error.message}
        </p>
      )}
      {madeUrl && (
        <div className="rounded-lg border border-line p-3 text-sm" role="status">
          <p className="font-medium">Copy this link now: it is shown only once.</p>
          <p className="num mt-1 break-all" data-testid="share-url">
            {madeUrl}
          </p>
        </div>
      )}
      {links.isPending ? (
        <Loading label="Loading links…" />
      ) : links.isError ? (
        <QueryError error={links.error} what="The share links" />
      ) : links.data.length === 0 ? (
        <p className="text-sm text-ink-muted">No links made yet.</p>
      ) : (
        <ul className="flex flex-col gap-2 text-sm" aria-label="Share links">
          {links.data.map((link) => (
            <li key={link.id} className="flex flex-wrap items-center justify-between gap-2 rounded-lg border border-line p-3">
              <span>
                {link.recipient ? `For ${link.recipient} · ` : ''}made by {link.createdByName} {formatTime(link.createdAt)} ·{' '}
                {link.state === 'active' ? `works until ${formatTime(link.expiresAt)}` : link.state} · opened {link.openings}×{link.includePrices ? ' · with prices' : ''}
              </span>
              {link.state === 'active' && (
                <Button variant="secondary" onClick={() => revoke.mutate(link.id)} disabled={revoke.isPending}>
                  Revoke
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
