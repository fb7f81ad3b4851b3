'use client';
import { useCallback, useState } from 'react';
import useSWR from 'swr';
import { fetcher, type ApiError } from '@/lib/fetcher';
import type { NegativeStyle } from '@/lib/format';
import { BreakEvenPanel } from './break-even-panel';
import { MonteCarloPanel } from './monte-carlo-panel';
import { SpiderPanel } from './spider-chart';
import { TornadoPanel } from './tornado-panel';
import { TwoWayPanel } from './two-way-panel';
import type { DriversAnswer, MetricInput, TornadoRow } from './types';

type Choice = 'fleet-delta' | 'fleet-best' | `truck:${string}`;

/** The risk page's client side: one metric chosen at the top drives every panel below. */
export function RiskWorkbench({ slug, caseId, initialTruck, negative, canRun }: { slug: string; caseId: number; initialTruck: string | null; negative: NegativeStyle; canRun: boolean }) {
  const base = `/api/workspaces/${slug}/cases/${caseId}`;
  const [choice, setChoice] = useState<Choice>(initialTruck ? `truck:${initialTruck}` : 'fleet-delta');
  const truckId = choice.startsWith('truck:') ? choice.slice(6) : null;
  const { data: fleetDrivers, error } = useSWR<DriversAnswer, ApiError>(`${base}/drivers`, fetcher);
  const { data: truckDrivers } = useSWR<DriversAnswer, ApiError>(truckId ? `${base}/drivers?truck=${encodeURIComponent(truckId)}` : null, fetcher);
  const [top, setTop] = useState<string[]>([]);
  const onRows = useCallback((rows: TornadoRow[]) => {
    const ids = rows.slice(0, 6).map((r) => r.driver);
    setTop((old) => (old.join() === ids.join() ? old : ids));
  }, []);

  if (error) return <p role="alert" className="card p-4 text-sm text-loss">{error.message} {error.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}</p>;
  if (!fleetDrivers || (truckId && !truckDrivers)) return <p className="text-sm text-muted" aria-live="polite">Loading the case…</p>;

  const answer = truckId ? truckDrivers! : fleetDrivers;
  const currency = answer.case.currency;
  const metric: MetricInput = truckId ? { kind: 'truck-delta', truckId } : choice === 'fleet-best' ? { kind: 'fleet-best' } : { kind: 'fleet-delta' };
  const metricLabel = truckId ? `ΔNPV repower vs rebuild, truck ${truckId}` : choice === 'fleet-best' ? 'Fleet NPV, each truck on its best policy' : 'ΔNPV repower vs rebuild, every truck';
  const key = JSON.stringify(metric);
  const firstOffer = answer.drivers.find((d) => d.id.startsWith('modulePrice@'))?.id ?? 'discountRate';

  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-end gap-4">
        <label className="text-sm">
          <span className="label">Measure</span>
          <select className="field w-96" value={choice} onChange={(e) => { setChoice(e.target.value as Choice); setTop([]); }} aria-label="Measure">
            <option value="fleet-delta">Fleet: ΔNPV of repowering every truck vs rebuilding</option>
            <option value="fleet-best">Fleet: NPV with each truck on its best policy</option>
            {fleetDrivers.trucks.map((t) => (
              <option key={t.id} value={`truck:${t.id}`}>Truck {t.id}: ΔNPV repower vs rebuild</option>
            ))}
          </select>
        </label>
        <p className="pb-1.5 text-xs text-muted">Figures come from the case as stored{answer.case.status === 'approved' ? ' (the approved, frozen numbers)' : ''}; every point is a full re-run of the engine.</p>
      </div>
      <TornadoPanel key={`t${key}`} base={base} metric={metric} metricLabel={metricLabel} drivers={answer.drivers} currency={currency} negative={negative} onRows={onRows} />
      <SpiderPanel key={`s${key}`} base={base} metric={metric} metricLabel={metricLabel} driverIds={top} drivers={answer.drivers} currency={currency} negative={negative} />
      <BreakEvenPanel key={`b${key}`} base={base} metric={metric} drivers={answer.drivers} currency={currency} negative={negative} />
      <TwoWayPanel key={`w${key}`} base={base} metric={metric} metricLabel={metricLabel} drivers={answer.drivers} currency={currency} negative={negative} initial={['fuelPrice', firstOffer]} />
      <MonteCarloPanel base={base} drivers={fleetDrivers.drivers} truckId={truckId} currency={currency} negative={negative} canRun={canRun} headline={fleetDrivers.headline} />
    </div>
  );
}
