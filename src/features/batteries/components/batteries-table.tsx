import { Link } from 'react-router-dom';
import type { Battery } from '../../../../shared/schemas/battery';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatNumber } from '../../../lib/units';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';

/** On a phone a row becomes a card: these cells stack, the rest step aside (the pack's page has them). */
const CELL = 'px-3 py-3 max-md:block max-md:px-0 max-md:py-0.5';
const WIDE_ONLY = 'px-3 py-3 max-md:hidden';

/** The registered packs, one row each, every figure with its unit (a card each on a phone). */
export function BatteriesTable({ batteries, onEdit, onProtections }: { batteries: readonly Battery[]; onEdit?: (battery: Battery) => void; onProtections?: (battery: Battery) => void }) {
  const { energyUnit } = useLabSettings();
  if (batteries.length === 0) return <p className="p-6 text-center text-ink-muted">No packs registered yet.</p>;
  return (
    <div className="overflow-x-auto rounded-xl border border-line max-md:overflow-visible max-md:border-0">
      <table className="w-full text-left text-sm max-md:block">
        <thead className="bg-surface-sunken text-ink-muted max-md:sr-only">
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
        <tbody className="max-md:flex max-md:flex-col max-md:gap-3">
          {batteries.map((b) => (
            <tr key={b.id} className="border-t border-line bg-surface-raised max-md:block max-md:rounded-xl max-md:border max-md:p-4">
              <td className={`${CELL} font-semibold`}>{b.label}</td>
              <td className={CELL}>{[b.brand, b.model].filter(Boolean).join(' ')}</td>
              <td className={CELL}>{CHEMISTRY_LABEL[b.chemistry]}</td>
              <td className={`num whitespace-nowrap ${WIDE_ONLY}`}>
                {b.cellsInSeries}S{b.cellsInParallel > 1 ? `${b.cellsInParallel}P` : ''}
              </td>
              <td className={`num whitespace-nowrap ${CELL}`}>
                {formatCharge(b.ratedAh)}
                {b.ratedWh !== null && ` · ${formatEnergy(b.ratedWh, energyUnit)}`}
              </td>
              <td className={`num whitespace-nowrap ${WIDE_ONLY}`}>{b.bmsRatedAmps === null ? '—' : `${formatNumber(b.bmsRatedAmps, 0)} A`}</td>
              <td className={`num whitespace-nowrap ${WIDE_ONLY}`}>{b.massKg === null ? '—' : `${formatNumber(b.massKg, 2)} kg`}</td>
              <td className={`num whitespace-nowrap ${WIDE_ONLY}`}>{b.serialNumber ?? '—'}</td>
              <td className={WIDE_ONLY}>{b.sender ?? '—'}</td>
              {/* Both actions in one cell: two half-empty columns pushed Edit off a 1440 px screen. */}
              <td className="px-3 py-2 max-md:block max-md:px-0 max-md:pt-3 max-md:pb-0">
                <span className="flex gap-2">
                  <Link to={`/runs?batteryId=${b.id}`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-3 font-semibold" aria-label={`Runs of ${b.label}`}>
                    Runs
                  </Link>
                  {onProtections && (
                    <button type="button" onClick={() => onProtections(b)} className="min-h-11 rounded-lg border border-line px-3 font-semibold" aria-label={`Protection record of ${b.label}`}>
                      Protections
                    </button>
                  )}
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
