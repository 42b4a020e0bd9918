import { Link, useNavigate } from 'react-router-dom';
import { LiveChart } from '../../../components/charts/live-chart';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { RunEventsList } from '../../../components/ui/run-events-list';
import { RunStateBadge } from '../../../components/ui/state-badge';
import { NotifyToggle } from '../../../components/ui/notify-toggle';
import { LIVE_RUN_STATES } from '../../../../shared/schemas/run';
import { useLabSettings } from '../../../lib/lab-settings';
import { useLiveStore, useLiveView, useSocketState } from '../../../lib/use-live';
import { useReadingAge } from '../../../lib/reading-age';
import { useShortcut } from '../../../lib/use-shortcut';
import { useStopRun } from '../api/stop-run';
import { useHistoryBackfill } from '../api/use-history-backfill';
import { AnnotationBox } from './annotation-box';
import { CutoffAlarm } from '../../../components/alarm/cutoff-alarm';
import { Readouts } from './readouts';
import { EndEstimateLine } from '../../../components/ui/end-estimate';
import { useEndEstimate } from '../../../lib/use-end-estimate';

interface Props {
  runId: number;
  /** What the room calls this test: usually the bench name. */
  label: string;
  roomViewPath: string;
  canAct: boolean;
  /** Offered once the run has ended: back to the bench and its start form. */
  onClose?: () => void;
  /** Why the bench's meter is not delivering (stale, error, reconnecting), or null when it is. */
  sourceProblem?: string | null;
}

/** A run as it happens: numbers, totals, the streaming chart, events, notes and the alarm. */
export function LiveRunPanel({ runId, label, roomViewPath, canAct, onClose, sourceProblem = null }: Props) {
  const store = useLiveStore({ kind: 'run', id: runId });
  const view = useLiveView(store);
  useHistoryBackfill(store, runId);
  const socketState = useSocketState();
  const age = useReadingAge(view, null);
  const settings = useLabSettings();
  const stop = useStopRun();
  const navigate = useNavigate();
  useShortcut('f', () => navigate(roomViewPath));
  const run = view.run;
  const estimate = useEndEstimate(view);
  const live = run ? LIVE_RUN_STATES.includes(run.state) : false;

  const stopRun = (abort: boolean) => {
    const question = abort ? 'Abort this run? It will be kept but marked aborted.' : 'Finish this run now?';
    if (window.confirm(question)) stop.mutate({ runId, abort });
  };

  return (
    <div className="flex flex-col gap-4">
      <CutoffAlarm store={store} label={label} units={settings} />
      {view.error && (
        <p role="alert" className="rounded-lg border border-state-cutoff/60 bg-state-cutoff/10 p-3 text-sm">
          Live data for this run is unavailable: {view.error}
        </p>
      )}
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex flex-wrap items-center gap-3">
          <h2 className="text-xl font-bold">{run?.name ?? `Run ${runId}`}</h2>
          {run && <RunStateBadge state={run.state} large />}
          <span className={`text-sm ${socketState === 'open' ? 'text-status-receiving' : 'text-status-stale'}`}>
            {socketState === 'open' ? '● Live' : '○ Reconnecting…'}
          </span>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <NotifyToggle />
          <Link to={roomViewPath} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold hover:border-accent">
            Full screen <kbd className="num ml-2 rounded border border-line px-1 text-xs">F</kbd>
          </Link>
          <Link to={`/runs/${runId}`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold hover:border-accent">
            Run details
          </Link>
          {onClose && !live && (
            <Button variant="secondary" onClick={onClose}>
              Close run
            </Button>
          )}
          {canAct && live && (
            <>
              <Button variant="secondary" onClick={() => stopRun(false)} disabled={stop.isPending}>
                Finish run
              </Button>
              <Button variant="danger" onClick={() => stopRun(true)} disabled={stop.isPending}>
                Abort
              </Button>
            </>
          )}
        </div>
      </div>
      {sourceProblem && live && (
        <p id="readouts-stale" role="status" className="rounded-lg border border-status-stale bg-caution-surface p-3 font-semibold text-ink">
          Meter not delivering: {sourceProblem}. The numbers below are the last ones received; the run marks the gap and integrates
          nothing across it.
        </p>
      )}
      <Card className="p-6">
        <Readouts
          view={view}
          temperatureUnit={settings.temperatureUnit}
          energyUnit={settings.energyUnit}
          stale={live && (!!sourceProblem || age.stale)}
          ageSeconds={age.ageSeconds}
        />
        <EndEstimateLine estimate={estimate} className="mt-4" />
      </Card>
      <Card>
        <LiveChart store={store} temperatureUnit={settings.temperatureUnit} />
        {view.droppedReadings > 0 && (
          <p className="mt-2 text-xs text-ink-faint">
            {view.droppedReadings} readings thinned for this screen only; totals and the archive keep every reading.
          </p>
        )}
      </Card>
      <div className="grid gap-4 lg:grid-cols-3">
        <Card className="lg:col-span-2">
          <h3 className="mb-3 font-semibold">Events</h3>
          <RunEventsList events={view.events} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} />
        </Card>
        {canAct && (
          <Card>
            <AnnotationBox runId={runId} />
          </Card>
        )}
      </div>
    </div>
  );
}
