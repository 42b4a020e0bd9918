import { useState } from 'react';
import { Link } from 'react-router-dom';
import { LIVE_RUN_STATES, type Run } from '../../../../shared/schemas/run';
import { Button } from '../../../components/ui/button';
import { SelectField } from '../../../components/ui/field';
import { RunStateBadge } from '../../../components/ui/state-badge';
import { formatLabTime, useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatPercent } from '../../../lib/units';
import { useLinkRun, useRecentRuns } from '../api/pack-record';

/** "pass" → "Pass"; any verdict the server adds later still reads. */
const verdictText = (verdict: string | undefined) => (verdict ? verdict.charAt(0).toUpperCase() + verdict.slice(1) : '—');

/** Every run of the pack, newest first, with its verdict; technicians file an ended run of another (or no) pack here. */
export function PackRuns({ batteryId, runs, canWrite }: { batteryId: number; runs: readonly Run[]; canWrite: boolean }) {
  const settings = useLabSettings();
  const link = useLinkRun(batteryId);
  const [runId, setRunId] = useState('');
  const recent = useRecentRuns(canWrite);
  // Live runs keep their pack (the server refuses them too); runs already here need no link.
  const linkable = (recent.data?.runs ?? []).filter((r) => r.batteryId !== batteryId && !LIVE_RUN_STATES.includes(r.state));
  return (
    <div className="flex flex-col gap-4">
      {runs.length === 0 ? (
        <p className="text-ink-muted">No runs of this pack yet.</p>
      ) : (
        <div className="overflow-x-auto rounded-xl border border-line">
          <table className="w-full text-left text-sm">
            <thead className="bg-surface-sunken text-ink-muted">
              <tr>
                {['Run', 'State', 'Started', 'Delivered', 'Of rated', 'Verdict'].map((h) => (
                  <th key={h} className="px-3 py-3 font-semibold">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {runs.map((run) => (
                <tr key={run.id} className="border-t border-line bg-surface-raised">
                  <td className="px-3 py-3">
                    <Link to={`/runs/${run.id}`} className="font-semibold text-accent hover:underline">
                      {run.name}
                    </Link>
                  </td>
                  <td className="px-3 py-3">
                    <RunStateBadge state={run.state} />
                  </td>
                  <td className="num whitespace-nowrap px-3 py-3">{formatLabTime(run.startedAt, settings.timeZone)}</td>
                  <td className="num whitespace-nowrap px-3 py-3">
                    {run.summary ? `${formatCharge(run.summary.dischargeAh)} · ${formatEnergy(run.summary.dischargeWh, settings.energyUnit)}` : '—'}
                  </td>
                  <td className="num whitespace-nowrap px-3 py-3">{formatPercent(run.summary?.percentRatedAh ?? null)}</td>
                  <td className="px-3 py-3 font-semibold">{verdictText(run.summary?.verdict)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canWrite && (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (/^\d+$/.test(runId)) link.mutate(Number(runId), { onSuccess: () => setRunId('') });
          }}
        >
          <div className="min-w-0 flex-1">
            <SelectField
              label="Run recorded without this pack"
              value={runId}
              onChange={(e) => setRunId(e.target.value)}
              options={[
                { value: '', label: linkable.length === 0 ? 'No other ended runs' : 'Choose a run…' },
                ...linkable.map((r) => ({ value: String(r.id), label: `#${r.id} ${r.name}${r.batteryId === null ? ' (no pack)' : ` (pack #${r.batteryId})`}` })),
              ]}
            />
          </div>
          <Button type="submit" variant="secondary" disabled={link.isPending || !/^\d+$/.test(runId)}>
            Link run to this pack
          </Button>
          {link.isError && (
            <p role="alert" className="w-full text-sm font-medium text-state-cutoff">
              {link.error instanceof Error ? link.error.message : 'Not linked.'}
            </p>
          )}
        </form>
      )}
    </div>
  );
}
