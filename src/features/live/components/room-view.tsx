import { Link, useNavigate } from 'react-router-dom';
import { LIVE_RUN_STATES } from '../../../../shared/schemas/run';
import { BenchStatusBadge, RunStateBadge } from '../../../components/ui/state-badge';
import { useLabSettings } from '../../../lib/lab-settings';
import type { LiveStore } from '../../../lib/live-store';
import { useLiveStore, useLiveView } from '../../../lib/use-live';
import { useShortcut } from '../../../lib/use-shortcut';
import { useBench } from '../api/get-bench';
import { CutoffAlarm } from './cutoff-alarm';
import { Readouts } from './readouts';

function RoomNumbers({ store }: { store: LiveStore }) {
  const view = useLiveView(store);
  const settings = useLabSettings();
  return <Readouts view={view} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} size="room" />;
}

function RunRoom({ runId, label }: { runId: number; label: string }) {
  const store = useLiveStore({ kind: 'run', id: runId });
  return (
    <>
      <CutoffAlarm store={store} label={label} />
      <RoomNumbers store={store} />
    </>
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
  const name = bench.data?.name ?? `Bench ${benchId}`;
  const run = view.run;
  const liveRun = run && LIVE_RUN_STATES.includes(run.state) ? run : null;
  const status = view.status ?? bench.data?.status;

  const goFullScreen = () => void document.documentElement.requestFullscreen?.().catch(() => undefined);

  return (
    <div className="flex min-h-screen flex-col gap-8 bg-surface p-6 md:p-10">
      <header className="flex flex-wrap items-center justify-between gap-4">
        <div className="flex flex-wrap items-center gap-4">
          <h1 className="text-[clamp(2rem,4vw,4.5rem)] font-black leading-none tracking-tight">{name}</h1>
          {run && <RunStateBadge state={run.state} large />}
          {status && <BenchStatusBadge state={status.state} large />}
        </div>
        <div className="flex gap-2">
          <button type="button" onClick={goFullScreen} className="min-h-14 rounded-xl border border-line px-5 text-lg font-semibold">
            Fill screen
          </button>
          <Link to={`/benches/${benchId}`} className="inline-flex min-h-14 items-center rounded-xl border border-line px-5 text-lg font-semibold">
            Back (Esc)
          </Link>
        </div>
      </header>
      {run && <p className="text-[clamp(1.2rem,2vw,2.2rem)] text-ink-muted">{run.name}</p>}
      {liveRun ? <RunRoom runId={liveRun.id} label={name} /> : <RoomNumbers store={benchStore} />}
    </div>
  );
}
