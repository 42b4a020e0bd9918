import { useQuery } from '@tanstack/react-query';
import { PROTECTION_TRAITS } from '../../../../shared/schemas/protection-check';
import { ProtectionRecordTable } from '../../../components/ui/protection-record-table';
import { formatProtectionValue } from '../../../components/ui/run-events-list';
import { Loading, QueryError } from '../../../components/ui/status';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatDuration } from '../../../lib/units';
import { protectionRecordQueryOptions } from '../api/pack-record';

/** The pack's protection record: what its maker states, and each check run against it (the one record table). */
export function ProtectionRecord({ batteryId }: { batteryId: number }) {
  const record = useQuery(protectionRecordQueryOptions(batteryId));
  const { temperatureUnit } = useLabSettings();
  if (record.isPending) return <Loading label="Loading the protection record…" />;
  if (record.isError) return <QueryError error={record.error} what="The protection record" />;
  const { specs, rows } = record.data;

  return (
    <div className="flex flex-col gap-4">
      {specs.length > 0 ? (
        <div>
          <h3 className="font-semibold">Stated by the maker</h3>
          <ul className="num mt-1 grid gap-1 text-sm">
            {specs.map((spec) => {
              const value = (v: number | null) => formatProtectionValue(spec.protection, v, temperatureUnit);
              return (
                <li key={spec.protection}>
                  {PROTECTION_TRAITS[spec.protection].label}: {value(spec.thresholdValue)}
                  {spec.delaySeconds !== null && ` after ${formatDuration(spec.delaySeconds)}`}
                  {spec.releaseValue !== null && `, released at ${value(spec.releaseValue)}`}
                </li>
              );
            })}
          </ul>
        </div>
      ) : (
        <p className="text-sm text-ink-muted">The pack's record states no protections.</p>
      )}
      <ProtectionRecordTable rows={rows} label="Protections checked on this pack" emptyText="No protection check has been run on this pack yet." />
    </div>
  );
}
