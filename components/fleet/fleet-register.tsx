'use client';

import {
  flexRender, getCoreRowModel, getFilteredRowModel, getSortedRowModel, useReactTable,
  type ColumnDef, type SortingState, type VisibilityState,
} from '@tanstack/react-table';
import Link from 'next/link';
import { useMemo, useState } from 'react';
import useSWR from 'swr';
import { DISPLAY_DIGITS, toDisplay, UNIT_LABEL } from '@/lib/display-units';
import { formatNumber } from '@/lib/format';
import { monthOf, overhaulDue } from '@/lib/overhaul-due';
import { EmptyState } from '@/components/ui/empty-state';
import { TruckForm } from './truck-form';
import { api, type EngineRow, type TruckRow, type WorkspaceView } from './types';

type Col = ColumnDef<TruckRow> & { meta?: { numeric?: boolean; help?: string } };

const HOURS_HELP = 'The engine type’s planned life minus the engine’s hours; 0 when it is at or past its planned life.';
const DUE_HELP = 'This month plus the hours to planned overhaul at the truck’s annual hours (12 · hours ÷ annual hours, rounded down to whole months, as in a case’s swap schedule). “Now” when the engine is at or past its planned life; “—” when the truck’s remaining life ends first.';

function buildColumns(ws: WorkspaceView, engines: Map<number, EngineRow>, thisMonth: string): Col[] {
  const num = (id: keyof TruckRow, header: string, digits = 0, convert?: (v: number | null) => number | null): Col => ({
    id: String(id),
    accessorFn: (r) => (convert ? convert(r[id] as number | null) : r[id]),
    header,
    cell: (c) => formatNumber(c.getValue() as number | null, digits),
    meta: { numeric: true },
    sortUndefined: 'last',
  });
  return [
    { id: 'unitNumber', accessorKey: 'unitNumber', header: 'Unit' },
    { id: 'payloadClass', accessorKey: 'payloadClass', header: 'Payload class' },
    { id: 'engine', accessorFn: (r) => engines.get(r.engineTypeId)?.name || r.engineKey, header: 'Engine type' },
    { id: 'offerKey', accessorFn: (r) => r.offerKey ?? '', header: 'Repower offer' },
    num('engineHours', 'Engine hours (h)'),
    num('remainingLifeHours', 'Remaining life (h)'),
    num('annualHours', 'Annual hours (h/yr)'),
    num('loadFactor', 'Load factor', 2),
    num('tonnesPerHour', 'Productivity (t/h)'),
    num('fuelBurnLitresPerHour', `Fuel burn (${UNIT_LABEL[ws.units].burn})`, DISPLAY_DIGITS[ws.units].burn, (v) => toDisplay('burn', v, ws.units)),
    {
      id: 'hoursToOverhaul',
      accessorFn: (r) => {
        const e = engines.get(r.engineTypeId);
        return e ? overhaulDue(r, e.lifeHours, thisMonth).hoursToOverhaul : undefined;
      },
      header: 'Hours to planned overhaul (h)',
      cell: (c) => formatNumber((c.getValue() as number | undefined) ?? null, 0),
      meta: { numeric: true, help: HOURS_HELP },
      sortUndefined: 'last',
    },
    {
      id: 'overhaulDue',
      // sorts by months ahead; a truck that retires first sorts last
      accessorFn: (r) => {
        const e = engines.get(r.engineTypeId);
        const d = e ? overhaulDue(r, e.lifeHours, thisMonth) : null;
        return d && !d.retiresFirst ? d.monthsAhead : undefined;
      },
      header: 'Overhaul due (month)',
      cell: (c) => {
        const e = engines.get(c.row.original.engineTypeId);
        if (!e) return '';
        const d = overhaulDue(c.row.original, e.lifeHours, thisMonth);
        if (d.retiresFirst) return <span title="The truck’s remaining life ends before its engine reaches its planned life.">—</span>;
        if (d.overdue) return <span className="text-loss" title="At or past its planned life: the overhaul (or a repower) is due now.">Now</span>;
        return d.due;
      },
      meta: { numeric: true, help: DUE_HELP },
      // the first click lists the soonest first
      sortDescFirst: false,
      sortUndefined: 'last',
    },
    { id: 'notes', accessorKey: 'notes', header: 'Notes' },
  ];
}

/** The fleet register: sortable, filterable, with a choice of columns; analysts and admins edit. */
export function FleetRegister({ ws }: { ws: WorkspaceView }) {
  const { data, error, isLoading } = useSWR<{ items: TruckRow[] }>(api(ws.slug, 'trucks'));
  const { data: engineData, isLoading: enginesLoading } = useSWR<{ items: EngineRow[] }>(api(ws.slug, 'engines'));
  const engines = useMemo(() => new Map((engineData?.items ?? []).map((e) => [e.id, e])), [engineData]);
  const [thisMonth] = useState(() => monthOf(new Date()));
  const columns = useMemo(() => buildColumns(ws, engines, thisMonth), [ws, engines, thisMonth]);
  const [sorting, setSorting] = useState<SortingState>([]);
  const [filter, setFilter] = useState('');
  const [visibility, setVisibility] = useState<VisibilityState>({ notes: false });
  const [editing, setEditing] = useState<TruckRow | 'new' | null>(null);
  const table = useReactTable({
    data: data?.items ?? [],
    columns,
    state: { sorting, globalFilter: filter, columnVisibility: visibility },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    onColumnVisibilityChange: setVisibility,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });

  if (error) return <p role="alert" className="text-sm text-loss">Could not load the register: {error.message}</p>;
  // the engine types give the names and planned lives the register shows
  if (isLoading || enginesLoading) return <p className="text-sm text-muted">Loading trucks…</p>;
  const rows = table.getRowModel().rows;
  if (data?.items.length === 0 && !editing) {
    return (
      <EmptyState
        title="No trucks yet"
        action={ws.canEdit ? (
          <div className="flex gap-2">
            <Link className="btn btn-primary" href={`/${ws.slug}/fleet/import`}>Import from a file</Link>
            <button type="button" className="btn" onClick={() => setEditing('new')}>Add a truck</button>
          </div>
        ) : null}
      >
        Each truck&rsquo;s unit number, payload class, engine type, engine hours, remaining life, annual operating hours, load factor, productivity (t/h) and measured fuel burn belong here.
      </EmptyState>
    );
  }
  return (
    <section>
      {editing ? <TruckForm ws={ws} truck={editing === 'new' ? null : editing} onDone={() => setEditing(null)} /> : null}
      <div className="mb-2 flex flex-wrap items-center gap-3">
        <input aria-label="Filter trucks" placeholder="Filter trucks…" className="field w-64" value={filter} onChange={(e) => setFilter(e.target.value)} />
        <details className="relative">
          <summary className="btn cursor-pointer list-none">Columns</summary>
          <fieldset className="card absolute z-20 mt-1 w-56 p-2 text-sm">
            <legend className="sr-only">Columns shown</legend>
            {table.getAllLeafColumns().map((c) => (
              <label key={c.id} className="flex items-center gap-2 py-0.5">
                <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} />
                {String(c.columnDef.header)}
              </label>
            ))}
          </fieldset>
        </details>
        <span className="text-xs text-muted" data-testid="truck-count">{rows.length} of {data?.items.length ?? 0} trucks</span>
        {ws.canEdit ? (
          <button type="button" className="btn btn-primary ml-auto" onClick={() => setEditing('new')}>Add truck</button>
        ) : null}
      </div>
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="fleet-table">
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const numeric = (h.column.columnDef as Col).meta?.numeric;
                  const sorted = h.column.getIsSorted();
                  return (
                    <th key={h.id} className={numeric ? 'n' : undefined} aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}>
                      <button type="button" className="font-medium hover:text-ink" onClick={h.column.getToggleSortingHandler()} title={(h.column.columnDef as Col).meta?.help}>
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        {sorted === 'asc' ? ' ▲' : sorted === 'desc' ? ' ▼' : ''}
                      </button>
                    </th>
                  );
                })}
                {ws.canEdit ? <th><span className="sr-only">Actions</span></th> : null}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} data-unit={r.original.unitNumber}>
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className={(c.column.columnDef as Col).meta?.numeric ? 'n num' : c.column.id === 'unitNumber' ? 'font-mono text-xs' : undefined}>
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
                {ws.canEdit ? (
                  <td className="text-right">
                    <button type="button" className="text-xs text-accent hover:underline" aria-label={`Edit ${r.original.unitNumber}`} onClick={() => setEditing(r.original)}>Edit</button>
                  </td>
                ) : null}
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr><td colSpan={columns.length + 1} className="text-center text-muted">No trucks match.</td></tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <p className="mt-2 text-xs text-muted" data-testid="overhaul-help">
        Hours to planned overhaul: {HOURS_HELP} Overhaul due: {DUE_HELP} This month is {thisMonth} (UTC).
      </p>
    </section>
  );
}
