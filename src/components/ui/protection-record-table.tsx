import { Link } from 'react-router-dom';
import { PROTECTION_TRAITS, type ProtectionRecordRow } from '../../../shared/schemas/protection-check';
import { formatLabTime, useLabSettings } from '../../lib/lab-settings';
import { formatDuration } from '../../lib/units';
import { formatProtectionValue } from './run-events-list';
import { ProtectionOutcomeBadge } from './protection-outcome-badge';

/** A pack's protection record: every protection checked across its runs, latest first, each linked to the stretch that shows it. */
export function ProtectionRecordTable({ rows }: { rows: readonly ProtectionRecordRow[] }) {
  const { temperatureUnit, timeZone } = useLabSettings();
  if (rows.length === 0) return <p className="text-sm text-ink-muted">No protection checks recorded for this pack yet.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" aria-label="Protection record">
        <thead className="text-xs uppercase tracking-wider text-ink-muted">
          <tr>
            {['Run', 'Protection', 'Expected', 'Measured', 'Released at, after', 'Result'].map((h) => (
              <th key={h} className="p-2">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => {
            const value = (v: number | null) => formatProtectionValue(r.protection, v, temperatureUnit);
            const href = r.window ? `/runs/${r.runId}?from=${Math.floor(r.window.fromSeconds)}&to=${Math.ceil(r.window.toSeconds)}` : `/runs/${r.runId}`;
            return (
              <tr key={`${r.runId}-${r.protection}`} className="border-t border-line align-top">
                <td className="p-2">
                  <Link to={href} className="font-semibold text-accent underline">
                    {r.runName}
                  </Link>
                  <span className="block text-xs text-ink-muted">{formatLabTime(r.startedAt, timeZone)}</span>
                </td>
                <td className="p-2">{PROTECTION_TRAITS[r.protection].label}</td>
                <td className="num p-2">
                  {value(r.expectedValue)}
                  {r.expectedDelaySeconds !== null && ` after ${formatDuration(r.expectedDelaySeconds)}`}
                </td>
                <td className="num p-2">
                  {value(r.measuredValue)}
                  {r.measuredDelaySeconds !== null && ` after ${formatDuration(r.measuredDelaySeconds)}`}
                </td>
                <td className="num p-2">{r.releaseValue === null ? '—' : `${value(r.releaseValue)}, ${formatDuration(r.resumeSeconds)}`}</td>
                <td className="p-2">
                  <ProtectionOutcomeBadge outcome={r.outcome} />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
