import type { ReactNode } from 'react';
import { ApiError } from '../../lib/api-client';

/** Says plainly that a page's server side has not landed yet, instead of failing silently. */
export function NotAvailable({ what, detail }: { what: string; detail?: ReactNode }) {
  return (
    <div role="status" className="rounded-xl border border-dashed border-line bg-surface-sunken p-8 text-center">
      <p className="text-lg font-semibold text-ink">{what} is not available yet</p>
      <p className="mt-2 text-sm text-ink-muted">
        {detail ?? 'This part of Kneepoint is still being built on the server. It will appear here once it lands.'}
      </p>
    </div>
  );
}

/** A quiet loading line. */
export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <p role="status" className="p-4 text-ink-muted">
      {label}
    </p>
  );
}

const HTTP_NOT_FOUND = 404;

/** Shows a failed query: "not available yet" for a route that does not exist, the message otherwise. */
export function QueryError({ error, what }: { error: unknown; what: string }) {
  if (error instanceof ApiError && error.status === HTTP_NOT_FOUND) return <NotAvailable what={what} />;
  const message = error instanceof Error ? error.message : 'Something went wrong.';
  return (
    <div role="alert" className="rounded-xl border border-state-cutoff/60 bg-state-cutoff/10 p-4 text-ink">
      <p className="font-semibold">Could not load {what.toLowerCase()}</p>
      <p className="text-sm text-ink-muted">{message}</p>
    </div>
  );
}
