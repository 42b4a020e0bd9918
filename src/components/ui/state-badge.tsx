import { BENCH_STATUS_COLORS, RUN_STATE_COLORS, type BenchStatusName, type RunStateName } from '../../lib/palette';

export const RUN_STATE_LABEL: Record<RunStateName, string> = {
  armed: 'Armed',
  recording: 'Recording',
  cutoff: 'Cut off',
  recovered: 'Recovered',
  finished: 'Finished',
  aborted: 'Aborted',
};

export const BENCH_STATUS_LABEL: Record<BenchStatusName | 'reconnecting', string> = {
  receiving: 'Receiving',
  connected: 'Connected',
  stale: 'No data',
  reconnecting: 'Reconnecting',
  error: 'Error',
  idle: 'Idle',
};

function Badge({ color, label, large }: { color: string; label: string; large?: boolean }) {
  return (
    <span
      className={`inline-flex items-center gap-2 rounded-full border px-3 font-semibold ${large ? 'py-1.5 text-base' : 'py-0.5 text-sm'}`}
      style={{ borderColor: color, color }}
    >
      <span className="h-2.5 w-2.5 rounded-full" style={{ backgroundColor: color }} aria-hidden="true" />
      {label}
    </span>
  );
}

/** A run's state in its one colour (see palette.ts). */
export function RunStateBadge({ state, large }: { state: RunStateName; large?: boolean }) {
  return <Badge color={RUN_STATE_COLORS[state]} label={RUN_STATE_LABEL[state]} large={large} />;
}

/** A bench source's health in its one colour; "reconnecting" wears the "stale" colour. */
export function BenchStatusBadge({ state, large }: { state: BenchStatusName | 'reconnecting'; large?: boolean }) {
  const colorKey: BenchStatusName = state === 'reconnecting' ? 'stale' : state;
  return <Badge color={BENCH_STATUS_COLORS[colorKey]} label={BENCH_STATUS_LABEL[state]} large={large} />;
}

/** The legend of run-state colours, drawn from the same table as the badges. */
export function RunStateLegend() {
  return (
    <ul aria-label="Run states" className="flex flex-wrap gap-3 text-sm text-ink-muted">
      {(Object.keys(RUN_STATE_COLORS) as RunStateName[]).map((state) => (
        <li key={state} className="flex items-center gap-1.5">
          <span className="h-3 w-3 rounded-full" style={{ backgroundColor: RUN_STATE_COLORS[state] }} aria-hidden="true" />
          {RUN_STATE_LABEL[state]}
        </li>
      ))}
    </ul>
  );
}
