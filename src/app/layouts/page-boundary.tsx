import { Outlet, useLocation } from 'react-router-dom';
import { RouteErrorBoundary } from './route-error-boundary';

/**
 * The current page inside an error boundary keyed by the address: an error shown on one page
 * is gone once the person navigates elsewhere (a boundary that outlives its page would keep it).
 */
export function PageBoundary() {
  const location = useLocation();
  return (
    <RouteErrorBoundary key={location.pathname}>
      <Outlet />
    </RouteErrorBoundary>
  );
}
