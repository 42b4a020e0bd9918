import { Link } from 'react-router-dom';
import { PROTECTION_TRAITS, type ProtectionRecordRow } from '../../../shared/schemas/protection-check';
import { formatLabTime, useLabSettings } from '../../lib/lab-settings';
import { formatDuration } from '../../lib/units';
import { formatProtectionValue } from './run-events-list';
import { ProtectionOutcomeBadge } from './protection-outcome-badge';

const HEADERS = ['Run', 'Protection', 'Expected', 'Measured', 'Released at, after', 'Result'];

/**
 * A pack's protection record (the register's card and the pack page): every protection checked
 * across its runs, latest first, each linked to the stretch of its run that shows it.
 */
export function ProtectionRecordTable({
  rows,
  label = 'Protection record',
  emptyText = 'No protection checks recorded for this pack yet.',
}: {
  rows: readonly ProtectionRecordRow[];
  /** The table's accessible name. */
  label?: string;
  /** What shows when nothing was checked. */
  emptyText?: string;
}) {
  const { temperatureUnit, timeZone } = useLabSettings();
  if (rows.length === 0) return <p className="text-sm text-ink-muted">{emptyText}</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" aria-label={label}>
        <thead className="text-xs uppercase tracking-wider text-ink-muted">
          <tr>
            {HEADERS.map((h) => (
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
                  <Link to={href} className="inline-flex min-h-11 items-center font-semibold text-accent underline">
                    {r.runName}
                  </Link>
                  <span className="num block text-xs text-ink-muted">{formatLabTime(r.startedAt, timeZone)}</span>
                </td>
                <th scope="row" className="p-2 font-semibold">
                  {PROTECTION_TRAITS[r.protection].label}
                  {r.channel && <span className="block text-xs font-normal text-ink-muted">on {r.channel}</span>}
                </th>
                <td className="num p-2">
                  {value(r.expectedValue)}
                  {r.expectedDelaySeconds !== null && <span className="block">after {formatDuration(r.expectedDelaySeconds)}</span>}
                </td>
                <td className="num p-2">
                  {value(r.measuredValue)}
                  {r.measuredDelaySeconds !== null && <span className="block">after {formatDuration(r.measuredDelaySeconds)}</span>}
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
