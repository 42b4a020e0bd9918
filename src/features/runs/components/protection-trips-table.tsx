import type { ProtectionTrip } from '../../../../shared/schemas/run-summary';
import { formatCharge, formatDuration, formatElapsedClock, formatVolts } from '../../../lib/units';

/** The protection trips on the way, one line each: when, after how much, and how long until it reconnected. */
export function ProtectionTripsTable({ trips, count }: { trips: ProtectionTrip[]; count: number }) {
  if (count === 0) return null;
  return (
    <section aria-label="Protection trips" className="rounded-lg border border-line p-3">
      <h3 className="text-sm font-semibold">
        Protection trips on the way: <span className="num">{count}</span>
        {count > trips.length && <span className="text-ink-muted"> (first {trips.length} listed)</span>}
      </h3>
      <table className="num mt-2 w-full text-left text-sm">
        <thead className="text-xs uppercase tracking-wider text-ink-muted">
          <tr>
            <th className="py-1 pr-3 font-semibold">Run time</th>
            <th className="py-1 pr-3 font-semibold">Out by then</th>
            <th className="py-1 pr-3 font-semibold">Last volts under load</th>
            <th className="py-1 pr-3 font-semibold">Seen as</th>
            <th className="py-1 font-semibold">Reconnected after</th>
          </tr>
        </thead>
        <tbody>
          {trips.map((trip) => (
            <tr key={trip.elapsedSeconds} className="border-t border-line">
              <td className="py-1 pr-3">{formatElapsedClock(trip.elapsedSeconds)}</td>
              <td className="py-1 pr-3">{formatCharge(trip.dischargeAh)}</td>
              <td className="py-1 pr-3">{formatVolts(trip.volts)}</td>
              <td className="py-1 pr-3">{trip.signal === 'voltage-collapse' ? 'voltage collapsed' : 'current stopped with the load on'}</td>
              <td className="py-1">{trip.recoverySeconds === null ? 'did not reconnect' : formatDuration(trip.recoverySeconds)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
