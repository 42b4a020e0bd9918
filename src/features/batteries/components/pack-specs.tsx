import type { Battery } from '../../../../shared/schemas/battery';
import { useLabSettings } from '../../../lib/lab-settings';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';
import { formatCharge, formatEnergy, formatNumber, NO_VALUE } from '../../../lib/units';

const MONTHS_PER_YEAR = 12;

/** "18 months" or "5 years" (whole years read better on a warranty). */
function formatWarranty(months: number | null): string {
  if (months === null) return NO_VALUE;
  if (months > 0 && months % MONTHS_PER_YEAR === 0) return `${months / MONTHS_PER_YEAR} ${months === MONTHS_PER_YEAR ? 'year' : 'years'}`;
  return `${months} ${months === 1 ? 'month' : 'months'}`;
}

/** "480 × 410 × 190 mm", with a dash for an unknown side. */
function formatDimensions(b: Battery): string {
  const sides = [b.lengthMm, b.widthMm, b.heightMm];
  if (sides.every((s) => s === null)) return NO_VALUE;
  return `${sides.map((s) => (s === null ? '?' : formatNumber(s, 0))).join(' × ')} mm`;
}

/** The pack's specification and register fields, every number with its unit. */
export function PackSpecs({ battery: b }: { battery: Battery }) {
  const { energyUnit } = useLabSettings();
  const rows: [string, string][] = [
    ['Brand / model', [b.brand, b.model].filter(Boolean).join(' ')],
    ['Chemistry', CHEMISTRY_LABEL[b.chemistry]],
    ['Cells', `${b.cellsInSeries}S${b.cellsInParallel > 1 ? `${b.cellsInParallel}P` : ''}`],
    ['Rated capacity', formatCharge(b.ratedAh)],
    ['Rated energy', b.ratedWh === null ? NO_VALUE : formatEnergy(b.ratedWh, energyUnit)],
    ['Protection current', b.bmsRatedAmps === null ? NO_VALUE : `${formatNumber(b.bmsRatedAmps, 0)} A`],
    ['Mass', b.massKg === null ? NO_VALUE : `${formatNumber(b.massKg, 2)} kg`],
    ['Dimensions (L × W × H)', formatDimensions(b)],
    ['Terminals', b.terminalType ?? NO_VALUE],
    ['Stated cycle life', b.statedCycleLife === null ? NO_VALUE : `${b.statedCycleLife} cycles`],
    ['Warranty', formatWarranty(b.warrantyMonths)],
    ['Price', b.price === null ? NO_VALUE : `${formatNumber(b.price, 2)} ${b.priceCurrency ?? ''}`.trim()],
    ['Serial number', b.serialNumber ?? NO_VALUE],
    ['Sent by', b.sender ?? NO_VALUE],
    ['Owner or client', b.owner ?? NO_VALUE],
    ['Received', b.receivedOn ?? NO_VALUE],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-2 lg:grid-cols-3">
      {rows.map(([label, value]) => (
        <div key={label} className="min-w-0">
          <dt className="text-xs font-medium uppercase tracking-wide text-ink-muted">{label}</dt>
          <dd className="num break-words text-base">{value}</dd>
        </div>
      ))}
    </dl>
  );
}
