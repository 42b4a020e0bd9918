import type { RoundTripPair, StepResult } from '../../../../shared/schemas/programme-run';
import { formatCharge, formatDuration, formatEnergy, formatPercent, formatVolts } from '../../../lib/units';

const OUTCOME_WORD = { done: 'done', skipped: 'skipped', failed: 'failed safe', aborted: 'aborted' } as const;
const PERCENT = 100;

/** Each finished step's charge in and discharge out, and the round trips they make. */
export function StepResultsTable({ results, roundTrips, labels }: { results: readonly StepResult[]; roundTrips: readonly RoundTripPair[]; labels: readonly string[] }) {
  if (results.length === 0) return <p className="text-sm text-ink-muted">No step has finished yet.</p>;
  return (
    <div className="flex flex-col gap-3">
      <div className="overflow-x-auto">
        <table className="w-full text-sm" aria-label="Step results">
          <thead className="text-left text-ink-muted">
            <tr>
              <th className="p-2">Step</th>
              <th className="p-2">Outcome</th>
              <th className="p-2">Time</th>
              <th className="p-2">In</th>
              <th className="p-2">Out</th>
              <th className="p-2">End</th>
            </tr>
          </thead>
          <tbody>
            {results.map((r) => (
              <tr key={r.index} className="border-t border-line">
                <td className="p-2">{r.label}</td>
                <td className="p-2">
                  {OUTCOME_WORD[r.outcome]}: {r.reason}
                </td>
                <td className="num p-2">{formatDuration(r.endElapsedSeconds - r.startElapsedSeconds)}</td>
                <td className="num p-2">
                  {formatCharge(r.chargeAh)} · {formatEnergy(r.chargeWh)}
                </td>
                <td className="num p-2">
                  {formatCharge(r.dischargeAh)} · {formatEnergy(r.dischargeWh)}
                </td>
                <td className="num p-2">{formatVolts(r.endVolts, 3)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {roundTrips.length > 0 && (
        <ul aria-label="Round trips" className="text-sm">
          {roundTrips.map((t) => (
            <li key={`${t.dischargeIndex}-${t.chargeIndex}`}>
              Round trip {labels[t.dischargeIndex]} → {labels[t.chargeIndex]}: energy {formatPercent(t.energyEfficiency * PERCENT)}, charge (coulombic) {formatPercent(t.coulombicEfficiency * PERCENT)}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
