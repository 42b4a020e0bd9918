import type { QueryClient } from '@tanstack/react-query';
import { useMe } from '../../features/auth/api/get-me';
import { BatteriesPage } from '../../features/batteries/components/batteries-page';
import { batteriesQueryOptions } from '../../lib/queries/batteries';
import { hasRole } from '../../lib/roles';

/** Battery packs. */
export function Component() {
  const me = useMe();
  return <BatteriesPage canWrite={hasRole(me.data?.role, 'technician')} />;
}

/** Every registered pack. */
export function prefetch(queryClient: QueryClient): void {
  void queryClient.prefetchQuery(batteriesQueryOptions());
}
