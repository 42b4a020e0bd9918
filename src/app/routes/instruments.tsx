import type { QueryClient } from '@tanstack/react-query';
import { useMe } from '../../features/auth/api/get-me';
import { InstrumentsPage } from '../../features/instruments/components/instruments-page';
import { instrumentsQueryOptions } from '../../lib/queries/instruments';
import { hasRole } from '../../lib/roles';

/** The lab's instruments and their calibration (admins edit; everyone signed in reads). */
export function Component() {
  const me = useMe();
  return <InstrumentsPage canEdit={hasRole(me.data?.role, 'admin')} />;
}

/** Every instrument record. */
export function prefetch(queryClient: QueryClient): void {
  void queryClient.prefetchQuery(instrumentsQueryOptions());
}
