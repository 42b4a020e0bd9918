import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { BENCH_STATUS_LABEL, RUN_STATE_LABEL } from '../../../components/ui/state-badge';
import { BENCH_STATUS_COLORS, RUN_STATE_COLORS } from '../../../lib/palette';
import { isLiveRun, useLatestBenchRun } from '../../../lib/current-run';
import { useLabSettings } from '../../../lib/lab-settings';
import type { LiveStore } from '../../../lib/live-store';
import type { RunStateName } from '../../../lib/palette';
import type { SourceState } from '../../../../shared/schemas/bench';
import { useLiveStore, useLiveView } from '../../../lib/use-live';
import { useShortcut } from '../../../lib/use-shortcut';
import { useBench } from '../api/get-bench';
import { useHistoryBackfill } from '../api/use-history-backfill';
import { LiveChart } from '../../../components/charts/live-chart';
import { CutoffAlarm } from '../../../components/alarm/cutoff-alarm';
import { Readouts } from './readouts';

function RoomNumbers({ store, totals }: { store: LiveStore; totals: boolean }) {
  const view = useLiveView(store);
  const settings = useLabSettings();
  return <Readouts view={view} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} size="room" totals={totals} />;
}

/** Chart height in the room view: the knee should be visible from the door. */
const ROOM_CHART_HEIGHT_PX = 260;

/** A run on the big screen: its state, alarm, numbers and chart, from the run's own topic. */
function RunRoom({ runId, label, sourceState, startingState }: { runId: number; label: string; sourceState: SourceState | null; startingState: RunStateName | null }) {
  const store = useLiveStore({ kind: 'run', id: runId });
  const run = useLiveView(store).run;
  const settings = useLabSettings();
  useHistoryBackfill(store, runId);
  return (
    <>
      <StateBar runState={run?.state ?? startingState} runName={run?.name ?? null} sourceState={sourceState} />
      <CutoffAlarm store={store} label={label} size="large" units={settings} />
      <RoomNumbers store={store} totals />
      <LiveChart store={store} heightPx={ROOM_CHART_HEIGHT_PX} temperatureUnit={settings.temperatureUnit} />
    </>
  );
}

/** The state as a wide coloured bar: the first thing read from across the room. */
function StateBar({ runState, runName, sourceState }: { runState: RunStateName | null; runName: string | null; sourceState: SourceState | null }) {
  const sourceKey = sourceState === 'reconnecting' ? 'stale' : sourceState;
  const color = runState ? RUN_STATE_COLORS[runState] : sourceKey ? BENCH_STATUS_COLORS[sourceKey] : BENCH_STATUS_COLORS.idle;
  const label = runState ? RUN_STATE_LABEL[runState] : 'No run';
  return (
    <div className="flex flex-wrap items-center justify-between gap-4 rounded-2xl border-l-[16px] bg-surface-raised px-6 py-4" style={{ borderColor: color }}>
      <span className="text-[clamp(2rem,4.5vw,5rem)] font-black uppercase leading-none tracking-wide" style={{ color }} data-testid="room-state">
        {label}
      </span>
      <span className="text-right text-[clamp(1rem,1.8vw,2rem)] text-ink-muted">
        {runName && <span className="block text-ink">{runName}</span>}
        {sourceState && <span>Meter: {BENCH_STATUS_LABEL[sourceState]}</span>}
      </span>
    </div>
  );
}

/** One bench filling the screen, readable from three metres. Esc or F goes back. */
export function RoomView({ benchId }: { benchId: number }) {
  const bench = useBench(benchId);
  const benchStore = useLiveStore({ kind: 'bench', id: benchId });
  const view = useLiveView(benchStore);
  const navigate = useNavigate();
  const back = () => navigate(`/benches/${benchId}`);
  useShortcut('Escape', back);
  useShortcut('f', back);
  const latest = useLatestBenchRun(benchId);
  // The run stays on the big screen after it ends (cutoff, then finished), with its alarm,
  // until another run starts: the room must not forget a cutoff nobody has seen yet.
  const [pinnedRunId, setPinnedRunId] = useState<number | null>(null);
  const liveRun = isLiveRun(view.run) ? view.run : isLiveRun(latest.data) ? latest.data : null;
  if (liveRun && liveRun.id !== pinnedRunId) setPinnedRunId(liveRun.id);
  const name = bench.data?.name ?? `Bench ${benchId}`;
  const status = view.status ?? bench.data?.status;
  const sourceState = status?.state ?? null;

  const goFullScreen = () => void document.documentElement.requestFullscreen?.().catch(() => undefined);

  return (
    <main className="flex min-h-screen flex-col gap-8 bg-surface p-6 md:p-10">
      <header className="flex flex-wrap items-center justify-between gap-4">
        <h1 className="text-[clamp(2rem,4vw,4.5rem)] font-black leading-none tracking-tight">{name}</h1>
        <div className="flex gap-2">
          <button type="button" onClick={goFullScreen} className="min-h-14 rounded-xl border border-line px-5 text-lg font-semibold">
            Fill screen
          </button>
          <Link to={`/benches/${benchId}`} className="inline-flex min-h-14 items-center rounded-xl border border-line px-5 text-lg font-semibold">
            Back (Esc)
          </Link>
        </div>
      </header>
      {pinnedRunId !== null ? (
        <RunRoom key={pinnedRunId} runId={pinnedRunId} label={name} sourceState={sourceState} startingState={liveRun?.state ?? null} />
      ) : (
        <>
          <StateBar runState={null} runName={null} sourceState={sourceState} />
          <RoomNumbers store={benchStore} totals={false} />
        </>
      )}
    </main>
  );
}
