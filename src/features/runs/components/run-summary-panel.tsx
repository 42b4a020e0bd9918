import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { formatAmps, formatCharge, formatDuration, formatEnergy, formatNumber, formatPercent, formatTemperature, formatVolts, formatWatts } from '../../../lib/units';
import { VerdictBadge } from './verdict-badge';

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <div className="rounded-lg border border-line bg-surface-sunken p-3">
      <dt className="text-xs font-semibold uppercase tracking-wider text-ink-muted">{label}</dt>
      <dd className="num mt-1 text-xl font-bold">{value}</dd>
    </div>
  );
}

/** A run's figures and verdict; a missing figure shows a dash, never a zero. */
export function RunSummaryPanel({ summary, temperatureUnit, energyUnit }: { summary: RunSummary; temperatureUnit: 'C' | 'F'; energyUnit: 'Wh' | 'kWh' }) {
  const unit = (v: number | null, u: string, d = 2) => (v === null ? '—' : `${formatNumber(v, d)} ${u}`);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-4">
        <VerdictBadge verdict={summary.verdict} large />
        <p className="text-ink-muted">
          <span className="num text-ink">{formatPercent(summary.percentRatedAh)}</span> of rated Ah ·{' '}
          <span className="num text-ink">{formatPercent(summary.percentRatedWh)}</span> of rated Wh · acceptance{' '}
          <span className="num text-ink">{formatPercent(summary.acceptancePercent, 0)}</span>
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure label="Energy out" value={formatEnergy(summary.dischargeWh, energyUnit)} />
        <Figure label="Charge out" value={formatCharge(summary.dischargeAh)} />
        {/* What a charge showed live as "Charged in" is on the report too (whole-run totals). */}
        {summary.chargeAh > 0 && <Figure label="Energy in" value={formatEnergy(summary.chargeWh, energyUnit)} />}
        {summary.chargeAh > 0 && <Figure label="Charge in" value={formatCharge(summary.chargeAh)} />}
        <Figure label="Duration" value={formatDuration(summary.durationSeconds)} />
        <Figure label="Mean power" value={formatWatts(summary.meanWatts)} />
        <Figure label="Mean volts" value={formatVolts(summary.meanVolts)} />
        <Figure label="Mean amps" value={formatAmps(summary.meanAmps)} />
        <Figure label="C-rate" value={unit(summary.cRate, 'C')} />
        <Figure label="Cutoff" value={summary.cutoffVolts === null ? '—' : `${formatVolts(summary.cutoffVolts)} (${summary.cutoffCause === 'protection' ? 'protection' : 'end voltage'})`} />
        <Figure label="Recovery" value={formatDuration(summary.recoverySeconds)} />
        <Figure label="Max temperature" value={formatTemperature(summary.maxTempCelsius, temperatureUnit)} />
        <Figure label="Internal resistance" value={summary.internalResistanceOhms === null ? '—' : `${formatNumber(summary.internalResistanceOhms * 1000, 1)} mΩ`} />
        <Figure label="Energy density" value={unit(summary.whPerKg, 'Wh/kg', 1)} />
        {summary.correctedAh25C !== null && <Figure label="Corrected to 25 °C" value={formatCharge(summary.correctedAh25C)} />}
        {summary.roundTripEfficiency !== null && <Figure label="Round trip" value={formatPercent(summary.roundTripEfficiency * 100)} />}
        {summary.costPerKWh !== null && <Figure label="Price per kWh (pack's currency)" value={formatNumber(summary.costPerKWh, 2)} />}
        <Figure label="Gaps" value={`${summary.gaps} (${formatDuration(summary.gapSeconds)})`} />
      </dl>
    </div>
  );
}
