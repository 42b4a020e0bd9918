import type { QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { BenchesOverview } from '../../features/benches/components/benches-overview';
import { CalibrationFlag } from '../../components/calibration/calibration-flag';
import { GatewaysPanel } from '../../features/gateways/components/gateways-panel';
import { PageHeader } from '../../components/ui/card';
import { benchesQueryOptions } from '../../lib/queries/benches';
import { hasRole } from '../../lib/roles';

/** Dashboard: every bench live. */
export function Component() {
  const me = useMe();
  const isAdmin = hasRole(me.data?.role, 'admin');
  return (
    <>
      <PageHeader
        title="Benches"
        subtitle="Live status of every bench in the lab."
        actions={isAdmin ? <Link to="/benches/new" className="inline-flex min-h-11 items-center rounded-lg bg-accent px-4 text-sm font-semibold text-accent-ink">New bench</Link> : undefined}
      />
      <CalibrationFlag />
      <BenchesOverview canManage={hasRole(me.data?.role, 'admin')} />
      <div className="mt-6">
        <GatewaysPanel canManage={isAdmin} />
      </div>
    </>
  );
}

/** The bench list. */
export function prefetch(queryClient: QueryClient): void {
  void queryClient.prefetchQuery(benchesQueryOptions());
}
