import { NavLink, useNavigate } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { useLogout } from '../../features/auth/api/logout';
import { Logo } from '../../components/ui/logo';
import { ThemeToggle } from '../../components/ui/theme-toggle';
import { ShortcutHelp } from '../../components/ui/shortcut-help';
import { navItemsFor } from '../nav-items';
import { PageBoundary } from './page-boundary';

const ROLE_LABEL = { admin: 'Lab manager', technician: 'Technician', viewer: 'Viewer' } as const;

/** The signed-in frame: navigation for the user's role on the left, the page on the right. */
export function AppLayout() {
  const me = useMe();
  const logout = useLogout();
  const navigate = useNavigate();
  const user = me.data;
  const items = navItemsFor(user?.role);

  const signOut = () => logout.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) });

  return (
    <div className="flex min-h-screen flex-col md:flex-row">
      <aside className="flex shrink-0 flex-wrap items-center gap-2 border-b border-line bg-surface-sunken p-3 md:w-60 md:flex-col md:flex-nowrap md:items-stretch md:gap-4 md:border-r md:border-b-0 md:p-4 print:hidden">
        <div className="flex items-center gap-3">
          <Logo />
          <span className="text-lg font-bold tracking-tight">Kneepoint</span>
        </div>
        <nav aria-label="Main" className="order-last flex w-full flex-row gap-1 overflow-x-auto md:order-none md:w-auto md:flex-col">
          {items.map((item) => (
            <NavLink
              key={item.to}
              to={item.to}
              end={item.to === '/'}
              className={({ isActive }) =>
                `flex min-h-11 shrink-0 items-center rounded-lg px-3 text-base font-medium ${
                  isActive ? 'bg-accent text-accent-ink' : 'text-ink-muted hover:bg-surface-raised hover:text-ink'
                }`
              }
            >
              {item.label}
            </NavLink>
          ))}
        </nav>
        <div className="ml-auto flex items-center gap-2 md:mt-auto md:ml-0 md:flex-col md:items-stretch md:border-t md:border-line md:pt-4">
          {user && (
            <div className="hidden text-sm md:block">
              <p className="font-semibold text-ink" data-testid="current-user">
                {user.name}
              </p>
              <p className="text-ink-faint">{ROLE_LABEL[user.role]}</p>
              <p className="mt-1 text-xs text-ink-faint">
                Shortcuts: <kbd className="num rounded border border-line px-1">?</kbd>
              </p>
            </div>
          )}
          <div className="flex gap-2">
            <ThemeToggle />
            <button
              type="button"
              onClick={signOut}
              className="min-h-11 flex-1 rounded-lg border border-line px-3 text-sm font-medium text-ink-muted hover:text-ink"
            >
              Sign out
            </button>
          </div>
        </div>
      </aside>
      <ShortcutHelp />
      <main className="min-w-0 flex-1 p-4 md:p-8 print:p-0">
        <PageBoundary />
      </main>
    </div>
  );
}
