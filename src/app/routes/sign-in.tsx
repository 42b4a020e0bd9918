import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { SignInForm } from '../../features/auth/components/sign-in-form';
import { Logo } from '../../components/ui/logo';
import { ThemeToggle } from '../../components/ui/theme-toggle';

/** Only same-app paths are followed after sign-in, never another site. */
function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/';
}

/** The sign-in page. */
export function SignInRoute() {
  const me = useMe();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  if (me.data) return <Navigate to={next} replace />;

  return (
    <main className="flex min-h-screen items-center justify-center p-4">
      <div className="w-full max-w-md">
        <div className="mb-8 flex items-center justify-between">
          <div className="flex items-center gap-3">
            <Logo className="h-12 w-12" />
            <div>
              <p className="text-2xl font-bold tracking-tight">Kneepoint</p>
              <p className="text-sm text-ink-muted">Battery bench, logged and judged</p>
            </div>
          </div>
          <ThemeToggle />
        </div>
        <div className="rounded-2xl border border-line bg-surface-raised p-6 shadow-xl shadow-black/10">
          <h1 className="mb-4 text-xl font-bold">Sign in</h1>
          <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
        </div>
      </div>
    </main>
  );
}
