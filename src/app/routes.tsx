import type { QueryClient } from '@tanstack/react-query';
import type { RouteObject } from 'react-router-dom';
import { AppLayout } from './layouts/app-layout';
import { PageBoundary } from './layouts/page-boundary';
import { RouteErrorPage } from './layouts/route-error-page';
import { RequireAuth } from './require-auth';
import { SignInRoute } from './routes/sign-in';
import type { RouteModule } from './route-kit/route-module';
import { Loading } from '../components/ui/status';
import { ME_QUERY_KEY } from '../lib/session';

/**
 * A route whose page (and uPlot, react-table with it) loads on the first visit, in its own
 * chunk: the sign-in page and the shell stay small for a bench PC on a slow lab network. Its
 * loader starts the page's first queries once someone is signed in (before that they would
 * only earn a 401), and returns at once: the page shows its own loading state.
 */
function page(queryClient: QueryClient, load: () => Promise<RouteModule>): Pick<RouteObject, 'lazy' | 'hydrateFallbackElement' | 'errorElement'> {
  return {
    lazy: async () => {
      const { Component, prefetch } = await load();
      if (!prefetch) return { Component };
      return {
        Component,
        loader: ({ params }) => {
          if (queryClient.getQueryData(ME_QUERY_KEY)) prefetch(queryClient, params);
          return null;
        },
      };
    },
    // Shown while a page's chunk loads on the first visit (and keeps the router from warning).
    hydrateFallbackElement: <Loading />,
    errorElement: <RouteErrorPage />,
  };
}

/** Every route of the app; the browser router and the tests' memory router share them. */
export function createRoutes(queryClient: QueryClient): RouteObject[] {
  const at = (load: () => Promise<RouteModule>) => page(queryClient, load);
  return [
    { path: '/sign-in', element: <SignInRoute />, errorElement: <RouteErrorPage /> },
    // A shared report: no account, no navigation, nothing of the lab but what was shared.
    { path: '/s/:token', ...at(() => import('./routes/shared')) },
    {
      element: <RequireAuth />,
      errorElement: <RouteErrorPage />,
      children: [
        {
          // The room view fills the screen: no navigation around it, but the same page boundary.
          element: <PageBoundary />,
          children: [{ path: '/benches/:benchId/room', ...at(() => import('./routes/room')) }],
        },
        {
          element: <AppLayout />,
          children: [
            { path: '/', ...at(() => import('./routes/dashboard')) },
            { path: '/benches/new', ...at(() => import('./routes/new-bench')) },
            { path: '/benches/:benchId', ...at(() => import('./routes/bench')) },
            { path: '/benches/:benchId/setup', ...at(() => import('./routes/edit-bench')) },
            { path: '/runs', ...at(() => import('./routes/runs')) },
            { path: '/programmes', ...at(() => import('./routes/programmes')) },
            { path: '/runs/compare', ...at(() => import('./routes/compare')) },
            { path: '/runs/:runId', ...at(() => import('./routes/run')) },
            { path: '/batteries', ...at(() => import('./routes/batteries')) },
            { path: '/batteries/:batteryId', ...at(() => import('./routes/battery')) },
            { path: '/instruments', ...at(() => import('./routes/instruments')) },
            { path: '/users', ...at(() => import('./routes/users')) },
            { path: '/settings', ...at(() => import('./routes/settings')) },
            { path: '/alarms', ...at(() => import('./routes/alarms')) },
            { path: '/alarms/:alarmId', ...at(() => import('./routes/alarm')) },
            { path: '/account', ...at(() => import('./routes/account')) },
            { path: '*', ...at(() => import('./routes/not-found')) },
          ],
        },
      ],
    },
  ];
}
