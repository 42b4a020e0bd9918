import { Link } from 'react-router-dom';
import type { BenchWithStatus } from '../../../../shared/schemas/bench';
import { BigNumber } from '../../../components/ui/big-number';
import { BenchStatusBadge } from '../../../components/ui/state-badge';
import { RUN_STATE_COLORS, SIGNAL_COLORS } from '../../../lib/palette';
import { formatAmps, formatTemperature, formatVolts, formatWatts } from '../../../lib/units';
import { isLiveRun, useLatestBenchRun } from '../../../lib/current-run';
import { useLiveStore, useLiveView } from '../../../lib/use-live';
import { BenchRunLine } from './bench-run-line';

/** One bench on the overview: its health, its run, and its numbers as they arrive. */
export function BenchCard({ bench, temperatureUnit, energyUnit }: { bench: BenchWithStatus; temperatureUnit: 'C' | 'F'; energyUnit: 'Wh' | 'kWh' }) {
  const store = useLiveStore({ kind: 'bench', id: bench.id });
  const live = useLiveView(store);
  const status = live.status ?? bench.status;
  const latest = useLatestBenchRun(bench.id);
  const newest = live.run ?? latest.data ?? null;
  const run = isLiveRun(newest) ? newest : null;
  const alarm = run?.state === 'cutoff';

  return (
    <div
      className={`relative flex flex-col gap-4 rounded-2xl border-2 border-l-8 bg-surface-raised p-5 transition hover:border-accent ${alarm ? 'border-state-cutoff' : 'border-line'}`}
      // The left edge wears the run's state colour, the same one as the badge and the legend.
      style={{ borderLeftColor: run ? RUN_STATE_COLORS[run.state] : undefined }}
    >
      <div className="flex flex-col gap-4">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 className="text-xl font-bold">
            {/* The whole card opens the bench (the link's area stretches over it); its name is the bench's. */}
            <Link to={`/benches/${bench.id}`} className="after:absolute after:inset-0 after:rounded-2xl after:content-['']">
              {bench.name}
            </Link>
          </h2>
          <BenchStatusBadge state={status.state} />
        </div>
        <div className="grid grid-cols-2 gap-4">
          <BigNumber label="Volts" text={formatVolts(live.volts)} unit="V" color={SIGNAL_COLORS.volts} size="md" />
          <BigNumber label="Amps" text={formatAmps(live.amps)} unit="A" color={SIGNAL_COLORS.amps} size="md" />
          <BigNumber label="Watts" text={formatWatts(live.watts)} unit="W" color={SIGNAL_COLORS.watts} size="md" />
          <BigNumber
            label="Temp"
            text={formatTemperature(live.tempCelsius, temperatureUnit)}
            unit={temperatureUnit === 'F' ? '°F' : '°C'}
            color={SIGNAL_COLORS.temp}
            size="md"
          />
        </div>
      </div>
      <div className="relative z-10 border-t border-line pt-3">
        {run ? <BenchRunLine run={run} benchName={bench.name} energyUnit={energyUnit} /> : <span className="text-sm text-ink-faint">No run on this bench</span>}
      </div>
      {status.message && <p className="relative z-10 text-sm text-ink-muted">{status.message}</p>}
    </div>
  );
}
