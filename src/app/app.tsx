import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { createQueryClient } from '../lib/query-client';
import { AppProvider } from './provider';
import { createRoutes } from './routes';

// One query client for the app and its routes' prefetches.
const queryClient = createQueryClient();
const router = createBrowserRouter(createRoutes(queryClient));

/** The whole client: providers around the router. */
export function App() {
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
