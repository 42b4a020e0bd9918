import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { PROTECTION_TRAITS, type ProtectionRecordRow } from '../../../../shared/schemas/protection-check';
import { formatProtectionValue } from '../../../components/ui/run-events-list';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatLabTime, useLabSettings } from '../../../lib/lab-settings';
import { formatDuration } from '../../../lib/units';
import { protectionRecordQueryOptions } from '../api/pack-record';
import { ProtectionOutcomeBadge } from '../../../components/ui/protection-outcome-badge';

/** The pack's protection record: what its maker states, and each check run against it. */
export function ProtectionRecord({ batteryId }: { batteryId: number }) {
  const record = useQuery(protectionRecordQueryOptions(batteryId));
  const { temperatureUnit, timeZone } = useLabSettings();
  if (record.isPending) return <Loading label="Loading the protection record…" />;
  if (record.isError) return <QueryError error={record.error} what="The protection record" />;
  const { specs, rows } = record.data;
  const value = (row: Pick<ProtectionRecordRow, 'protection'>, v: number | null) => formatProtectionValue(row.protection, v, temperatureUnit);

  return (
    <div className="flex flex-col gap-4">
      {specs.length > 0 ? (
        <div>
          <h3 className="font-semibold">Stated by the maker</h3>
          <ul className="num mt-1 grid gap-1 text-sm">
            {specs.map((spec) => (
              <li key={spec.protection}>
                {PROTECTION_TRAITS[spec.protection].label}: {value(spec, spec.thresholdValue)}
                {spec.delaySeconds !== null && ` after ${formatDuration(spec.delaySeconds)}`}
                {spec.releaseValue !== null && `, released at ${value(spec, spec.releaseValue)}`}
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="text-sm text-ink-muted">The pack's record states no protections.</p>
      )}
      {rows.length === 0 ? (
        <p className="text-ink-muted">No protection check has been run on this pack yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm" aria-label="Protections checked on this pack">
            <thead className="text-xs uppercase tracking-wider text-ink-muted">
              <tr>
                <th className="p-2">Protection</th>
                <th className="p-2">Result</th>
                <th className="p-2">Expected</th>
                <th className="p-2">Measured</th>
                <th className="p-2">Run</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => {
                return (
                  <tr key={`${row.runId}-${row.protection}`} className="border-t border-line align-top">
                    <th scope="row" className="p-2 font-semibold">
                      {PROTECTION_TRAITS[row.protection].label}
                      {row.channel && <span className="block text-xs font-normal text-ink-muted">on {row.channel}</span>}
                    </th>
                    <td className="p-2">
                      <ProtectionOutcomeBadge outcome={row.outcome} />
                    </td>
                    <td className="num p-2">
                      {value(row, row.expectedValue)}
                      {row.expectedDelaySeconds !== null && <span className="block">after {formatDuration(row.expectedDelaySeconds)}</span>}
                    </td>
                    <td className="num p-2">
                      {value(row, row.measuredValue)}
                      {row.measuredDelaySeconds !== null && <span className="block">after {formatDuration(row.measuredDelaySeconds)}</span>}
                    </td>
                    <td className="p-2">
                      <Link to={`/runs/${row.runId}`} className="inline-flex min-h-11 items-center font-semibold text-accent underline">
                        {row.runName}
                      </Link>
                      <span className="num block text-xs text-ink-muted">{formatLabTime(row.startedAt, timeZone)}</span>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
