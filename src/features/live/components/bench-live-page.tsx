import { useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Card, PageHeader } from '../../../components/ui/card';
import { BENCH_STATUS_LABEL, BenchStatusBadge, RunStateBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { isLiveRun, useLatestBenchRun } from '../../../lib/current-run';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatDuration } from '../../../lib/units';
import { useLiveStore, useLiveView } from '../../../lib/use-live';
import { useReadingAge } from '../../../lib/reading-age';
import { useBench } from '../api/get-bench';
import type { SourceState } from '../../../../shared/schemas/bench';
import { LiveRunPanel } from './live-run-panel';
import { Readouts } from './readouts';
import { StartRunForm } from './start-run-form';

/** Source states in which the meter is not delivering readings. */
const QUIET_STATES: ReadonlySet<SourceState> = new Set(['stale', 'error', 'reconnecting']);

/**
 * "last reading 4 s ago", ticking, so a frozen number never passes for a live one. The status
 * (server clock) moves only when the bench's state changes; a live batch (this browser's
 * clock) is fresher while readings stream.
 */
function LastReading({ ageSeconds }: { ageSeconds: number | null }) {
  if (ageSeconds === null) return null;
  return <span>last reading {formatDuration(ageSeconds)} ago</span>;
}

/** One bench: its live run when there is one, otherwise its raw readings and the start form. */
export function BenchLivePage({
  benchId,
  canAct,
  canSetUp = false,
  runExtras,
}: {
  benchId: number;
  canAct: boolean;
  canSetUp?: boolean;
  /** What the page shows under the run on screen (the route passes the run's programme panel). */
  runExtras?: (runId: number, live: boolean) => ReactNode;
}) {
  const bench = useBench(benchId);
  const store = useLiveStore({ kind: 'bench', id: benchId });
  const view = useLiveView(store);
  const settings = useLabSettings();
  const latest = useLatestBenchRun(benchId);
  const age = useReadingAge(view, view.status ?? bench.data?.status);
  // The run on screen stays there after it ends (its alarm may still need acknowledging)
  // until the technician closes it or starts another.
  const [pinnedRunId, setPinnedRunId] = useState<number | null>(null);
  const liveRun = isLiveRun(view.run) ? view.run : isLiveRun(latest.data) ? latest.data : null;
  if (liveRun && liveRun.id !== pinnedRunId) setPinnedRunId(liveRun.id);

  if (bench.isPending) return <Loading label="Loading bench…" />;
  if (bench.isError) return <QueryError error={bench.error} what="This bench" />;

  const status = view.status ?? bench.data.status;
  const shownRunId = liveRun?.id ?? pinnedRunId;
  const sourceProblem = QUIET_STATES.has(status.state) ? (status.message ?? BENCH_STATUS_LABEL[status.state]) : null;
  const roomViewPath = `/benches/${benchId}/room`;

  return (
    <>
      <PageHeader
        title={bench.data.name}
        subtitle={
          <span className="flex flex-wrap items-center gap-3">
            <BenchStatusBadge state={status.state} />
            <span className="num">{status.framesOk} frames ok · {status.framesRejected} rejected</span>
            <LastReading ageSeconds={age.ageSeconds} />
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
      {shownRunId !== null ? (
        <div className="flex flex-col gap-4">
          <LiveRunPanel
            runId={shownRunId}
            label={bench.data.name}
            roomViewPath={roomViewPath}
            canAct={canAct}
            onClose={liveRun ? undefined : () => setPinnedRunId(null)}
            sourceProblem={sourceProblem}
          />
          {runExtras?.(shownRunId, liveRun !== null)}
        </div>
      ) : (
        <div className="flex flex-col gap-4">
          {latest.data && (
            <Card className="flex flex-wrap items-center justify-between gap-3">
              <span className="flex flex-wrap items-center gap-3">
                <span className="text-ink-muted">Last run on this bench:</span>
                <span className="font-semibold">{latest.data.name}</span>
                <RunStateBadge state={latest.data.state} />
              </span>
              <Link to={`/runs/${latest.data.id}`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold">
                Run details
              </Link>
            </Card>
          )}
          <Card className="p-6">
            <h2 className="mb-4 font-semibold text-ink-muted">Meter readings (no run recording)</h2>
            <Readouts view={view} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} totals={false} stale={age.stale} ageSeconds={age.ageSeconds} />
          </Card>
          {canAct ? (
            <Card className="p-6">
              <h2 className="mb-4 text-lg font-bold">Start a run on {bench.data.name}</h2>
              {bench.data.source.kind === 'simulator' && (
                <p className="mb-4 rounded-lg border border-line bg-surface-sunken p-3 text-sm text-ink-muted" data-testid="fresh-simulated-pack">
                  Simulated bench: arming a run puts a fresh simulated pack on it (full charge, protection reset), so the test starts from the beginning.
                </p>
              )}
              <StartRunForm benchId={benchId} onStarted={setPinnedRunId} packCelsius={view.tempCelsius} tempChannel={view.tempChannel} />
            </Card>
          ) : (
            <p className="text-ink-muted">No run on this bench right now.</p>
          )}
        </div>
      )}
    </>
  );
}
