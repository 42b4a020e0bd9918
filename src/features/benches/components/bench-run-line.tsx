import type { Run } from '../../../../shared/schemas/run';
import { CutoffAlarm } from '../../../components/alarm/cutoff-alarm';
import { RunStateBadge } from '../../../components/ui/state-badge';
import { EndEstimateLine } from '../../../components/ui/end-estimate';
import { useEndEstimate } from '../../../lib/use-end-estimate';
import { formatCharge, formatElapsedClock, formatEnergy } from '../../../lib/units';
import { useLiveStore, useLiveView } from '../../../lib/use-live';

/** A live run on the overview: its totals, and its alarm, so a cutoff is loud here too. */
export function BenchRunLine({ run, benchName, energyUnit }: { run: Run; benchName: string; energyUnit: 'Wh' | 'kWh' }) {
  const store = useLiveStore({ kind: 'run', id: run.id });
  const view = useLiveView(store);
  const state = view.run?.state ?? run.state;
  const estimate = useEndEstimate(view);
  // A charge run counts what goes in; every other run what comes out.
  const charge = run.kind === 'charge';
  const wh = charge ? view.chargeWh : view.dischargeWh;
  const ah = charge ? view.chargeAh : view.dischargeAh;
  return (
    <div className="flex flex-col gap-3">
      <CutoffAlarm store={store} label={benchName} size="compact" units={{ energyUnit }} />
      <div className="flex flex-wrap items-center justify-between gap-2 text-sm">
        <span className="truncate font-medium">{view.run?.name ?? run.name}</span>
        <RunStateBadge state={state} />
      </div>
      <p className="num text-lg font-bold">
        {charge ? 'in ' : 'out '}
        {formatEnergy(wh, energyUnit)} · {formatCharge(ah)} ·{' '}
        <span className="text-ink-muted">{view.time === null ? '—' : formatElapsedClock(view.time)} h:m:s</span>
      </p>
      <EndEstimateLine estimate={estimate} />
    </div>
  );
}
