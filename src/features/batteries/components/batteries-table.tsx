import { Link } from 'react-router-dom';
import type { Battery } from '../../../../shared/schemas/battery';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatNumber } from '../../../lib/units';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';

/** The registered packs, one row each, every figure with its unit. */
export function BatteriesTable({ batteries, onEdit }: { batteries: readonly Battery[]; onEdit?: (battery: Battery) => void }) {
  const { energyUnit } = useLabSettings();
  if (batteries.length === 0) return <p className="p-6 text-center text-ink-muted">No packs registered yet.</p>;
  return (
    <div className="overflow-x-auto rounded-xl border border-line">
      <table className="w-full text-left text-sm">
        <thead className="bg-surface-sunken text-ink-muted">
          <tr>
            {['Label', 'Brand / model', 'Chemistry', 'Cells', 'Rated', 'Protection', 'Mass', 'Serial', 'Sent by'].map((h) => (
              <th key={h} className="px-3 py-3 font-semibold">
                {h}
              </th>
            ))}
            <th className="px-3 py-3">
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {batteries.map((b) => (
            <tr key={b.id} className="border-t border-line bg-surface-raised">
              <td className="px-3 py-3 font-semibold">{b.label}</td>
              <td className="px-3 py-3">{[b.brand, b.model].filter(Boolean).join(' ')}</td>
              <td className="px-3 py-3">{CHEMISTRY_LABEL[b.chemistry]}</td>
              <td className="num whitespace-nowrap px-3 py-3">
                {b.cellsInSeries}S{b.cellsInParallel > 1 ? `${b.cellsInParallel}P` : ''}
              </td>
              <td className="num whitespace-nowrap px-3 py-3">
                {formatCharge(b.ratedAh)}
                {b.ratedWh !== null && ` · ${formatEnergy(b.ratedWh, energyUnit)}`}
              </td>
              <td className="num whitespace-nowrap px-3 py-3">{b.bmsRatedAmps === null ? '—' : `${formatNumber(b.bmsRatedAmps, 0)} A`}</td>
              <td className="num whitespace-nowrap px-3 py-3">{b.massKg === null ? '—' : `${formatNumber(b.massKg, 2)} kg`}</td>
              <td className="num whitespace-nowrap px-3 py-3">{b.serialNumber ?? '—'}</td>
              <td className="px-3 py-3">{b.sender ?? '—'}</td>
              {/* Both actions in one cell: two half-empty columns pushed Edit off a 1440 px screen. */}
              <td className="px-3 py-2">
                <span className="flex gap-2">
                  <Link to={`/runs?batteryId=${b.id}`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-3 font-semibold" aria-label={`Runs of ${b.label}`}>
                    Runs
                  </Link>
                  {onEdit && (
                    <button type="button" onClick={() => onEdit(b)} className="min-h-11 rounded-lg border border-line px-3 font-semibold" aria-label={`Edit ${b.label}`}>
                      Edit
                    </button>
                  )}
                </span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
