import { useMemo, useState } from 'react';
import { useNavigate } from 'react-router-dom';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type ColumnFiltersState,
  type FilterFn,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { DisplayUnits } from '@shared/schemas/sites';
import { WELL_STATUSES, type LengthGroup, type Well } from '@shared/schemas/wells';
import { EmptyState } from '@/components/ui/empty-state';
import { InlineSelect } from '@/components/ui/field';
import { cn } from '@/lib/cn';
import { formatLength, formatNumber, lengthUnitFor } from '../units';
import { STATUS_LABELS, StatusBadge } from './well-status';

type Props = { wells: Well[]; siteId: string; displayUnits: DisplayUnits; epsgCode: number };

const COLUMNS_KEY = 'kfield.wells.columns';
const DEFAULT_HIDDEN: VisibilityState = {
  measuringPointElevationM: false,
  screenTopElevationM: false,
  screenBottomElevationM: false,
  screenRadiusM: false,
  boreholeRadiusM: false,
  filterPackPorosity: false,
  staticToScreenBottomM: false,
  saturatedThicknessM: false,
  lat: false,
  lon: false,
  notes: false,
};

function loadVisibility(): VisibilityState {
  try {
    const saved = JSON.parse(window.localStorage.getItem(COLUMNS_KEY) ?? 'null') as unknown;
    if (saved && typeof saved === 'object' && !Array.isArray(saved)) return { ...DEFAULT_HIDDEN, ...(saved as VisibilityState) };
  } catch {
    // A damaged saved choice falls back to the default columns.
  }
  return DEFAULT_HIDDEN;
}

const TOOLBAR_SELECT = 'mt-1 h-9 w-full sm:w-auto';

const equalsOrAll: FilterFn<Well> = (row, columnId, value) => value === undefined || value === '' || row.getValue(columnId) === value;

/** Search across the text columns and the well's name, without regard to case. */
const searchWell: FilterFn<Well> = (row, _columnId, value) => {
  const q = String(value ?? '').trim().toLowerCase();
  if (!q) return true;
  const w = row.original;
  return [w.name, w.hydroUnit ?? '', w.status, w.aquiferCondition, w.notes].some((s) => s.toLowerCase().includes(q));
};

export function WellsTable({ wells, siteId, displayUnits, epsgCode }: Props) {
  const navigate = useNavigate();
  const [sorting, setSorting] = useState<SortingState>([]);
  const [globalFilter, setGlobalFilter] = useState('');
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  const [columnVisibility, setColumnVisibility] = useState<VisibilityState>(loadVisibility);

  const units = useMemo(() => [...new Set(wells.map((w) => w.hydroUnit).filter((u): u is string => Boolean(u)))].sort(), [wells]);

  const columns = useMemo<ColumnDef<Well>[]>(() => {
    const len = (id: keyof Well & string, header: string, group: LengthGroup): ColumnDef<Well> => ({
      id,
      accessorFn: (w) => w[id] as number | null,
      header: `${header} (${lengthUnitFor(displayUnits, group)})`,
      meta: { numeric: true },
      sortUndefined: 'last',
      cell: (c) => formatLength(c.getValue() as number | null, displayUnits, group),
    });
    return [
      {
        id: 'name',
        accessorKey: 'name',
        header: 'Name',
        enableHiding: false,
        sortingFn: (a, b) => a.original.name.localeCompare(b.original.name, undefined, { numeric: true, sensitivity: 'base' }),
        cell: (c) => (
          <Link
            to={`/sites/${siteId}/wells/${c.row.original.id}`}
            className="font-medium text-accent-700 hover:underline"
            onClick={(e) => e.stopPropagation()}
          >
            {c.row.original.name}
          </Link>
        ),
      },
      { id: 'status', accessorKey: 'status', header: 'Status', filterFn: equalsOrAll, cell: (c) => <StatusBadge status={c.row.original.status} /> },
      { id: 'hydroUnit', accessorFn: (w) => w.hydroUnit ?? '', header: 'Unit', filterFn: equalsOrAll, cell: (c) => c.row.original.hydroUnit ?? <span className="text-slate-400">—</span> },
      { id: 'aquiferCondition', accessorKey: 'aquiferCondition', header: 'Condition' },
      len('groundElevationM', 'Ground', 'elevation'),
      len('measuringPointElevationM', 'Measuring point', 'elevation'),
      len('screenTopDepthM', 'Screen top depth', 'depth'),
      len('screenBottomDepthM', 'Screen bottom depth', 'depth'),
      len('screenTopElevationM', 'Screen top elev.', 'elevation'),
      len('screenBottomElevationM', 'Screen bottom elev.', 'elevation'),
      len('casingRadiusM', 'Casing radius', 'radius'),
      len('screenRadiusM', 'Screen radius', 'radius'),
      len('boreholeRadiusM', 'Borehole radius', 'radius'),
      { id: 'filterPackPorosity', accessorKey: 'filterPackPorosity', header: 'Porosity', meta: { numeric: true }, sortUndefined: 'last', cell: (c) => formatNumber(c.getValue() as number | null, 2) },
      len('staticWaterDepthM', 'Static water depth', 'depth'),
      len('staticToScreenBottomM', 'Static to screen bottom', 'depth'),
      len('saturatedThicknessM', 'Saturated thickness', 'depth'),
      { id: 'siteX', accessorKey: 'siteX', header: `Easting (EPSG:${epsgCode})`, meta: { numeric: true }, cell: (c) => formatNumber(c.getValue() as number, 1) },
      { id: 'siteY', accessorKey: 'siteY', header: `Northing (EPSG:${epsgCode})`, meta: { numeric: true }, cell: (c) => formatNumber(c.getValue() as number, 1) },
      { id: 'lat', accessorKey: 'lat', header: 'Latitude (°)', meta: { numeric: true }, cell: (c) => formatNumber(c.getValue() as number, 6) },
      { id: 'lon', accessorKey: 'lon', header: 'Longitude (°)', meta: { numeric: true }, cell: (c) => formatNumber(c.getValue() as number, 6) },
      { id: 'notes', accessorKey: 'notes', header: 'Notes', enableSorting: false, cell: (c) => <span className="line-clamp-2 max-w-xs">{c.row.original.notes}</span> },
    ];
  }, [displayUnits, epsgCode, siteId]);

  const table = useReactTable({
    data: wells,
    columns,
    state: { sorting, globalFilter, columnFilters, columnVisibility },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    onColumnFiltersChange: setColumnFilters,
    onColumnVisibilityChange: (updater) => {
      setColumnVisibility((old) => {
        const next = typeof updater === 'function' ? updater(old) : updater;
        window.localStorage.setItem(COLUMNS_KEY, JSON.stringify(next));
        return next;
      });
    },
    globalFilterFn: searchWell,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });

  const filterValue = (id: string) => (table.getColumn(id)?.getFilterValue() as string | undefined) ?? '';
  const setFilter = (id: string, v: string) => table.getColumn(id)?.setFilterValue(v || undefined);
  const rows = table.getRowModel().rows;
  const sortable = table.getAllLeafColumns().filter((c) => c.getCanSort() && c.getIsVisible());
  const currentSort = sorting[0];

  return (
    <div>
      <div className="grid grid-cols-2 items-end gap-3 border-b border-slate-200 px-4 py-3 sm:flex sm:flex-wrap sm:px-5">
        <div className="col-span-2 sm:min-w-48 sm:flex-1">
          <label htmlFor="wells-search" className="block text-xs font-medium text-slate-600">
            Search wells
          </label>
          <input
            id="wells-search"
            type="search"
            value={globalFilter}
            onChange={(e) => setGlobalFilter(e.target.value)}
            placeholder="Name, unit, status or notes"
            className="mt-1 block h-9 w-full rounded-md border-0 px-3 text-sm shadow-sm ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600"
          />
        </div>
        <div>
          <span className="block text-xs font-medium text-slate-600" aria-hidden="true">Unit</span>
          <InlineSelect label="Filter by hydrostratigraphic unit" className={TOOLBAR_SELECT} value={filterValue('hydroUnit')} onChange={(e) => setFilter('hydroUnit', e.target.value)}>
            <option value="">All units</option>
            {units.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </InlineSelect>
        </div>
        <div>
          <span className="block text-xs font-medium text-slate-600" aria-hidden="true">Status</span>
          <InlineSelect label="Filter by status" className={TOOLBAR_SELECT} value={filterValue('status')} onChange={(e) => setFilter('status', e.target.value)}>
            <option value="">All statuses</option>
            {WELL_STATUSES.map((s) => (
              <option key={s} value={s}>
                {STATUS_LABELS[s]}
              </option>
            ))}
          </InlineSelect>
        </div>
        <div className="sm:hidden">
          <span className="block text-xs font-medium text-slate-600" aria-hidden="true">Sort by</span>
          <InlineSelect
            label="Sort wells by"
            className={TOOLBAR_SELECT}
            value={currentSort ? `${currentSort.id}:${currentSort.desc ? 'desc' : 'asc'}` : ''}
            onChange={(e) => {
              const [id, dir] = e.target.value.split(':');
              setSorting(id ? [{ id, desc: dir === 'desc' }] : []);
            }}
          >
            <option value="">Name</option>
            {sortable.flatMap((c) => [
              <option key={`${c.id}:asc`} value={`${c.id}:asc`}>
                {String(c.columnDef.header)} ↑
              </option>,
              <option key={`${c.id}:desc`} value={`${c.id}:desc`}>
                {String(c.columnDef.header)} ↓
              </option>,
            ])}
          </InlineSelect>
        </div>
        <details className="relative">
          <summary className="flex h-9 w-full cursor-pointer list-none items-center rounded-md bg-white px-3 text-sm font-medium text-slate-800 shadow-sm ring-1 ring-slate-300 ring-inset hover:bg-slate-50 [&::-webkit-details-marker]:hidden">
            Columns ({table.getVisibleLeafColumns().length}/{table.getAllLeafColumns().length})
          </summary>
          <fieldset className="absolute right-0 z-20 mt-1 max-h-96 w-64 overflow-y-auto rounded-md bg-white p-3 shadow-lg ring-1 ring-slate-200 max-sm:left-0 max-sm:right-auto">
            <legend className="sr-only">Columns to show</legend>
            {table.getAllLeafColumns().map((c) => (
              <label key={c.id} className={cn('flex items-center gap-2 py-1 text-sm text-slate-800', !c.getCanHide() && 'text-slate-400')}>
                <input type="checkbox" className="size-4 accent-accent-700" checked={c.getIsVisible()} disabled={!c.getCanHide()} onChange={c.getToggleVisibilityHandler()} />
                {String(c.columnDef.header)}
              </label>
            ))}
          </fieldset>
        </details>
      </div>
      <p className="px-4 py-2 text-xs text-slate-500 sm:px-5" aria-live="polite">
        {rows.length === wells.length ? `${wells.length} wells` : `${rows.length} of ${wells.length} wells`}
      </p>
      {rows.length === 0 ? (
        <div className="p-4 sm:p-5">
          <EmptyState title={wells.length === 0 ? 'No wells yet' : 'No well matches'}>
            {wells.length === 0 ? 'Add a well or import a CSV file of the network.' : 'Change the search or the filters.'}
          </EmptyState>
        </div>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left text-sm max-sm:block">
            <caption className="sr-only">Monitoring wells</caption>
            <thead className="max-sm:sr-only">
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const sorted = h.column.getIsSorted();
                    const numeric = (h.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                    return (
                      <th
                        key={h.id}
                        scope="col"
                        aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                        className={cn('border-b border-slate-200 bg-slate-50 px-3 py-2 text-xs font-medium text-slate-600 align-bottom', numeric && 'text-right')}
                      >
                        {h.column.getCanSort() ? (
                          <button
                            type="button"
                            onClick={h.column.getToggleSortingHandler()}
                            className={cn('inline-flex items-end gap-1 rounded text-left hover:text-slate-900', numeric && 'flex-row-reverse text-right')}
                          >
                            <span>{flexRender(h.column.columnDef.header, h.getContext())}</span>
                            <span aria-hidden="true" className="w-3 text-slate-400">
                              {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}
                            </span>
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
            <tbody className="max-sm:block">
              {rows.map((row) => (
                <tr
                  key={row.id}
                  onClick={() => navigate(`/sites/${siteId}/wells/${row.original.id}`)}
                  className="cursor-pointer hover:bg-accent-50/50 max-sm:grid max-sm:grid-cols-2 max-sm:gap-x-4 max-sm:gap-y-1.5 max-sm:border-b max-sm:border-slate-200 max-sm:px-4 max-sm:py-3"
                >
                  {row.getVisibleCells().map((cell) => {
                    const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                    return (
                      <td
                        key={cell.id}
                        data-label={String(cell.column.columnDef.header)}
                        className={cn(
                          'border-b border-slate-100 px-3 py-2 whitespace-nowrap text-slate-800',
                          numeric && 'text-right tabular-nums',
                          // Narrow screens: each row is a card of label-over-value pairs, the name across the top.
                          'max-sm:flex max-sm:min-w-0 max-sm:flex-col max-sm:items-start max-sm:border-0 max-sm:p-0 max-sm:text-left max-sm:whitespace-normal',
                          'max-sm:before:text-[11px] max-sm:before:leading-4 max-sm:before:text-slate-500 max-sm:before:content-[attr(data-label)]',
                          cell.column.id === 'name' && 'max-sm:col-span-2 max-sm:text-base max-sm:before:hidden',
                        )}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
