import { Link } from 'react-router-dom';
import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { PROTECTION_TRAITS, type ProtectionResult } from '../../../../shared/schemas/protection-check';
import { formatProtectionValue } from '../../../components/ui/run-events-list';
import { formatCharge, formatDuration, formatEnergy, formatNumber, formatTemperature } from '../../../lib/units';
import { ProtectionOutcomeBadge } from '../../../components/ui/protection-outcome-badge';

/** A °C difference in the lab's unit (a span, so no 32° offset). */
const FAHRENHEIT_PER_CELSIUS = 1.8;

function tolerance(row: ProtectionResult, temperatureUnit: 'C' | 'F'): string {
  if (row.unit !== '°C') return `± ${formatNumber(row.thresholdTolerance, 2)} ${row.unit}`;
  const span = temperatureUnit === 'F' ? row.thresholdTolerance * FAHRENHEIT_PER_CELSIUS : row.thresholdTolerance;
  return `± ${formatNumber(span, 1)} °${temperatureUnit}`;
}

/** The link that opens the run page zoomed to the stretch showing one protection. */
export function windowHref(runId: number, window: ProtectionResult['window']): string | null {
  return window ? `/runs/${runId}?from=${Math.floor(window.fromSeconds)}&to=${Math.ceil(window.toSeconds)}` : null;
}

/** One row per temperature channel: lowest and highest, by the bench's label. */
export function TempChannels({ summary, temperatureUnit }: { summary: RunSummary; temperatureUnit: 'C' | 'F' }) {
  const channels = Object.entries(summary.tempChannels ?? {});
  if (channels.length === 0) return null;
  return (
    <p className="text-sm text-ink-muted">
      Temperatures by channel:{' '}
      {channels.map(([name, c], i) => (
        <span key={name} className="num text-ink">
          {i > 0 && ' · '}
          {name} {formatTemperature(c.minCelsius, temperatureUnit)} to {formatTemperature(c.maxCelsius, temperatureUnit)}
        </span>
      ))}
    </p>
  );
}

/**
 * A protection check's result: one row per protection, expected against measured with the
 * tolerance applied, pass or fail, and a link to the stretch of the run that shows it. No
 * capacity verdict; the energy and charge in and out are whole-run totals.
 */
export function ProtectionCheckPanel({ runId, summary, temperatureUnit, energyUnit }: { runId: number; summary: RunSummary; temperatureUnit: 'C' | 'F'; energyUnit: 'Wh' | 'kWh' }) {
  const rows = summary.protections ?? [];
  const value = (row: ProtectionResult, v: number | null) => formatProtectionValue(row.protection, v, temperatureUnit);
  return (
    <div className="flex flex-col gap-4">
      <h2 className="text-lg font-semibold">Protection check</h2>
      <p className="text-sm text-ink-muted">
        A protection check has no capacity verdict. Whole run: in {formatEnergy(summary.chargeWh, energyUnit)}, {formatCharge(summary.chargeAh)}; out{' '}
        {formatEnergy(summary.dischargeWh, energyUnit)}, {formatCharge(summary.dischargeAh)}; {formatDuration(summary.durationSeconds)}.
      </p>
      <TempChannels summary={summary} temperatureUnit={temperatureUnit} />
      {rows.length === 0 ? (
        <p className="text-ink-muted">No protections were listed for this run.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm" aria-label="Protections checked">
            <thead className="text-xs uppercase tracking-wider text-ink-muted">
              <tr>
                <th className="p-2">Protection</th>
                <th className="p-2">Expected</th>
                <th className="p-2">Measured</th>
                <th className="p-2">Tolerance</th>
                <th className="p-2">Released at, after</th>
                <th className="p-2">Result</th>
                <th className="p-2 print:hidden">Stretch</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => {
                const href = windowHref(runId, row.window);
                return (
                  <tr key={row.protection} className="border-t border-line align-top">
                    <th scope="row" className="p-2 font-semibold">
                      {PROTECTION_TRAITS[row.protection].label}
                      {row.channel && <span className="block text-xs font-normal text-ink-muted">on {row.channel}</span>}
                    </th>
                    <td className="num p-2">
                      {value(row, row.expectedValue)}
                      {row.expectedDelaySeconds !== null && <span className="block">after {formatDuration(row.expectedDelaySeconds)}</span>}
                    </td>
                    <td className="num p-2">
                      {value(row, row.measuredValue)}
                      {row.measuredDelaySeconds !== null && <span className="block">after {formatDuration(row.measuredDelaySeconds)}</span>}
                      {row.meanHeaterAmps !== null && <span className="block">heater mean {formatNumber(row.meanHeaterAmps, 2)} A, peak {formatNumber(row.peakHeaterAmps, 2)} A</span>}
                    </td>
                    <td className="num p-2">
                      {tolerance(row, temperatureUnit)}
                      <span className="block">± {formatNumber(row.delayToleranceSeconds, 1)} s</span>
                    </td>
                    <td className="num p-2">
                      {row.releaseValue === null ? '—' : `${value(row, row.releaseValue)}, ${formatDuration(row.resumeSeconds)}`}
                    </td>
                    <td className="p-2">
                      <ProtectionOutcomeBadge outcome={row.outcome} />
                      {row.notes.map((note) => (
                        <span key={note} className="mt-1 block text-xs text-ink-muted">
                          {note}
                        </span>
                      ))}
                    </td>
                    <td className="p-2 print:hidden">{href ? <Link to={href} className="font-semibold text-accent underline">Show on chart</Link> : '—'}</td>
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
