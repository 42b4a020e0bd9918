import type { ComponentType } from 'react';
import type { RouteObject } from 'react-router-dom';
import { AppLayout } from './layouts/app-layout';
import { RequireAuth } from './require-auth';
import { SignInRoute } from './routes/sign-in';
import { Loading } from '../components/ui/status';

type Pages = typeof import('./routes/pages');

/**
 * The pages (and uPlot, react-table with them) load after sign-in, in their own chunk: the
 * sign-in page and the shell stay small for a bench PC on a slow lab network.
 */
function page(name: keyof Pages): Pick<RouteObject, 'lazy' | 'hydrateFallbackElement'> {
  return {
    lazy: async () => ({ Component: (await import('./routes/pages'))[name] as ComponentType }),
    // Shown while a page's chunk loads on the first visit (and keeps the router from warning).
    hydrateFallbackElement: <Loading />,
  };
}

/** Every route of the app; the browser router and the tests' memory router share them. */
export const routes: RouteObject[] = [
  { path: '/sign-in', element: <SignInRoute /> },
  {
    element: <RequireAuth />,
    children: [
      // The room view fills the screen: no navigation around it.
      { path: '/benches/:benchId/room', ...page('RoomRoute') },
      {
        element: <AppLayout />,
        children: [
          { path: '/', ...page('DashboardRoute') },
          { path: '/benches/new', ...page('NewBenchRoute') },
          { path: '/benches/:benchId', ...page('BenchRoute') },
          { path: '/benches/:benchId/setup', ...page('EditBenchRoute') },
          { path: '/runs', ...page('RunsRoute') },
          { path: '/runs/compare', ...page('CompareRoute') },
          { path: '/runs/:runId', ...page('RunRoute') },
          { path: '/batteries', ...page('BatteriesRoute') },
          { path: '/users', ...page('UsersRoute') },
          { path: '/settings', ...page('SettingsRoute') },
          { path: '/account', ...page('AccountRoute') },
          { path: '*', ...page('NotFoundRoute') },
        ],
      },
    ],
  },
];
