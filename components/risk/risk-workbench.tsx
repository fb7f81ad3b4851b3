'use client';
import { useCallback, useState } from 'react';
import useSWR, { preload } from 'swr';
import { fetcher, type ApiError } from '@/lib/fetcher';
import type { NegativeStyle } from '@/lib/format';
import { BreakEvenPanel } from './break-even-panel';
import { choiceOfSpec, MonteCarloPanel } from './monte-carlo-panel';
import { SpiderPanel } from './spider-chart';
import { TornadoPanel } from './tornado-panel';
import { TwoWayPanel } from './two-way-panel';
import { MEASURE_LABELS, type FleetMeasure } from '@/lib/risk/measures';
import type { DriversAnswer, MetricInput, RunsAnswer, TornadoRow } from './types';

/** A fleet measure, or one truck's ΔNPV repower vs rebuild. */
export type Choice = FleetMeasure | `truck:${string}`;

/** Default ranges of the tornado and the spider: each driver's realistic range, or ±20 % on every driver. */
export type RangeMode = 'realistic' | 'uniform';

/**
 * The risk page's client side: one measure chosen at the top drives every
 * panel below; a fleet analysis reads the proposal by default, repowering
 * every truck and the best mix are comparisons. Opening a Monte Carlo run
 * sets the measure to the one that run was read on.
 */
export function RiskWorkbench({ slug, caseId, initialTruck, initialRanges = 'realistic', negative, canRun }: { slug: string; caseId: number; initialTruck: string | null; initialRanges?: RangeMode; negative: NegativeStyle; canRun: boolean }) {
  // realistic ranges per driver, or ±20 % on every driver; kept in the address (?ranges=uniform) so a link or reload keeps it
  const [rangeMode, setRangeModeState] = useState<RangeMode>(initialRanges);
  const setRangeMode = (m: RangeMode) => {
    setRangeModeState(m);
    const url = new URL(window.location.href);
    if (m === 'uniform') url.searchParams.set('ranges', 'uniform');
    else url.searchParams.delete('ranges');
    window.history.replaceState(window.history.state, '', url);
    setTop([]);
  };
  const base = `/api/workspaces/${slug}/cases/${caseId}`;
  // the measure: on a truck's page that truck; otherwise the one the latest Monte Carlo run was read on (the panel
  // opens that run), else the proposal — decided before any analysis is asked for, so none is computed twice
  const { data: runs } = useSWR<RunsAnswer, ApiError>(`${base}/monte-carlo`, fetcher, {
    // the latest run's figures are asked for at once, ahead of the sensitivity analyses, which take the server longer
    onSuccess: (d) => {
      if (d.runs[0]) void preload(`${base}/monte-carlo/${d.runs[0].id}`, fetcher);
    },
  });
  const [picked, setChoice] = useState<Choice | null>(initialTruck ? `truck:${initialTruck}` : null);
  const latest = runs?.runs[0]?.spec;
  if (picked === null && runs) setChoice(latest ? choiceOfSpec(latest) : 'proposal'); // once, when the runs arrive
  const choice: Choice = picked ?? (latest ? choiceOfSpec(latest) : 'proposal');
  const truckId = choice.startsWith('truck:') ? choice.slice(6) : null;
  const { data: fleetDrivers, error } = useSWR<DriversAnswer, ApiError>(`${base}/drivers`, fetcher);
  const { data: truckDrivers } = useSWR<DriversAnswer, ApiError>(truckId ? `${base}/drivers?truck=${encodeURIComponent(truckId)}` : null, fetcher);
  const [top, setTop] = useState<string[]>([]);
  const onRows = useCallback((rows: TornadoRow[]) => {
    const ids = rows.slice(0, 6).map((r) => r.driver);
    setTop((old) => (old.join() === ids.join() ? old : ids));
  }, []);

  if (error) return <p role="alert" className="card p-4 text-sm text-loss">{error.message} {error.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}</p>;
  if (!fleetDrivers || !runs || (truckId && !truckDrivers)) return <p className="text-sm text-muted" aria-live="polite">Loading the case…</p>;

  const answer = truckId ? truckDrivers! : fleetDrivers;
  const currency = answer.case.currency;
  const fleetChoice = truckId ? null : (choice as FleetMeasure);
  const metric: MetricInput = truckId ? { kind: 'truck-delta', truckId } : { kind: fleetChoice! };
  const metricLabel = truckId ? `ΔNPV repower vs rebuild, truck ${truckId}` : MEASURE_LABELS[fleetChoice!];
  const p = fleetDrivers.proposal;
  const later = Object.values(p.timings ?? {}).filter((t) => t.kind === 'event' && (t.k > 1 || t.delayMonths > 0)).length;
  const key = JSON.stringify(metric);
  const firstOffer = answer.drivers.find((d) => d.id.startsWith('modulePrice@'))?.id ?? 'discountRate';

  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-end gap-4">
        <label className="text-sm">
          <span className="label">Measure</span>
          <select className="field w-96" value={choice} onChange={(e) => { setChoice(e.target.value as Choice); setTop([]); }} aria-label="Measure">
            <option value="proposal">Fleet: {MEASURE_LABELS.proposal}</option>
            <option value="fleet-delta">{MEASURE_LABELS['fleet-delta']}</option>
            <option value="fleet-best">{MEASURE_LABELS['fleet-best']}</option>
            {fleetDrivers.trucks.map((t) => (
              <option key={t.id} value={`truck:${t.id}`}>Truck {t.id}: ΔNPV repower vs rebuild</option>
            ))}
          </select>
        </label>
        <fieldset className="text-sm">
          <legend className="label">Tornado and spider ranges</legend>
          <div className="flex gap-3 pt-1">
            <label className="flex items-center gap-1"><input type="radio" name="range-mode" checked={rangeMode === 'realistic'} onChange={() => setRangeMode('realistic')} /> Realistic ranges</label>
            <label className="flex items-center gap-1"><input type="radio" name="range-mode" checked={rangeMode === 'uniform'} onChange={() => setRangeMode('uniform')} /> ±20 % on every driver</label>
          </div>
        </fieldset>
        <p className="pb-1.5 text-xs text-muted">Figures come from the case as stored{answer.case.status === 'approved' ? ' (the approved, frozen numbers)' : ''}; every point is a full re-run of the engine.</p>
      </div>
      <p className="-mt-2 text-xs text-muted" data-testid="risk-proposal">
        The proposal is the case&rsquo;s saved plan: it repowers {plural(p.repower, 'truck')} the plan chooses; the other{' '}
        {p.keep + p.rebuild === 1 ? 'truck follows' : `${p.keep + p.rebuild} trucks follow`} the better of keep ({p.keep}) and rebuild ({p.rebuild}). Each truck&rsquo;s policy is held fixed while the inputs vary.
        {later > 0 ? (
          <span data-testid="risk-timing-note">
            {' '}The fleet programme times {plural(later, 'repowered truck')} later than {later === 1 ? 'its' : 'their'} next planned overhaul: the tornado and break-even value that timing; a Monte Carlo run repowers {later === 1 ? 'it' : 'them'} at the offer&rsquo;s own timing.
          </span>
        ) : null}
      </p>
      <TornadoPanel key={`t${key}${rangeMode}`} rangeMode={rangeMode} base={base} metric={metric} metricLabel={metricLabel} drivers={answer.drivers} currency={currency} negative={negative} onRows={onRows} />
      <SpiderPanel key={`s${key}${rangeMode}`} rangeMode={rangeMode} base={base} metric={metric} metricLabel={metricLabel} driverIds={top} drivers={answer.drivers} currency={currency} negative={negative} />
      {/* asked for once the tornado is in: a fleet break-even is hundreds of engine runs, and would hold the tornado and the Monte Carlo answers behind it */}
      <BreakEvenPanel key={`b${key}`} base={base} metric={metric} drivers={answer.drivers} currency={currency} negative={negative} ready={top.length > 0} />
      <TwoWayPanel key={`w${key}`} base={base} metric={metric} metricLabel={metricLabel} drivers={answer.drivers} currency={currency} negative={negative} initial={['fuelPrice', firstOffer]} />
      <MonteCarloPanel
        base={base}
        drivers={fleetDrivers.drivers}
        choice={choice}
        onChoice={(c) => { if (c !== choice) { setChoice(c); setTop([]); } }}
        currency={currency}
        negative={negative}
        canRun={canRun}
        headline={fleetDrivers.headline}
        initialTruck={initialTruck}
      />
    </div>
  );
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}
