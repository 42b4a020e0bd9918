import type { RouteObject } from 'react-router-dom';
import { AppLayout } from './layouts/app-layout';
import { RequireAuth } from './require-auth';
import { AccountRoute } from './routes/account';
import {
  BatteriesRoute,
  BenchRoute,
  DashboardRoute,
  EditBenchRoute,
  NewBenchRoute,
  NotFoundRoute,
  RoomRoute,
  RunRoute,
  RunsRoute,
  SettingsRoute,
  UsersRoute,
} from './routes/pages';
import { SignInRoute } from './routes/sign-in';

/** Every route of the app; the browser router and the tests' memory router share them. */
export const routes: RouteObject[] = [
  { path: '/sign-in', element: <SignInRoute /> },
  {
    element: <RequireAuth />,
    children: [
      // The room view fills the screen: no navigation around it.
      { path: '/benches/:benchId/room', element: <RoomRoute /> },
      {
        element: <AppLayout />,
        children: [
          { path: '/', element: <DashboardRoute /> },
          { path: '/benches/new', element: <NewBenchRoute /> },
          { path: '/benches/:benchId', element: <BenchRoute /> },
          { path: '/benches/:benchId/setup', element: <EditBenchRoute /> },
          { path: '/runs', element: <RunsRoute /> },
          { path: '/runs/:runId', element: <RunRoute /> },
          { path: '/batteries', element: <BatteriesRoute /> },
          { path: '/users', element: <UsersRoute /> },
          { path: '/settings', element: <SettingsRoute /> },
          { path: '/account', element: <AccountRoute /> },
          { path: '*', element: <NotFoundRoute /> },
        ],
      },
    ],
  },
];
