import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useEffect, useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { RunStateSchema, type Run, type RunState } from '../../../../shared/schemas/run';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { RUN_STATE_LABEL, RunStateBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatLabTime, useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatDuration, formatEnergy, formatPercent } from '../../../lib/units';
import { useRuns } from '../api/get-runs';
import { MAX_COMPARED_RUNS } from './run-compare';
import { ProtectionsBadge, VerdictBadge } from './verdict-badge';

const PAGE_SIZE = 25;
const SEARCH_DEBOUNCE_MS = 300;
const KIND_LABEL = { 'capacity-discharge': 'Capacity', charge: 'Charge', 'protection-check': 'Protection', custom: 'Custom' } as const;

const col = createColumnHelper<Run>();

/** Columns a phone shows (the rest read in the run's own page): tick, name with its state, verdict. */
const PHONE_COLUMNS = new Set(['compare', 'name', 'verdict']);
/** Classes for a cell or header of `columnId`: phone-hidden columns appear from the md breakpoint. */
const columnClass = (columnId: string) => (PHONE_COLUMNS.has(columnId) ? '' : 'hidden md:table-cell');

/** The run archive: search by name, filter by state and tag, newest first. */
export function RunsTable() {
  const settings = useLabSettings();
  const [search, setSearch] = useState('');
  const [q, setQ] = useState('');
  const [state, setState] = useState<RunState | ''>('');
  const [tag, setTag] = useState('');
  const [offset, setOffset] = useState(0);
  // /runs?batteryId=4 lists one pack's history (linked from the battery list).
  const [params, setParams] = useSearchParams();
  const batteryParam = params.get('batteryId');
  const batteryId = batteryParam && /^\d+$/.test(batteryParam) ? Number(batteryParam) : undefined;

  useEffect(() => {
    const timer = setTimeout(() => {
      setQ(search.trim());
      setOffset(0);
    }, SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [search]);

  const runs = useRuns({ q: q || undefined, state: state || undefined, tag: tag || undefined, batteryId, limit: PAGE_SIZE, offset });

  const [selected, setSelected] = useState<number[]>([]);
  const toggle = (id: number) =>
    setSelected((list) => (list.includes(id) ? list.filter((x) => x !== id) : list.length < MAX_COMPARED_RUNS ? [...list, id] : list));

  const columns = useMemo(
    () => [
      col.display({
        id: 'compare',
        header: 'Compare',
        cell: (c) => (
          // The label around the box gives a 44 px touch target (WCAG 2.2 SC 2.5.5) for a small box.
          <label className="-m-2 inline-flex h-11 w-11 cursor-pointer items-center justify-center">
            <input
              type="checkbox"
              aria-label={`Compare ${c.row.original.name}`}
              checked={selected.includes(c.row.original.id)}
              onChange={() => toggle(c.row.original.id)}
              className="h-6 w-6"
            />
          </label>
        ),
      }),
      col.accessor('name', {
        header: 'Run',
        cell: (c) => (
          <>
            <Link to={`/runs/${c.row.original.id}`} className="inline-flex min-h-11 items-center font-semibold text-accent hover:underline">
              {c.getValue()}
            </Link>
            {/* On a phone the State column steps aside; the state rides under the name. */}
            <span className="mt-1 block md:hidden">
              <RunStateBadge state={c.row.original.state} />
            </span>
          </>
        ),
      }),
      col.accessor('state', { header: 'State', cell: (c) => <RunStateBadge state={c.getValue()} /> }),
      col.accessor('kind', { header: 'Kind', cell: (c) => KIND_LABEL[c.getValue()] }),
      col.accessor('startedAt', { header: 'Started', cell: (c) => <span className="num whitespace-nowrap">{formatLabTime(c.getValue(), settings.timeZone)}</span> }),
      col.accessor((r) => r.summary?.durationSeconds ?? null, { id: 'duration', header: 'Duration', cell: (c) => <span className="num whitespace-nowrap">{formatDuration(c.getValue())}</span> }),
      col.accessor((r) => r.summary?.dischargeWh ?? null, { id: 'wh', header: 'Energy', cell: (c) => <span className="num whitespace-nowrap">{formatEnergy(c.getValue(), settings.energyUnit)}</span> }),
      col.accessor((r) => r.summary?.dischargeAh ?? null, { id: 'ah', header: 'Charge', cell: (c) => <span className="num whitespace-nowrap">{formatCharge(c.getValue())}</span> }),
      col.accessor((r) => r.summary?.percentRatedAh ?? null, { id: 'pct', header: 'Of rated', cell: (c) => <span className="num whitespace-nowrap">{formatPercent(c.getValue())}</span> }),
      col.accessor((r) => r.summary?.verdict ?? null, {
        id: 'verdict',
        header: 'Verdict',
        // A protection check has no capacity verdict: its protections' outcomes stand in its place.
        cell: (c) => {
          const protections = c.row.original.summary?.protections;
          if (c.row.original.kind === 'protection-check' && protections && protections.length > 0) return <ProtectionsBadge results={protections} />;
          return c.getValue() ? <VerdictBadge verdict={c.getValue()!} /> : '—';
        },
      }),
      col.accessor('tags', { header: 'Tags', cell: (c) => c.getValue().join(', ') }),
    ],
    [settings.timeZone, settings.energyUnit, selected],
  );

  const data = runs.data?.runs;
  const table = useReactTable({ data: data ?? [], columns, getCoreRowModel: getCoreRowModel() });
  const total = runs.data?.total ?? 0;

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 md:grid-cols-3">
        <TextField label="Search runs" type="search" placeholder="Name contains…" value={search} onChange={(e) => setSearch(e.target.value)} />
        <SelectField
          label="State"
          value={state}
          onChange={(e) => {
            setState(e.target.value as RunState | '');
            setOffset(0);
          }}
          options={[{ value: '', label: 'Any state' }, ...RunStateSchema.options.map((s) => ({ value: s, label: RUN_STATE_LABEL[s] }))]}
        />
        <TextField label="Tag" placeholder="e.g. lfp" value={tag} onChange={(e) => { setTag(e.target.value.trim()); setOffset(0); }} />
      </div>
      {batteryId !== undefined && (
        <p className="flex items-center gap-3 text-sm">
          <span className="rounded-full border border-accent px-3 py-1 font-semibold">Only pack #{batteryId}</span>
          <button type="button" className="min-h-11 px-2 text-accent underline" onClick={() => setParams({})}>
            Show every pack
          </button>
        </p>
      )}
      {selected.length >= 2 && (
        <div>
          <Link to={`/runs/compare?ids=${selected.join(',')}`} className="inline-flex min-h-11 items-center rounded-lg bg-accent px-4 text-sm font-semibold text-accent-ink">
            Compare {selected.length} runs
          </Link>
        </div>
      )}
      {runs.isPending ? (
        <Loading label="Loading runs…" />
      ) : runs.isError ? (
        <QueryError error={runs.error} what="Runs" />
      ) : (
        <>
          <div className="overflow-x-auto rounded-xl border border-line">
            <table className="w-full text-left text-sm">
              <thead className="bg-surface-sunken text-ink-muted">
                {table.getHeaderGroups().map((hg) => (
                  <tr key={hg.id}>
                    {hg.headers.map((h) => (
                      <th key={h.id} className={`px-3 py-3 font-semibold ${columnClass(h.column.id)}`}>
                        {flexRender(h.column.columnDef.header, h.getContext())}
                      </th>
                    ))}
                  </tr>
                ))}
              </thead>
              <tbody>
                {table.getRowModel().rows.map((row) => (
                  <tr key={row.id} className="border-t border-line bg-surface-raised">
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id} className={`px-3 py-3 align-middle ${columnClass(cell.column.id)}`}>
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
            {data?.length === 0 && <p className="p-6 text-center text-ink-muted">No runs match.</p>}
          </div>
          <div className="flex items-center justify-between text-sm text-ink-muted">
            <span className="num">
              {total === 0 ? 0 : offset + 1}–{Math.min(offset + PAGE_SIZE, total)} of {total}
            </span>
            <div className="flex gap-2">
              <Button variant="secondary" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - PAGE_SIZE))}>
                Newer
              </Button>
              <Button variant="secondary" disabled={offset + PAGE_SIZE >= total} onClick={() => setOffset(offset + PAGE_SIZE)}>
                Older
              </Button>
            </div>
          </div>
        </>
      )}
    </div>
  );
}
