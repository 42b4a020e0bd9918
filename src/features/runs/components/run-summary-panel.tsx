import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { formatAmps, formatCharge, formatDuration, formatEnergy, formatNumber, formatPercent, formatTemperature, formatVolts, formatWatts } from '../../../lib/units';
import { ProtectionTripsTable } from './protection-trips-table';
import { CAPACITY_LABEL, INCOMPLETE_REASON, formatPercentOfRated, gapsText, rateText, temperatureText } from './summary-wording';
import { VerdictBadge } from './verdict-badge';

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="rounded-lg border border-line bg-surface-sunken p-3">
      <dt className="text-xs font-semibold uppercase tracking-wider text-ink-muted">{label}</dt>
      <dd className="num mt-1 text-xl font-bold">{value}</dd>
      {note && <dd className="mt-1 text-xs text-ink-muted">{note}</dd>}
    </div>
  );
}

/** The verdict with what it was judged on: the capacity and its basis, or why there is none; the test rate and temperature beside it. */
function VerdictLine({ summary: s, temperatureUnit, energyUnit }: { summary: RunSummary; temperatureUnit: 'C' | 'F'; energyUnit: 'Wh' | 'kWh' }) {
  const u = s.uncertainty;
  const basis = s.capacityEndedBy ? CAPACITY_LABEL[s.capacityEndedBy] : undefined;
  const reason = s.capacityEndedBy ? INCOMPLETE_REASON[s.capacityEndedBy] : undefined;
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-4">
        <VerdictBadge verdict={s.verdict} large />
        {reason ? (
          <p className="text-ink">{reason}</p>
        ) : (
          <p className="text-ink-muted">
            <span className="num text-ink">{formatPercentOfRated(s.percentRatedAh)}</span> of rated Ah ·{' '}
            <span className="num text-ink">{formatPercentOfRated(s.percentRatedWh)}</span> of rated Wh
            {basis && <> ({basis.toLowerCase()})</>} · acceptance <span className="num text-ink">{formatPercent(s.acceptancePercent, 0)}</span>
          </p>
        )}
      </div>
      {u && (
        <p className="text-sm text-ink-muted" aria-label="Uncertainty">
          Capacity ± <span className="num text-ink">{formatCharge(u.expandedAh)}</span>
          {u.expandedWh !== null && (
            <>
              {' '}/ ± <span className="num text-ink">{formatEnergy(u.expandedWh, energyUnit)}</span>
            </>
          )}{' '}
          (expanded, k = {u.coverageFactor}, ≈ 95 %) from the meter&apos;s stated accuracy, by JCGM 100 (GUM).
          {s.verdict === 'borderline' && ' The margin to the acceptance lies inside it: borderline, neither a clear pass nor a clear fail.'}
        </p>
      )}
      <p className="text-sm text-ink-muted" aria-label="Test conditions">
        Tested at <span className={s.rateOutsideStandard ? 'font-semibold text-caution' : 'text-ink'}>{rateText(s)}</span> ·{' '}
        <span className={s.tempOutsideStandard ? 'font-semibold text-caution' : 'text-ink'}>{temperatureText(s, temperatureUnit)}</span>
      </p>
    </div>
  );
}

/** A run's figures and verdict; a missing figure shows a dash, never a zero. The capacity and the whole-run totals are labelled apart. */
export function RunSummaryPanel({ summary, temperatureUnit, energyUnit, currency }: { summary: RunSummary; temperatureUnit: 'C' | 'F'; energyUnit: 'Wh' | 'kWh'; currency: string }) {
  const unit = (v: number | null, u: string, d = 2) => (v === null ? '—' : `${formatNumber(v, d)} ${u}`);
  const capacityLabel = (summary.capacityEndedBy && CAPACITY_LABEL[summary.capacityEndedBy]) ?? 'Capacity';
  const roundTrip =
    summary.roundTripStatus === 'incomplete' ? 'incomplete' : summary.roundTripEfficiency !== null ? formatPercent(summary.roundTripEfficiency * 100) : null;
  return (
    <div className="flex flex-col gap-4">
      <VerdictLine summary={summary} temperatureUnit={temperatureUnit} energyUnit={energyUnit} />
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure
          label={capacityLabel}
          value={summary.capacityAh === null ? '—' : formatCharge(summary.capacityAh)}
          note={summary.capacityWh === null ? 'not measured: see above' : `${formatEnergy(summary.capacityWh, energyUnit)}; the verdict uses this`}
        />
        <Figure label="Out, whole run" value={formatCharge(summary.dischargeAh)} note={`${formatEnergy(summary.dischargeWh, energyUnit)}; every discharge in the run`} />
        {summary.chargeAh > 0 && <Figure label="In, whole run" value={formatCharge(summary.chargeAh)} note={formatEnergy(summary.chargeWh, energyUnit)} />}
        <Figure label="Duration" value={formatDuration(summary.durationSeconds)} />
        <Figure label="Mean power under load" value={formatWatts(summary.meanWatts)} />
        <Figure label="Mean volts under load" value={formatVolts(summary.meanVolts)} />
        <Figure label="Mean amps under load" value={formatAmps(summary.meanAmps)} note={summary.loadOnAmps === null ? undefined : `load: ${formatAmps(summary.loadOnAmps)} or more`} />
        <Figure label="Test rate" value={unit(summary.cRate, 'C')} />
        <Figure
          label="Cutoff"
          value={summary.cutoffVolts === null ? '—' : formatVolts(summary.cutoffVolts)}
          note={summary.cutoffCause === null ? undefined : summary.cutoffCause === 'protection' ? 'pack protection' : 'end voltage'}
        />
        <Figure label="First trip reconnected after" value={formatDuration(summary.recoverySeconds)} />
        <Figure label="Max temperature, any channel" value={formatTemperature(summary.maxTempCelsius, temperatureUnit)} />
        <Figure
          label="Internal resistance"
          value={summary.internalResistanceOhms === null ? '—' : `${formatNumber(summary.internalResistanceOhms * 1000, 1)} mΩ`}
          note={summary.loadStepCount === 0 ? 'no load steps in the run' : `median of ${summary.loadStepCount} load step${summary.loadStepCount === 1 ? '' : 's'}`}
        />
        <Figure label="Energy density" value={unit(summary.whPerKg, 'Wh/kg', 1)} />
        {summary.correctedAh25C !== null && <Figure label="Corrected to 25 °C" value={formatCharge(summary.correctedAh25C)} />}
        {roundTrip !== null && (
          <Figure
            label="Round trip"
            value={roundTrip}
            note={summary.roundTripStatus === 'incomplete' ? 'the charge after the discharge was partial' : 'first discharge ÷ the full charge after it'}
          />
        )}
        {summary.costPerKWh !== null && <Figure label="Price per kWh" value={`${formatNumber(summary.costPerKWh, 2)} ${currency}`} />}
        <Figure label="Gaps" value={`${summary.gaps}`} note={gapsText(summary)} />
      </dl>
      <ProtectionTripsTable trips={summary.protectionTrips} count={summary.protectionTripCount} />
    </div>
  );
}
