import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import type { Battery } from '../../../../shared/schemas/battery';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatNumber } from '../../../lib/units';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';

/** Packs shown per page of the register. */
export const REGISTER_PAGE_SIZE = 20;
const col = createColumnHelper<Battery>();
const SORT_MARK = { asc: ' ▲', desc: ' ▼' } as const;
/** On a phone a row becomes a card: these cells stack, the rest step aside (the pack's page has them). */
const CELL = 'px-3 py-3 align-middle max-md:block max-md:px-0 max-md:py-0.5';
const WIDE_ONLY = 'px-3 py-3 align-middle max-md:hidden';
/** Columns shown on a phone's card; every other column is for wider screens. */
const PHONE_COLUMNS = new Set(['label', 'brand', 'chemistry', 'ratedAh', 'actions']);

/** The register: every pack, sortable by any column, filtered by any text, a page at a time. */
export function BatteriesTable({ batteries, onEdit, onProtections }: { batteries: readonly Battery[]; onEdit?: (battery: Battery) => void; onProtections?: (battery: Battery) => void }) {
  const { energyUnit } = useLabSettings();
  const [sorting, setSorting] = useState<SortingState>([{ id: 'label', desc: false }]);
  const [filter, setFilter] = useState('');
  const columns = useMemo(
    () => [
      col.accessor('label', {
        header: 'Label',
        cell: (c) => (
          <Link to={`/batteries/${c.row.original.id}`} className="inline-flex min-h-11 items-center font-semibold text-accent hover:underline" aria-label={`Open ${c.getValue()}`}>
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor((b) => [b.brand, b.model].filter(Boolean).join(' '), { id: 'brand', header: 'Brand / model' }),
      col.accessor((b) => CHEMISTRY_LABEL[b.chemistry], { id: 'chemistry', header: 'Chemistry' }),
      col.accessor((b) => b.cellsInSeries * b.cellsInParallel, {
        id: 'cells', header: 'Cells', enableGlobalFilter: false,
        cell: (c) => <span className="num whitespace-nowrap">{c.row.original.cellsInSeries}S{c.row.original.cellsInParallel > 1 ? `${c.row.original.cellsInParallel}P` : ''}</span>,
      }),
      col.accessor('ratedAh', {
        header: 'Rated', enableGlobalFilter: false,
        cell: (c) => <span className="num whitespace-nowrap">{formatCharge(c.getValue())}{c.row.original.ratedWh !== null && ` · ${formatEnergy(c.row.original.ratedWh, energyUnit)}`}</span>,
      }),
      col.accessor('bmsRatedAmps', { header: 'Protection', enableGlobalFilter: false, cell: (c) => <span className="num whitespace-nowrap">{c.getValue() === null ? '—' : `${formatNumber(c.getValue()!, 0)} A`}</span> }),
      col.accessor('massKg', { header: 'Mass', enableGlobalFilter: false, cell: (c) => <span className="num whitespace-nowrap">{c.getValue() === null ? '—' : `${formatNumber(c.getValue()!, 2)} kg`}</span> }),
      col.accessor((b) => b.serialNumber ?? '', { id: 'serial', header: 'Serial', cell: (c) => <span className="num whitespace-nowrap">{c.getValue() || '—'}</span> }),
      col.accessor((b) => b.sender ?? '', { id: 'sender', header: 'Sent by', cell: (c) => c.getValue() || '—' }),
      col.accessor((b) => b.owner ?? '', { id: 'owner', header: 'Owner / client', cell: (c) => c.getValue() || '—' }),
      col.accessor((b) => b.receivedOn ?? '', { id: 'received', header: 'Received', cell: (c) => <span className="num whitespace-nowrap">{c.getValue() || '—'}</span> }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        // Both actions in one cell: two half-empty columns pushed Edit off a 1440 px screen.
        cell: (c) => {
          const b = c.row.original;
          return (
            <span className="flex gap-2">
              <Link to={`/runs?batteryId=${b.id}`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-3 font-semibold" aria-label={`Runs of ${b.label}`}>
                Runs
              </Link>
              {onProtections && (
                <button type="button" onClick={() => onProtections(b)} className="min-h-11 rounded-lg border border-line px-3 font-semibold" aria-label={`Protections of ${b.label}`}>
                  Protections
                </button>
              )}
              {onEdit && (
                <button type="button" onClick={() => onEdit(b)} className="min-h-11 rounded-lg border border-line px-3 font-semibold" aria-label={`Edit ${b.label}`}>
                  Edit
                </button>
              )}
            </span>
          );
        },
      }),
    ],
    [energyUnit, onEdit, onProtections],
  );
  const table = useReactTable({
    data: batteries as Battery[],
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    globalFilterFn: 'includesString',
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: REGISTER_PAGE_SIZE } },
  });
  if (batteries.length === 0) return <p className="p-6 text-center text-ink-muted">No packs registered yet.</p>;
  const shown = table.getFilteredRowModel().rows.length;
  const { pageIndex, pageSize } = table.getState().pagination;

  return (
    <div className="flex flex-col gap-4">
      {/* The phone's cards have no column headers: sorting there is by the label, the filter finds the rest. */}
      <div className="flex flex-wrap items-end gap-3">
        <div className="min-w-0 flex-1">
          <TextField label="Filter packs" type="search" placeholder="Label, brand, serial, client…" value={filter} onChange={(e) => { setFilter(e.target.value); table.setPageIndex(0); }} />
        </div>
        <a href="/api/batteries/export.csv" download className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold">
          Export CSV
        </a>
      </div>
      <div className="overflow-x-auto rounded-xl border border-line max-md:overflow-visible max-md:border-0">
        <table className="w-full text-left text-sm max-md:block">
          <thead className="bg-surface-sunken text-ink-muted max-md:hidden">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <th key={h.id} className="px-3 py-3 font-semibold" aria-sort={h.column.getIsSorted() === 'asc' ? 'ascending' : h.column.getIsSorted() === 'desc' ? 'descending' : undefined}>
                    {h.column.getCanSort() ? (
                      <button type="button" onClick={h.column.getToggleSortingHandler()} className="min-h-11 whitespace-nowrap font-semibold">
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        {SORT_MARK[h.column.getIsSorted() as 'asc' | 'desc'] ?? ''}
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="max-md:flex max-md:flex-col max-md:gap-3">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-line bg-surface-raised max-md:block max-md:rounded-xl max-md:border max-md:p-4">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={PHONE_COLUMNS.has(cell.column.id) ? CELL : WIDE_ONLY}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {shown === 0 && <p className="p-6 text-center text-ink-muted">No pack matches “{filter}”.</p>}
      </div>
      <div className="flex flex-wrap items-center justify-between gap-2 text-sm text-ink-muted">
        <span className="num">
          {shown === 0 ? 0 : pageIndex * pageSize + 1}–{Math.min((pageIndex + 1) * pageSize, shown)} of {shown}
        </span>
        <div className="flex gap-2">
          <Button variant="secondary" disabled={!table.getCanPreviousPage()} onClick={() => table.previousPage()}>
            Previous
          </Button>
          <Button variant="secondary" disabled={!table.getCanNextPage()} onClick={() => table.nextPage()}>
            Next
          </Button>
        </div>
      </div>
    </div>
  );
}
