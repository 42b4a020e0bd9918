import { BigNumber } from '../../../components/ui/big-number';
import { ReadingAgeNote } from '../../../components/ui/reading-age-note';
import type { LiveView } from '../../../lib/live-store';
import { SIGNAL_COLORS } from '../../../lib/palette';
import { formatAmps, formatCharge, formatElapsedClock, formatEnergy, formatTemperature, formatVolts, formatWatts } from '../../../lib/units';

/** Below these, a reading is meter noise around zero, not a charge. */
const CHARGING_BELOW_AMPS = -0.1;
/** Below this, energy the other way is noise around zero current, not worth a line. */
const SHOW_OTHER_WAY_FROM_WH = 0.1;

interface Props {
  view: LiveView;
  temperatureUnit: 'C' | 'F';
  energyUnit: 'Wh' | 'kWh';
  size?: 'lg' | 'room';
  /** The meter has gone quiet: the numbers are the last ones seen, and look it. */
  stale?: boolean;
  /** How old the newest reading is (s), said beside stale numbers. */
  ageSeconds?: number | null;
  /** False on a bench with no run: there is nothing to total, and no run time. */
  totals?: boolean;
}

/** The instantaneous numbers and the running totals, every one with its unit. */
export function Readouts({ view, temperatureUnit, energyUnit, size = 'lg', stale = false, ageSeconds = null, totals = true }: Props) {
  const tempUnit = temperatureUnit === 'F' ? '°F' : '°C';
  const charging = (view.amps ?? 0) < CHARGING_BELOW_AMPS;
  // A charge run counts what goes in; every other run counts what comes out.
  const chargeRun = view.run?.kind === 'charge';
  const main = chargeRun
    ? { energyLabel: 'Energy in', chargeLabel: 'Charge in', wh: view.chargeWh, ah: view.chargeAh }
    : { energyLabel: 'Energy out', chargeLabel: 'Charge out', wh: view.dischargeWh, ah: view.dischargeAh };
  const other = chargeRun
    ? { label: 'Discharged', wh: view.dischargeWh, ah: view.dischargeAh }
    : { label: 'Charged in', wh: view.chargeWh, ah: view.chargeAh };
  const totalsSize = size === 'room' ? 'room-small' : 'md';
  return (
    // Stale numbers are dimmed to the faint ink (still 4.5:1, WCAG 2.2 AA) and say their age.
    <div className="flex flex-col gap-6">
      {stale && <ReadingAgeNote ageSeconds={ageSeconds} />}
      <div className={`grid gap-6 ${size === 'room' ? 'grid-cols-2' : 'grid-cols-2 lg:grid-cols-4'}`}>
        <BigNumber label="Volts" text={formatVolts(view.volts)} unit="V" color={SIGNAL_COLORS.volts} size={size} stale={stale} />
        <BigNumber label={charging ? 'Amps (charging)' : 'Amps'} text={formatAmps(view.amps)} unit="A" color={SIGNAL_COLORS.amps} size={size} stale={stale} />
        <BigNumber label="Watts" text={formatWatts(view.watts)} unit="W" color={SIGNAL_COLORS.watts} size={size} stale={stale} />
        <BigNumber
          label={view.tempChannel ? `Temp ${view.tempChannel}` : 'Temp'}
          text={formatTemperature(view.tempCelsius, temperatureUnit)}
          unit={tempUnit}
          color={SIGNAL_COLORS.temp}
          size={size}
          stale={stale}
        />
      </div>
      {totals && (
        <div className="grid grid-cols-2 gap-6 border-t border-line pt-4 sm:grid-cols-3">
          <BigNumber label={main.energyLabel} text={formatEnergy(main.wh, energyUnit)} unit={energyUnit} size={totalsSize} />
          <BigNumber label={main.chargeLabel} text={formatCharge(main.ah)} unit="Ah" size={totalsSize} />
          {/* On a phone the clock takes a row of its own: eight digits do not fit a third. */}
          <div className="col-span-2 sm:col-span-1">
            <BigNumber label="Run time" text={view.time === null ? '—' : `${formatElapsedClock(view.time)} h:m:s`} unit="h:m:s" size={totalsSize} />
          </div>
        </div>
      )}
      {totals && (
        // The running totals are the whole run's (every discharge), not the capacity to the end
        // voltage that the verdict uses: said once, under the numbers.
        <p className="text-sm text-ink-muted">
          {chargeRun ? 'Totals of the whole run.' : 'Totals of the whole run; the verdict uses the capacity to the end voltage.'}
        </p>
      )}
      {totals && (other.wh ?? 0) >= SHOW_OTHER_WAY_FROM_WH && (
        <p className="text-sm text-ink-muted">
          {other.label}: <span className="num">{formatEnergy(other.wh, energyUnit)}</span>, <span className="num">{formatCharge(other.ah)}</span>
        </p>
      )}
    </div>
  );
}
