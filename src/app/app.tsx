import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { AppProvider } from './provider';
import { routes } from './routes';

const router = createBrowserRouter(routes);

/** The whole client: providers around the router. */
export function App() {
  return (
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
