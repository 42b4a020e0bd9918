import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';

/**
 * The router's error element: a page whose code failed to load (a lost network on a bench PC,
 * a new build deployed meanwhile) or whose loader threw. The rest of the app stays usable.
 */
export function RouteErrorPage() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error instanceof Error ? error.message : 'Something went wrong.';
  return (
    <main className="p-4 md:p-8">
      <div role="alert" className="rounded-xl border border-state-cutoff/60 bg-state-cutoff/10 p-6">
        <h1 className="text-lg font-bold">This page could not open</h1>
        <p className="mt-2 text-sm text-ink-muted">{message}</p>
        <div className="mt-4 flex flex-wrap gap-2">
          <button type="button" className="min-h-11 rounded-lg border border-line px-4" onClick={() => window.location.reload()}>
            Reload
          </button>
          <Link to="/" className="inline-flex min-h-11 items-center rounded-lg border border-line px-4">
            Go to the benches
          </Link>
        </div>
      </div>
    </main>
  );
}
