import type { QueryClient } from '@tanstack/react-query';
import type { Params } from 'react-router-dom';
import { CalibrationFlag } from '../../components/calibration/calibration-flag';
import { useMe } from '../../features/auth/api/get-me';
import { BenchLivePage } from '../../features/live/components/bench-live-page';
import { benchQueryOptions } from '../../lib/queries/benches';
import { hasRole } from '../../lib/roles';
import { idParam, useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';
import { RunProgrammePanel } from '../../features/programmes/components/run-programme-panel';

/** One bench, live. */
export function Component() {
  const me = useMe();
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  const canAct = hasRole(me.data?.role, 'technician');
  return (
    <>
      <CalibrationFlag benchId={benchId} />
      <BenchLivePage
        key={benchId}
        benchId={benchId}
        canAct={canAct}
        canSetUp={hasRole(me.data?.role, 'admin')}
        runExtras={(runId, live) => <RunProgrammePanel key={runId} runId={runId} canAct={canAct} live={live} />}
      />
    </>
  );
}

/** The bench and its source status. */
export function prefetch(queryClient: QueryClient, params: Params): void {
  const benchId = idParam(params, 'benchId');
  if (!Number.isNaN(benchId)) void queryClient.prefetchQuery(benchQueryOptions(benchId));
}
