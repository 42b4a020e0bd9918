import { useState } from 'react';
import { Link } from 'react-router-dom';
import { LIVE_RUN_STATES } from '../../../../shared/schemas/run';
import { Card, PageHeader } from '../../../components/ui/card';
import { BenchStatusBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { useLabSettings } from '../../../lib/lab-settings';
import { useLiveStore, useLiveView } from '../../../lib/use-live';
import { useBench } from '../api/get-bench';
import { LiveRunPanel } from './live-run-panel';
import { Readouts } from './readouts';
import { StartRunForm } from './start-run-form';

/** One bench: its live run when there is one, otherwise its raw readings and the start form. */
export function BenchLivePage({ benchId, canAct, canSetUp = false }: { benchId: number; canAct: boolean; canSetUp?: boolean }) {
  const bench = useBench(benchId);
  const store = useLiveStore({ kind: 'bench', id: benchId });
  const view = useLiveView(store);
  const settings = useLabSettings();
  const [startedRunId, setStartedRunId] = useState<number | null>(null);

  if (bench.isPending) return <Loading label="Loading bench…" />;
  if (bench.isError) return <QueryError error={bench.error} what="This bench" />;

  const status = view.status ?? bench.data.status;
  const liveRunId = view.run && LIVE_RUN_STATES.includes(view.run.state) ? view.run.id : startedRunId;
  const roomViewPath = `/benches/${benchId}/room`;

  return (
    <>
      <PageHeader
        title={bench.data.name}
        subtitle={
          <span className="flex flex-wrap items-center gap-3">
            <BenchStatusBadge state={status.state} />
            <span className="num">{status.framesOk} frames ok · {status.framesRejected} rejected</span>
            {status.message && <span>{status.message}</span>}
          </span>
        }
        actions={
          <>
            {canSetUp && (
              <Link to={`/benches/${benchId}/setup`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold">
                Set up bench
              </Link>
            )}
            <Link to="/" className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold">
              All benches
            </Link>
          </>
        }
      />
      {status.lastRejection && <p className="mb-4 text-sm text-status-stale">Last rejected reading: {status.lastRejection}</p>}
      {liveRunId !== null ? (
        <LiveRunPanel runId={liveRunId} label={bench.data.name} roomViewPath={roomViewPath} canAct={canAct} />
      ) : (
        <div className="flex flex-col gap-4">
          <Card className="p-6">
            <h2 className="mb-4 font-semibold text-ink-muted">Meter readings (no run recording)</h2>
            <Readouts view={view} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} />
          </Card>
          {canAct ? (
            <Card className="p-6">
              <h2 className="mb-4 text-lg font-bold">Start a run on {bench.data.name}</h2>
              <StartRunForm benchId={benchId} onStarted={setStartedRunId} />
            </Card>
          ) : (
            <p className="text-ink-muted">No run on this bench right now.</p>
          )}
        </div>
      )}
    </>
  );
}
