import { useQueries } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import type { Run } from '../../../../shared/schemas/run';
import { COMPARE_AXES, CompareChart, type CompareAxis, type CompareSeries } from '../../../components/charts/compare-chart';
import { Card, PageHeader } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { useLabSettings } from '../../../lib/lab-settings';
import { COMPARE_COLORS } from '../../../lib/palette';
import { formatCharge, formatDuration, formatEnergy, formatNumber, formatVolts } from '../../../lib/units';
import { runQueryOptions } from '../api/get-run';
import { readingsQueryOptions, type ReadingAxis } from '../api/get-run-readings';
import { VerdictBadge } from './verdict-badge';
import { formatPercentOfRated } from './summary-wording';

/** Buckets per run: a compare chart needs the shape, not every reading. */
const COMPARE_MAX_POINTS = 800;
/** Columns a phone keeps in the comparison table (the rest read under the run's name). */
const PHONE_COLUMNS = new Set(['run', 'percentRated', 'verdict']);
/** Most runs one chart stays readable with. */
export const MAX_COMPARED_RUNS = 4;
/** The rating as a share of itself, %. */
const FULL_RATING_PERCENT = 100;

/** The readings axis each chart axis is drawn from (% of rated is delivered Ah over rated Ah). */
const READINGS_AXIS: Record<CompareAxis, ReadingAxis> = { time: 'elapsedSeconds', ah: 'ah', wh: 'wh', percent: 'ah' };
/** The axis choices in the order offered. */
const AXIS_CHOICES: { axis: CompareAxis; label: string }[] = [
  { axis: 'ah', label: 'Ah' },
  { axis: 'wh', label: 'Wh' },
  { axis: 'percent', label: '% of rated' },
  { axis: 'time', label: 'Run time' },
];

/** Where the ratings sit on the chosen axis: each distinct rated Ah or Wh, or 100 %. */
export function ratingMarkers(axis: CompareAxis, runs: readonly Run[]): number[] {
  if (axis === 'percent') return [FULL_RATING_PERCENT];
  if (axis === 'time') return [];
  const rated = runs.map((r) => (axis === 'ah' ? r.summary?.ratedAh : r.summary?.ratedWh)).filter((v): v is number => v != null && v > 0);
  return [...new Set(rated)].sort((a, b) => a - b);
}

/** A run's delivered Ah positions as % of its rated Ah (empty when the rating is unknown). */
export function toPercentOfRated(ahPositions: readonly number[], ratedAh: number | null | undefined): number[] {
  if (!ratedAh || ratedAh <= 0) return [];
  return ahPositions.map((ah) => (ah / ratedAh) * FULL_RATING_PERCENT);
}

interface Row {
  run: Run;
  color: string;
}
const col = createColumnHelper<Row>();
/** Sorts with unknown figures last, whichever the direction. */
const num = (v: number | null | undefined): number | undefined => (v == null ? undefined : v);

/** Runs side by side: their voltage curves on one chart and their figures in one sortable table. */
export function RunCompare({ runIds, title = 'Compare runs' }: { runIds: readonly number[]; title?: string }) {
  const settings = useLabSettings();
  const [axis, setAxis] = useState<CompareAxis>('ah');
  const [sorting, setSorting] = useState<SortingState>([]);
  const runs = useQueries({ queries: runIds.map((id) => runQueryOptions(id)) });
  const readings = useQueries({ queries: runIds.map((id) => readingsQueryOptions(id, { from: null, to: null }, COMPARE_MAX_POINTS, READINGS_AXIS[axis])) });
  const failed = [...runs, ...readings].find((q) => q.isError);
  const ready = runs.every((q) => q.data) && readings.every((q) => q.data);
  const readingsData = readings.map((q) => q.data);
  const runData = runs.map((q) => q.data);
  // Rebuild the chart only when an answer changed, not on every render.
  const version = [...runs, ...readings].map((q) => q.dataUpdatedAt).join(',') + axis;

  const series: CompareSeries[] = useMemo(
    () =>
      ready
        ? readingsData.map((s, i) => {
            const r = runData[i]!;
            const x = axis === 'percent' ? toPercentOfRated(s!.x, r.summary?.ratedAh) : s!.x;
            // The lower edge of each bucket: the knee and the cutoff are what a comparison is about.
            return { label: r.name, x, volts: x.length ? s!.volts.min : [] };
          })
        : [],
    [version], // eslint-disable-line react-hooks/exhaustive-deps
  );
  const markers = useMemo(() => (ready ? ratingMarkers(axis, runData as Run[]) : []), [version]); // eslint-disable-line react-hooks/exhaustive-deps

  const rows: Row[] = useMemo(
    () => (ready ? runData.map((r, i) => ({ run: r!, color: COMPARE_COLORS[i % COMPARE_COLORS.length]! })) : []),
    [version], // eslint-disable-line react-hooks/exhaustive-deps
  );
  const columns = useMemo(
    () => [
      col.accessor((r) => r.run.name, {
        id: 'run',
        header: 'Run',
        cell: ({ row }) => {
          const r = row.original.run;
          return (
            <>
              <span className="mr-2 inline-block h-3 w-3 rounded-full" style={{ backgroundColor: row.original.color }} aria-hidden="true" />
              <Link to={`/runs/${r.id}`} className="inline-flex min-h-11 items-center font-semibold text-accent hover:underline">
                {r.name}
              </Link>
              {/* On a phone the figure columns step aside and read under the name. */}
              <span className="num mt-1 block text-ink-muted md:hidden">
                {formatEnergy(r.summary?.capacityWh, settings.energyUnit)} · {formatCharge(r.summary?.capacityAh)} · {formatDuration(r.summary?.durationSeconds)}
              </span>
            </>
          );
        },
      }),
      col.accessor((r) => num(r.run.summary?.capacityWh), { id: 'wh', header: 'Delivered (Wh)', sortUndefined: 'last', cell: (c) => formatEnergy(c.getValue(), settings.energyUnit) }),
      col.accessor((r) => num(r.run.summary?.capacityAh), { id: 'ah', header: 'Delivered (Ah)', sortUndefined: 'last', cell: (c) => formatCharge(c.getValue()) }),
      col.accessor((r) => num(r.run.summary?.percentRatedAh), { id: 'percentRated', header: '% of rated', sortUndefined: 'last', cell: (c) => formatPercentOfRated(c.getValue() ?? null) }),
      col.accessor((r) => num(r.run.summary?.meanVolts), { id: 'meanVolts', header: 'Mean (V)', sortUndefined: 'last', cell: (c) => formatVolts(c.getValue()) }),
      col.accessor((r) => num(r.run.summary?.recoverySeconds), { id: 'recovery', header: 'Recovery', sortUndefined: 'last', cell: (c) => formatDuration(c.getValue()) }),
      col.accessor((r) => num(r.run.summary?.costPerKWh), {
        id: 'costPerKWh',
        header: `Cost per kWh (${settings.currency})`,
        sortUndefined: 'last',
        cell: (c) => (c.getValue() === undefined ? '—' : `${formatNumber(c.getValue()!, 2)} ${settings.currency}/kWh`),
      }),
      col.accessor((r) => num(r.run.summary?.whPerKg), { id: 'whPerKg', header: 'Wh/kg', sortUndefined: 'last', cell: (c) => (c.getValue() === undefined ? '—' : `${formatNumber(c.getValue()!, 1)} Wh/kg`) }),
      col.display({ id: 'verdict', header: 'Verdict', cell: ({ row }) => (row.original.run.summary ? <VerdictBadge verdict={row.original.run.summary.verdict} /> : '—') }),
    ],
    [settings.energyUnit, settings.currency],
  );
  const table = useReactTable({ data: rows, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });

  if (failed) return <QueryError error={failed.error} what="These runs" />;
  if (!ready) return <Loading label="Loading runs to compare…" />;

  const against = axis === 'time' ? 'run time' : axis === 'percent' ? '% of rated Ah' : `delivered ${axis === 'ah' ? 'Ah' : 'Wh'}`;
  return (
    <>
      <PageHeader title={title} subtitle={`Pack voltage against ${against}; figures from each run's own summary.`} />
      <div className="flex flex-col gap-4">
        <Card>
          <fieldset className="mb-3 flex flex-wrap items-center gap-2">
            <legend className="sr-only">Chart voltage against</legend>
            <span aria-hidden="true" className="text-sm text-ink-muted">
              Against
            </span>
            {AXIS_CHOICES.map((c) => (
              <label key={c.axis} className={`inline-flex min-h-11 min-w-11 cursor-pointer items-center justify-center rounded-lg border px-3 text-sm ${axis === c.axis ? 'border-accent font-semibold text-accent' : 'border-line'}`}>
                <input type="radio" name="compare-axis" value={c.axis} checked={axis === c.axis} onChange={() => setAxis(c.axis)} className="sr-only" />
                {c.label}
              </label>
            ))}
          </fieldset>
          <CompareChart series={series} axis={axis} markers={markers} />
          {markers.length > 0 && (
            <p className="mt-2 text-sm text-ink-muted" data-testid="rating-marker-note">
              Dashed line: {axis === 'percent' ? '100 % of rated' : `rated ${markers.map((m) => COMPARE_AXES[axis].format(m)).join(', ')}`}
            </p>
          )}
        </Card>
        <div className="overflow-x-auto rounded-xl border border-line">
          <table className="w-full text-left text-sm">
            <thead className="bg-surface-sunken text-ink-muted">
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const sorted = h.column.getIsSorted();
                    return (
                      <th
                        key={h.id}
                        aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                        className={`px-3 py-1 font-semibold ${PHONE_COLUMNS.has(h.column.id) ? '' : 'hidden md:table-cell'}`}
                      >
                        {h.column.getCanSort() ? (
                          <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex min-h-11 min-w-11 items-center gap-1 whitespace-nowrap text-left hover:text-ink">
                            {flexRender(h.column.columnDef.header, h.getContext())}
                            <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}</span>
                          </button>
                        ) : (
                          flexRender(h.column.columnDef.header, h.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="border-t border-line bg-surface-raised" data-testid="compare-row">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className={`px-3 py-3 ${cell.column.id === 'run' ? '' : 'num whitespace-nowrap'} ${PHONE_COLUMNS.has(cell.column.id) ? '' : 'hidden md:table-cell'}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </>
  );
}
