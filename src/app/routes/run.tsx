import { useQuery, type QueryClient } from '@tanstack/react-query';
import type { Params } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { RunDetail } from '../../features/runs/components/run-detail';
import { runQueryOptions } from '../../lib/queries/runs';
import { formatLabTime, useLabSettings } from '../../lib/lab-settings';
import { SignoffPanel } from '../../features/signoff/components/signoff-panel';
import { SharePanel } from '../../features/share/components/share-panel';
import { hasRole } from '../../lib/roles';
import { idParam, useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';
import { RunProgrammePanel } from '../../features/programmes/components/run-programme-panel';
import { isLiveRun } from '../../lib/current-run';

/** One recorded run. */
export function Component() {
  const me = useMe();
  const settings = useLabSettings();
  const runId = useIdParam('runId');
  const run = useQuery({ ...runQueryOptions(runId), enabled: !Number.isNaN(runId) });
  if (Number.isNaN(runId)) return <NotFound />;
  const viewer = me.data ? { id: me.data.id, role: me.data.role } : null;
  const time = (iso: string) => formatLabTime(iso, settings.timeZone);
  return (
    <>
      <RunDetail key={runId} runId={runId} canEdit={hasRole(me.data?.role, 'technician')} viewer={viewer} />
      <div className="mt-4 flex flex-col gap-4">
        <RunProgrammePanel key={`programme-${runId}`} runId={runId} canAct={hasRole(me.data?.role, 'technician')} live={isLiveRun(run.data)} />
        <SignoffPanel key={`signoff-${runId}`} runId={runId} role={me.data?.role} formatTime={time} />
        {hasRole(me.data?.role, 'technician') && <SharePanel key={`share-${runId}`} kind="run" targetId={runId} formatTime={time} />}
      </div>
    </>
  );
}

/** The run and its summary. */
export function prefetch(queryClient: QueryClient, params: Params): void {
  const runId = idParam(params, 'runId');
  if (!Number.isNaN(runId)) void queryClient.prefetchQuery(runQueryOptions(runId));
}
