import type { QueryClient } from '@tanstack/react-query';
import type { Params } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { PackPage } from '../../features/batteries/components/pack-page';
import { batteryQueryOptions } from '../../lib/queries/batteries';
import { hasRole } from '../../lib/roles';
import { formatLabTime, useLabSettings } from '../../lib/lab-settings';
import { SharePanel } from '../../features/share/components/share-panel';
import { idParam, useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';

/** One pack's page. */
export function Component() {
  const me = useMe();
  const settings = useLabSettings();
  const batteryId = useIdParam('batteryId');
  if (Number.isNaN(batteryId)) return <NotFound />;
  const viewer = { userId: me.data?.id ?? 0, canWrite: hasRole(me.data?.role, 'technician'), isAdmin: hasRole(me.data?.role, 'admin') };
  return (
    <>
      <PackPage key={batteryId} batteryId={batteryId} viewer={viewer} />
      {viewer.canWrite && (
        <div className="mt-4">
          <SharePanel key={`share-${batteryId}`} kind="battery" targetId={batteryId} formatTime={(iso) => formatLabTime(iso, settings.timeZone)} />
        </div>
      )}
    </>
  );
}

/** The pack itself (runs and inspection follow from the page). */
export function prefetch(queryClient: QueryClient, params: Params): void {
  const batteryId = idParam(params, 'batteryId');
  if (!Number.isNaN(batteryId)) void queryClient.prefetchQuery(batteryQueryOptions(batteryId));
}
