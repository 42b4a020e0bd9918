import type { QueryClient } from '@tanstack/react-query';
import type { Params } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { RunDetail } from '../../features/runs/components/run-detail';
import { runQueryOptions } from '../../lib/queries/runs';
import { hasRole } from '../../lib/roles';
import { idParam, useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';

/** One recorded run. */
export function Component() {
  const me = useMe();
  const runId = useIdParam('runId');
  if (Number.isNaN(runId)) return <NotFound />;
  return <RunDetail key={runId} runId={runId} canEdit={hasRole(me.data?.role, 'technician')} />;
}

/** The run and its summary. */
export function prefetch(queryClient: QueryClient, params: Params): void {
  const runId = idParam(params, 'runId');
  if (!Number.isNaN(runId)) void queryClient.prefetchQuery(runQueryOptions(runId));
}
