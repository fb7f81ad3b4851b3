'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type SortingState,
} from '@tanstack/react-table';
import { irrBlankReason } from '@/lib/cases/irr-reason';
import { paybackHold, type PaybackHold } from '@/lib/cases/payback';
import { PaybackFigure } from './payback-figure';
import type { CaseResultDto } from '@/lib/cases/types';
import type { PolicyKey } from '@/lib/engine/types';
import { formatMoney, formatNumber, formatPercent, formatYears, signTone } from '@/lib/format';
import { bestOtherPolicy, repowerComparison } from '@/lib/plan';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

type Row = {
  id: string;
  /** the truck's policy in the proposal; repower = chosen by the plan */
  proposal: PolicyKey;
  best: PolicyKey;
  keep: number;
  rebuild: number;
  repower: number;
  bestOther: PolicyKey;
  deltaNpv: number;
  /** P(the engine fitted today fails in service before its overhaul), under rebuild */
  failRebuild: number;
  deltaVsRebuild: number;
  deltaVsRebuildNoGain: number;
  irr: number | null;
  irrReason: string | null;
  mirr: number | null;
  payback: number | null;
  paybackHold: PaybackHold;
  discountedPayback: number | null;
  discountedPaybackHold: PaybackHold;
  pi: number | null;
  fuelLph: number;
  costPerHour: number;
  costPerTonne: number;
};

const col = createColumnHelper<Row>();

/** Per-truck results: sortable by any column, filterable by truck and best policy. Repower is compared with each truck's better other policy. */
export function TruckTable({ data, slug }: { data: CaseResultDto; slug: string }) {
  const neg = data.negativeStyle;
  const cur = data.currency;
  const rows = useMemo<Row[]>(
    () =>
      data.result.trucks.map((t) => {
        const c = repowerComparison(t);
        const other = bestOtherPolicy(t);
        const delta = t.options.repower.cashFlows.map((x, i) => x - (t.options[other].cashFlows[i] ?? 0));
        const df = data.discountFactors[t.id] ?? [];
        return {
          id: t.id,
          proposal: data.proposal.policies[t.id] ?? 'rebuild',
          best: t.best,
          keep: t.options.keep.npv,
          rebuild: t.options.rebuild.npv,
          repower: t.options.repower.npv,
          bestOther: other,
          deltaNpv: c.deltaNpv,
          failRebuild: t.options.rebuild.failureBeforePlanned,
          deltaVsRebuild: t.repowerVsRebuild.deltaNpv,
          deltaVsRebuildNoGain: data.withoutGain.trucks[t.id] ?? Number.NaN,
          irr: c.irr,
          irrReason: irrBlankReason(c, delta),
          mirr: c.mirr,
          payback: c.paybackYears,
          paybackHold: paybackHold(delta),
          discountedPayback: c.discountedPaybackYears,
          discountedPaybackHold: paybackHold(delta.map((x, i) => x * (df[i] ?? 1))),
          pi: c.profitabilityIndex,
          fuelLph: t.options[t.best].fuelLitresPerHour,
          costPerHour: t.options[t.best].costPerHour,
          costPerTonne: t.options[t.best].costPerTonne,
        };
      }),
    [data],
  );
  const money = (x: number) => formatMoney(x, { scale: 'k', negative: neg });
  const columns = useMemo(
    () => [
      col.accessor('id', {
        header: 'Truck',
        filterFn: 'includesString',
        cell: (i) => <Link className="font-mono text-xs text-accent hover:underline" href={`/${slug}/cases/${data.case.id}/trucks/${encodeURIComponent(i.getValue())}`}>{i.getValue()}</Link>,
      }),
      col.accessor('best', {
        header: 'Best',
        filterFn: 'equalsString',
        cell: (i) => <span className="font-medium" style={{ color: POLICY_COLOUR[i.getValue()] }}>{POLICY_LABEL[i.getValue()]}</span>,
      }),
      col.accessor('failRebuild', {
        header: 'Fails before overhaul, rebuild',
        cell: (i) => <span data-testid="fail-before-overhaul">{formatPercent(i.getValue(), 1)}</span>,
        meta: { n: true },
      }),
      col.accessor('keep', { header: `NPV keep (${cur} k)`, cell: (i) => money(i.getValue()), meta: { n: true } }),
      col.accessor('rebuild', { header: `NPV rebuild (${cur} k)`, cell: (i) => money(i.getValue()), meta: { n: true } }),
      col.accessor('repower', { header: `NPV repower (${cur} k)`, cell: (i) => money(i.getValue()), meta: { n: true } }),
      col.accessor('deltaNpv', {
        header: `ΔNPV repower vs best other (${cur} k)`,
        cell: (i) => <span className={signTone(i.getValue(), { scale: 'k' })} data-testid="signed">{money(i.getValue())}</span>,
        meta: { n: true },
      }),
      col.accessor('deltaVsRebuild', {
        header: `ΔNPV repower vs rebuild (${cur} k)`,
        cell: (i) => <span className={signTone(i.getValue(), { scale: 'k' })} data-testid="signed">{money(i.getValue())}</span>,
        meta: { n: true },
      }),
      col.accessor('deltaVsRebuildNoGain', {
        header: `ΔNPV repower vs rebuild without the productivity gain (${cur} k)`,
        cell: (i) => <span className={signTone(i.getValue(), { scale: 'k' })} data-testid="signed">{money(i.getValue())}</span>,
        meta: { n: true },
      }),
      col.accessor('irr', {
        header: 'IRR',
        sortUndefined: 'last',
        cell: (i) => (i.getValue() === null ? <span title={i.row.original.irrReason ?? ''} className="text-muted">— <span className="text-[10px]">({i.row.original.irrReason?.split(':')[0]})</span></span> : formatPercent(i.getValue(), 1)),
        meta: { n: true },
      }),
      col.accessor('mirr', { header: 'MIRR', cell: (i) => formatPercent(i.getValue(), 1), meta: { n: true } }),
      col.accessor('payback', { header: 'Payback (yr)', sortUndefined: 'last', cell: (i) => <PaybackFigure years={i.getValue()} hold={i.row.original.paybackHold} />, meta: { n: true } }),
      col.accessor('discountedPayback', { header: 'Disc. payback (yr)', sortUndefined: 'last', cell: (i) => <PaybackFigure years={i.getValue()} hold={i.row.original.discountedPaybackHold} />, meta: { n: true } }),
      col.accessor('pi', { header: 'PI', cell: (i) => formatNumber(i.getValue(), 2), meta: { n: true } }),
      col.accessor('fuelLph', { header: 'Fuel, best (L/h)', cell: (i) => formatNumber(i.getValue(), 1), meta: { n: true } }),
      col.accessor('costPerHour', { header: `Cost, best (${cur}/h)`, cell: (i) => formatNumber(i.getValue(), 2, neg), meta: { n: true } }),
      col.accessor('costPerTonne', { header: `Cost, best (${cur}/t)`, cell: (i) => formatNumber(i.getValue(), 3, neg), meta: { n: true } }),
      col.accessor('proposal', {
        header: 'In the proposal',
        cell: (i) =>
          i.getValue() === 'repower' ? (
            <span className="rounded bg-accent/10 px-1.5 py-0.5 text-xs font-semibold text-accent" data-testid="in-proposal">Repower (proposed)</span>
          ) : (
            <span className="text-xs text-muted">{POLICY_LABEL[i.getValue()]}</span>
          ),
      }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [cur, neg, slug, data.case.id],
  );
  const [sorting, setSorting] = useState<SortingState>([]);
  const [filters, setFilters] = useState<ColumnFiltersState>([]);
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, columnFilters: filters },
    onSortingChange: setSorting,
    onColumnFiltersChange: setFilters,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  const shown = table.getRowModel().rows;
  return (
    <section aria-label="Per-truck results" className="space-y-2">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label className="label" htmlFor="filter-truck">Filter trucks</label>
          <input id="filter-truck" className="field w-44" placeholder="e.g. T3-" value={(table.getColumn('id')?.getFilterValue() as string) ?? ''} onChange={(e) => table.getColumn('id')?.setFilterValue(e.target.value || undefined)} />
        </div>
        <div>
          <label className="label" htmlFor="filter-best">Best policy</label>
          <select id="filter-best" className="field w-36" value={(table.getColumn('best')?.getFilterValue() as string) ?? ''} onChange={(e) => table.getColumn('best')?.setFilterValue(e.target.value || undefined)}>
            <option value="">All</option>
            <option value="keep">Keep</option>
            <option value="rebuild">Rebuild</option>
            <option value="repower">Repower</option>
          </select>
        </div>
        <p className="text-xs text-muted" aria-live="polite">{shown.length} of {rows.length} trucks. Click a column heading to sort. Repower is compared with each truck&rsquo;s better other policy (IRR, MIRR, payback, PI). &ldquo;Fails before overhaul&rdquo;: the chance that the engine fitted today fails in service before its planned overhaul, under rebuild.</p>
      </div>
      <div className="card max-h-[70vh] overflow-auto">
        <table className="data-table" data-testid="truck-table">
          <thead>
            <tr>
              {table.getHeaderGroups()[0].headers.map((h) => {
                const sorted = h.column.getIsSorted();
                const n = (h.column.columnDef.meta as { n?: boolean } | undefined)?.n;
                return (
                  <th key={h.id} className={n ? 'n' : ''} aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}>
                    <button type="button" className={`inline-flex items-center gap-1 ${n ? 'justify-end text-right' : ''}`} onClick={h.column.getToggleSortingHandler()}>
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      <span aria-hidden>{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}</span>
                    </button>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {shown.map((r) => (
              <tr key={r.id} data-truck={r.original.id} data-in-proposal={r.original.proposal === 'repower' ? 'yes' : 'no'} className={r.original.proposal === 'repower' ? 'bg-accent/5' : ''}>
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className={(c.column.columnDef.meta as { n?: boolean } | undefined)?.n ? 'n whitespace-nowrap' : 'whitespace-nowrap'}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
