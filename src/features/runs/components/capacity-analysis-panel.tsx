import { useQuery } from '@tanstack/react-query';
import { useId, useMemo, useState } from 'react';
import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatAmps, formatCharge, formatDuration, SECONDS_PER_HOUR } from '../../../lib/units';
import { readingsQueryOptions } from '../api/get-run-readings';
import { defaultPeukertExponent, runIncrementalCapacity, runtimeEstimates } from './capacity-analysis';
import { IncrementalCapacityChart } from './incremental-capacity-chart';

/** Buckets of delivered Ah read for dQ/dV: fine enough for millivolt bins on a long discharge. */
const IC_MAX_POINTS = 4_000;
/** Bounds of the exponent a person may type: below 1 or far above lead-acid's is no battery. */
const MIN_PEUKERT_K = 1;
const MAX_PEUKERT_K = 2;
const PEUKERT_K_STEP = 0.01;

/**
 * Two readings of a finished capacity run: its incremental-capacity curve (dQ/dV against
 * volts) and how long the pack would last at other currents by Peukert's law.
 */
export function CapacityAnalysisPanel({ runId, summary }: { runId: number; summary: RunSummary }) {
  const capacityAh = summary.capacityAh;
  const testAmps = summary.meanAmps;
  const readings = useQuery({ ...readingsQueryOptions(runId, { from: null, to: null }, IC_MAX_POINTS, 'ah'), enabled: capacityAh !== null });
  const ic = useMemo(
    () => (readings.data && capacityAh !== null ? runIncrementalCapacity(readings.data, capacityAh, summary.cellsInSeries) : null),
    [readings.data, capacityAh, summary.cellsInSeries],
  );
  if (capacityAh === null || !(capacityAh > 0) || testAmps === null || !(testAmps > 0)) return null;
  return (
    <section className="flex flex-col gap-4" aria-label="Capacity analysis">
      <div>
        <h2 className="font-semibold">Incremental capacity (dQ/dV)</h2>
        <p className="text-sm text-ink-muted">
          Ah delivered per volt of terminal voltage, to the end voltage. Peaks are the plateaus of the discharge; on a later
          test of the same pack a lower or shifted peak shows lost capacity.
        </p>
        {readings.isPending ? (
          <Loading label="Loading readings…" />
        ) : readings.isError ? (
          <QueryError error={readings.error} what="Readings" />
        ) : ic && ic.volts.length > 0 ? (
          <IncrementalCapacityChart volts={ic.volts} dQdV={ic.dQdV} />
        ) : (
          <p className="text-sm text-ink-muted">Too few readings between the start and the end voltage for a curve.</p>
        )}
      </div>
      <PeukertTable capacityAh={capacityAh} testAmps={testAmps} ratedAh={summary.ratedAh} chemistry={summary.chemistry} />
    </section>
  );
}

function PeukertTable({ capacityAh, testAmps, ratedAh, chemistry }: { capacityAh: number; testAmps: number; ratedAh: number | null; chemistry: RunSummary['chemistry'] }) {
  const [k, setK] = useState(() => defaultPeukertExponent(chemistry));
  const id = useId();
  const valid = k >= MIN_PEUKERT_K && k <= MAX_PEUKERT_K;
  const rows = valid ? runtimeEstimates(capacityAh, testAmps, ratedAh, k) : [];
  return (
    <div>
      <h2 className="font-semibold">Run time at other currents (estimate)</h2>
      <p className="text-sm text-ink-muted">
        From this test ({formatCharge(capacityAh)} at {formatAmps(testAmps)}) by Peukert&apos;s law (W. Peukert, 1897): I<sup>k</sup>·t stays
        constant, so t = t<sub>test</sub>·(I<sub>test</sub>/I)<sup>k</sup>. Peukert found it for lead-acid cells at constant current
        and temperature. Lithium cells have k close to 1 and their capacity at high currents is set mostly by temperature, the end
        voltage and the protection, which the law does not know: treat these figures as a guide and confirm them with a test at
        the current you need.
      </p>
      <div className="my-2 max-w-48">
        <label htmlFor={id} className="text-sm font-medium text-ink-muted">
          Peukert exponent k
        </label>
        <input
          id={id}
          type="number"
          min={MIN_PEUKERT_K}
          max={MAX_PEUKERT_K}
          step={PEUKERT_K_STEP}
          value={k}
          onChange={(e) => setK(e.target.valueAsNumber)}
          className="w-full min-h-11 rounded-lg border bg-surface-sunken px-3 text-base text-ink"
        />
      </div>
      {!valid ? (
        <p role="alert" className="text-sm text-state-cutoff">
          k must be between {MIN_PEUKERT_K} and {MAX_PEUKERT_K}.
        </p>
      ) : (
        <table className="text-sm" data-testid="peukert-table">
          <thead>
            <tr className="text-left text-ink-muted">
              <th className="pr-6 font-medium">Current</th>
              <th className="pr-6 font-medium">Rate</th>
              <th className="font-medium">Run time</th>
            </tr>
          </thead>
          <tbody className="num">
            {rows.map((r) => (
              <tr key={r.amps}>
                <td className="pr-6">{formatAmps(r.amps)}</td>
                <td className="pr-6">{r.cRate === null ? `${(r.amps / testAmps).toFixed(2)} × test` : `${r.cRate} C`}</td>
                <td>{formatDuration(r.hours * SECONDS_PER_HOUR)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
