import { useQueries } from '@tanstack/react-query';
import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { CompareChart, type CompareSeries } from '../../../components/charts/compare-chart';
import { Card, PageHeader } from '../../../components/ui/card';
import { RunStateBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { useLabSettings } from '../../../lib/lab-settings';
import { COMPARE_COLORS } from '../../../lib/palette';
import { formatCharge, formatDuration, formatEnergy, formatPercent, formatVolts } from '../../../lib/units';
import { runQueryOptions } from '../api/get-run';
import { samplesQueryOptions } from '../api/get-run-samples';
import { VerdictBadge } from './verdict-badge';

/** Buckets per run: a compare chart needs the shape, not every reading. */
const COMPARE_MAX_POINTS = 800;
/** Columns a phone keeps in the comparison table (the rest read under the run's name). */
const PHONE_COLUMNS = new Set(['Run', 'Of rated', 'Verdict']);
/** Most runs one chart stays readable with. */
export const MAX_COMPARED_RUNS = 4;

/** Runs side by side: their voltage curves on one chart and their figures in one table. */
export function RunCompare({ runIds }: { runIds: readonly number[] }) {
  const settings = useLabSettings();
  const runs = useQueries({ queries: runIds.map((id) => runQueryOptions(id)) });
  const samples = useQueries({ queries: runIds.map((id) => samplesQueryOptions(id, { from: null, to: null }, COMPARE_MAX_POINTS)) });
  const failed = [...runs, ...samples].find((q) => q.isError);
  const ready = runs.every((q) => q.data) && samples.every((q) => q.data);
  const sampleData = samples.map((q) => q.data);
  const runData = runs.map((q) => q.data);
  // Rebuild the chart only when an answer changed, not on every render.
  const version = [...runs, ...samples].map((q) => q.dataUpdatedAt).join(',');

  const series: CompareSeries[] = useMemo(
    () =>
      ready
        ? sampleData.map((s, i) => ({
            label: runData[i]!.name,
            t: s!.t,
            // The lower edge of each bucket: the knee and the cutoff are what a comparison is about.
            volts: s!.volts.min,
          }))
        : [],
    [version], // eslint-disable-line react-hooks/exhaustive-deps
  );

  if (failed) return <QueryError error={failed.error} what="These runs" />;
  if (!ready) return <Loading label="Loading runs to compare…" />;

  return (
    <>
      <PageHeader title="Compare runs" subtitle="Pack voltage against run time; figures from each run's own summary." />
      <div className="flex flex-col gap-4">
        <Card>
          <CompareChart series={series} />
        </Card>
        <div className="overflow-x-auto rounded-xl border border-line">
          <table className="w-full text-left text-sm">
            <thead className="bg-surface-sunken text-ink-muted">
              <tr>
                {['Run', 'State', 'Energy', 'Charge', 'Of rated', 'Duration', 'Cutoff', 'Verdict'].map((h) => (
                  <th key={h} className={`px-3 py-3 font-semibold ${PHONE_COLUMNS.has(h) ? '' : 'hidden md:table-cell'}`}>
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {runData.map((r, i) => (
                <tr key={r!.id} className="border-t border-line bg-surface-raised">
                  <td className="px-3 py-3">
                    <span className="mr-2 inline-block h-3 w-3 rounded-full" style={{ backgroundColor: COMPARE_COLORS[i % COMPARE_COLORS.length] }} aria-hidden="true" />
                    <Link to={`/runs/${r!.id}`} className="inline-flex min-h-11 items-center font-semibold text-accent hover:underline">
                      {r!.name}
                    </Link>
                    {/* On a phone the figure columns step aside and read under the name. */}
                    <span className="num mt-1 block text-ink-muted md:hidden">
                      {formatCharge(r!.summary?.dischargeAh)} · {formatEnergy(r!.summary?.dischargeWh, settings.energyUnit)} · {formatDuration(r!.summary?.durationSeconds)}
                    </span>
                  </td>
                  <td className="hidden px-3 py-3 md:table-cell">
                    <RunStateBadge state={r!.state} />
                  </td>
                  <td className="num hidden whitespace-nowrap px-3 py-3 md:table-cell">{formatEnergy(r!.summary?.dischargeWh, settings.energyUnit)}</td>
                  <td className="num hidden whitespace-nowrap px-3 py-3 md:table-cell">{formatCharge(r!.summary?.dischargeAh)}</td>
                  <td className="num whitespace-nowrap px-3 py-3">{formatPercent(r!.summary?.percentRatedAh)}</td>
                  <td className="num hidden whitespace-nowrap px-3 py-3 md:table-cell">{formatDuration(r!.summary?.durationSeconds)}</td>
                  <td className="num hidden whitespace-nowrap px-3 py-3 md:table-cell">{formatVolts(r!.summary?.cutoffVolts)}</td>
                  <td className="px-3 py-3">{r!.summary ? <VerdictBadge verdict={r!.summary.verdict} /> : '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </>
  );
}
