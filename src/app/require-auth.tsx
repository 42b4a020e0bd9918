import type { ReactNode } from 'react';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { useMe } from '../features/auth/api/get-me';
import { Loading, QueryError } from '../components/ui/status';
import { hasRole, type Role } from '../lib/roles';

/** Sends signed-out visitors to sign-in, remembering where they wanted to go. */
export function RequireAuth() {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <Loading label="Checking your session…" />;
  if (me.isError) return <QueryError error={me.error} what="Your session" />;
  if (!me.data) {
    const next = encodeURIComponent(location.pathname + location.search);
    return <Navigate to={`/sign-in?next=${next}`} replace />;
  }
  return <Outlet />;
}

/** Shows its children only to `min` or above; others get a plain "not for your role" page. */
export function RequireRole({ min, children }: { min: Role; children: ReactNode }) {
  const me = useMe();
  if (!hasRole(me.data?.role, min)) {
    return (
      <div role="alert" className="rounded-xl border border-line bg-surface-raised p-8">
        <h1 className="text-xl font-bold">Not available for your role</h1>
        <p className="mt-2 text-ink-muted">This page needs the {min} role. Ask your lab manager if you need it.</p>
      </div>
    );
  }
  return <>{children}</>;
}
