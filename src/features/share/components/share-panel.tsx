import { useState, type FormEvent } from 'react';
import { SHARE_DEFAULT_DAYS, SHARE_MAIL_MESSAGE_MAX_CHARS, SHARE_MAX_DAYS, type ShareTargetKind } from '../../../../shared/schemas/share';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { TextField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { ApiError } from '../../../lib/api-client';
import { useCreateShareLink, useEmailShareLink, useRevokeShareLink, useShareLinkMails, useShareLinks } from '../api/share-links';

const MAIL_STATE: Record<'pending' | 'sent' | 'failed', string> = { pending: 'waiting to go out', sent: 'sent', failed: 'could not be sent' };

/** The e-mails of one link: to whom and whether each went out (nothing when there are none). */
function LinkMails({ linkId, formatTime }: { linkId: number; formatTime: (iso: string) => string }) {
  const mails = useShareLinkMails(linkId);
  if (!mails.data || mails.data.length === 0) return null;
  return (
    <ul className="w-full text-ink-muted" aria-label="E-mails of this link">
      {mails.data.map((m) => (
        <li key={m.id}>
          E-mailed to {m.toAddress} {formatTime(m.createdAt)}: {MAIL_STATE[m.status]}
          {m.status !== 'sent' && m.lastError ? ` (${m.lastError})` : ''}
        </li>
      ))}
    </ul>
  );
}

/** The link just made: its address and the token that lets it be e-mailed (shown once). */
interface MadeLink {
  url: string;
  linkId: number;
  token: string;
}

/**
 * Sends the link just made to a client's address with a short note: the server queues the mail
 * (it goes out within seconds, and later if the mail server is away) and checks the address.
 */
function EmailLinkForm({ made }: { made: MadeLink }) {
  const send = useEmailShareLink();
  const [to, setTo] = useState('');
  const [message, setMessage] = useState('');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    send.mutate({ linkId: made.linkId, token: made.token, to: to.trim(), message: message.trim() || undefined });
  };
  const fieldError = send.error instanceof ApiError ? send.error.fields.to : undefined;
  return (
    <form onSubmit={submit} aria-label="Send the link by e-mail" className="mt-3 flex flex-col gap-3">
      <TextField label="Client's e-mail address" type="email" autoComplete="off" maxLength={254} value={to} onChange={(e) => setTo(e.target.value)} error={fieldError} required />
      <div className="flex flex-col gap-1">
        <label htmlFor="share-mail-message" className="text-sm font-medium text-ink-muted">
          Message (optional)
        </label>
        <textarea
          id="share-mail-message" rows={3} maxLength={SHARE_MAIL_MESSAGE_MAX_CHARS} value={message} onChange={(e) => setMessage(e.target.value)}
          className="w-full rounded-lg border border-line bg-surface-sunken px-3 py-2 text-base text-ink focus:border-accent focus:outline-none"
        />
      </div>
      <div>
        <Button type="submit" variant="secondary" disabled={send.isPending}>
          Send by e-mail
        </Button>
      </div>
      {send.isError && !fieldError && (
        <p role="alert" className="text-sm text-state-cutoff">
          {send.error.message}
        </p>
      )}
      {send.isSuccess && <p className="text-sm">Queued: the e-mail to {send.variables.to} goes out within seconds.</p>}
    </form>
  );
}

/**
 * Links that let a client read this run's or pack's report without an account: choose how long
 * the link lives and whether prices show, copy it once (the server keeps only its hash) or
 * e-mail it to the client, revoke it.
 */
export function SharePanel({ kind, targetId, formatTime }: { kind: ShareTargetKind; targetId: number; formatTime: (iso: string) => string }) {
  const links = useShareLinks(kind, targetId);
  const create = useCreateShareLink(kind, targetId);
  const revoke = useRevokeShareLink(kind, targetId);
  const [days, setDays] = useState(String(SHARE_DEFAULT_DAYS));
  const [includePrices, setIncludePrices] = useState(false);
  const [recipient, setRecipient] = useState('');
  const [made, setMade] = useState<MadeLink | null>(null);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate(
      { expiresInDays: Number(days), includePrices, recipient: recipient.trim() || undefined },
      { onSuccess: (answer) => setMade({ url: `${window.location.origin}${answer.path}`, linkId: answer.link.id, token: answer.token }) },
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
      {made && (
        <div className="rounded-lg border border-line p-3 text-sm">
          <div role="status">
            <p className="font-medium">Copy this link now, or send it by e-mail: it is shown only once.</p>
            <p className="num mt-1 break-all" data-testid="share-url">
              {made.url}
            </p>
          </div>
          <EmailLinkForm key={made.linkId} made={made} />
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
              <LinkMails linkId={link.id} formatTime={formatTime} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
