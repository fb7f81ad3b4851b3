'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import type { CaseSummaryDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import { defaultAssumptionSet, dutyOfEngine, recommendOverhaulLife } from '@/lib/fleet/overhaul-life';
import { formatMoney, formatNumber } from '@/lib/format';
import { CostRateChart } from './cost-rate-chart';
import { api, type AssumptionSetRow, type EngineRow, type OfferRow, type TruckRow, type WorkspaceView } from './types';

const OPEN_TO_EDITS = new Set(['draft', 'returned']);
const MAX_NAMED_TRUCKS = 12;

/**
 * The recommended overhaul life of one engine type (lib/fleet/overhaul-life.ts):
 * the optimum of the age-replacement cost rate on the duty of the trucks that
 * run it and the margin of an assumption set, the curve, and "Use in case…".
 */
export function OverhaulLifePanel({ ws, engine, engineIds, onClose }: { ws: WorkspaceView; engine: EngineRow; engineIds: number[]; onClose: () => void }) {
  const trucks = useSWR<{ items: TruckRow[] }>(api(ws.slug, 'trucks'));
  const offers = useSWR<{ items: OfferRow[] }>(api(ws.slug, 'offers'));
  const sets = useSWR<{ items: AssumptionSetRow[] }>(api(ws.slug, 'assumption-sets'));
  const [setId, setSetId] = useState<number | null>(null);
  const set = sets.data ? (sets.data.items.find((s) => s.id === setId) ?? defaultAssumptionSet(sets.data.items)) : undefined;
  const duty = useMemo(() => (trucks.data && offers.data ? dutyOfEngine(engine.id, trucks.data.items, offers.data.items) : null), [engine.id, trucks.data, offers.data]);
  const margin = set ? { marginPerTonne: Number(set.assumptions.marginPerTonne ?? 0), lostMarginShare: set.assumptions.lostMarginShare === undefined ? 1 : Number(set.assumptions.lostMarginShare) } : null;
  const rec = useMemo(() => (duty && margin ? recommendOverhaulLife(engine, duty, margin) : null), [engine, duty, margin?.marginPerTonne, margin?.lostMarginShare]); // eslint-disable-line react-hooks/exhaustive-deps

  const failed = trucks.error ?? offers.error ?? sets.error;
  const rate = (v: number) => `${formatMoney(v, { digits: 2, negative: ws.negativeStyle })} ${ws.currency}/h`;
  return (
    <section className="card mt-4 p-4" aria-labelledby="overhaul-life-title" data-testid="overhaul-life-panel">
      <div className="mb-2 flex items-start justify-between gap-3">
        <h2 id="overhaul-life-title" className="text-base font-semibold">Recommended overhaul life: {engine.key}</h2>
        <button type="button" className="btn py-0.5" onClick={onClose}>Close</button>
      </div>
      {failed ? <p role="alert" className="text-sm text-loss">Could not load the fleet: {failed.message}</p> : null}
      {!failed && (!rec || !duty || !set) ? (
        sets.data && !sets.data.items.length ? <p className="text-sm text-muted">Add an assumption set first: its margin per tonne prices a day down.</p> : <p className="text-sm text-muted" aria-busy="true">Computing…</p>
      ) : null}
      {rec && duty && set && sets.data ? (
        <>
          <div className="mb-3 flex flex-wrap items-end gap-4 text-sm">
            <div>
              <label className="label" htmlFor="overhaul-life-set">Margin from assumption set</label>
              <select id="overhaul-life-set" className="field" value={set.id} onChange={(e) => setSetId(Number(e.target.value))}>
                {sets.data.items.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
              </select>
            </div>
            <p className="max-w-xl text-muted" data-testid="overhaul-life-duty">{dutyText(duty, margin!, rec.dayDownCost, ws.currency)}</p>
          </div>
          <dl className="mb-3 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2 lg:grid-cols-4">
            <div>
              <dt className="text-muted">Recommended planned life</dt>
              <dd className="text-lg font-semibold tabular-nums" data-testid="recommended-life">
                {rec.optimumHours !== null ? `${formatNumber(rec.optimumHours)} h` : 'Run to failure: a planned overhaul never pays'}
              </dd>
            </div>
            <div>
              <dt className="text-muted">Cost per operating hour at the recommended life</dt>
              <dd className="tabular-nums" data-testid="cost-at-optimum">{rec.optimumHours !== null ? rate(rec.optimumCostPerHour) : '— (no finite optimum)'}</dd>
            </div>
            <div>
              <dt className="text-muted">At the current planned life ({formatNumber(rec.currentHours)} h)</dt>
              <dd className="tabular-nums" data-testid="cost-at-current">{rate(rec.currentCostPerHour)}</dd>
            </div>
            <div>
              <dt className="text-muted">Run to failure (no planned overhaul)</dt>
              <dd className="tabular-nums" data-testid="cost-run-to-failure">{rate(rec.runToFailureCostPerHour)}</dd>
            </div>
          </dl>
          {rec.reason ? <p className="mb-3 text-sm" data-testid="run-to-failure-reason">{rec.reason}</p> : null}
          {rec.optimumHours !== null ? (
            <p className="mb-3 text-sm" data-testid="overhaul-life-saving">
              {rec.currentCostPerHour > rec.optimumCostPerHour
                ? `Overhauling at ${formatNumber(rec.optimumHours)} h instead of ${formatNumber(rec.currentHours)} h saves ${rate(rec.currentCostPerHour - rec.optimumCostPerHour)} of engine time (${formatNumber((1 - rec.optimumCostPerHour / rec.currentCostPerHour) * 100, 1)} %).`
                : 'The current planned life is already at the optimum.'}
            </p>
          ) : null}
          <CostRateChart
            curve={rec.curve}
            currentHours={rec.currentHours}
            currentCostPerHour={rec.currentCostPerHour}
            optimumHours={rec.optimumHours}
            optimumCostPerHour={rec.optimumCostPerHour}
            runToFailureCostPerHour={rec.runToFailureCostPerHour}
            currency={ws.currency}
            engineKey={engine.key}
          />
          <table className="data-table mt-3 max-w-xl" data-testid="cost-rate-table">
            <caption className="mb-1 text-left text-sm text-muted">Cost per operating hour at a few planned lives</caption>
            <thead><tr><th className="n">Planned life (h)</th><th className="n">Cost per operating hour ({ws.currency}/h)</th><th>Mark</th></tr></thead>
            <tbody>
              {rec.points.map((p) => (
                <tr key={p.hours}>
                  <td className="n">{formatNumber(p.hours)}</td>
                  <td className="n">{formatMoney(p.costPerHour, { digits: 2, negative: ws.negativeStyle })}</td>
                  <td>{p.mark === 'current' ? 'current planned life' : p.mark === 'optimum' ? 'recommended' : ''}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-3 text-xs text-muted">
            Age replacement with the engine&apos;s Weibull law (β {formatNumber(engine.weibullShape, 2)}, η {formatNumber(engine.weibullScaleHours)} h): a planned overhaul costs
            {' '}{formatMoney(rec.plannedCost)} {ws.currency} and a failure {formatMoney(rec.failureCost)} {ws.currency}, days down included; the rate is their expected cost over
            the expected length of a cycle. It is a steady-state, undiscounted rate at year-1 prices, before tax: the long-run cost per operating hour of the rebuild
            cycle, not a horizon npv. Adopt the life in a case to see its effect on the case&apos;s npv. Oil services cost the same per hour whatever the life and are left out.
          </p>
          {ws.canEdit && rec.adoptableHours !== null ? <AdoptInCase ws={ws} engine={engine} engineIds={engineIds} hours={rec.adoptableHours} /> : null}
        </>
      ) : null}
    </section>
  );
}

function dutyText(duty: ReturnType<typeof dutyOfEngine>, margin: { marginPerTonne: number; lostMarginShare: number }, dayDown: number, currency: string): string {
  const named = duty.trucks.length > MAX_NAMED_TRUCKS ? `${duty.trucks.slice(0, MAX_NAMED_TRUCKS).join(', ')} and ${duty.trucks.length - MAX_NAMED_TRUCKS} more` : duty.trucks.join(', ');
  const price = `${formatMoney(margin.marginPerTonne, { digits: 2 })} ${currency} a tonne × a lost-margin share of ${formatNumber(margin.lostMarginShare * 100)} %`;
  if (duty.basis === 'none') return `No truck is fitted with this engine type or offered it, so days down are not priced: only the overhaul and repair costs count.`;
  const n = duty.trucks.length;
  const trucks = n === 1 ? 'the truck' : `the ${n} trucks`;
  const whose = duty.basis === 'fitted' ? `${trucks} fitted with it` : `${trucks} whose repower offer fits it (none is fitted with it yet)`;
  return `A day down costs ${formatMoney(dayDown)} ${currency}: the mean duty of ${whose} (${named}), ${formatNumber(duty.annualHours)} h a year at ${formatNumber(duty.tonnesPerHour)} t/h, at ${price}.`;
}

/** "Use in case…": adopt the recommended life for this engine type in a draft or returned case. */
function AdoptInCase({ ws, engine, engineIds, hours }: { ws: WorkspaceView; engine: EngineRow; engineIds: number[]; hours: number }) {
  const key = api(ws.slug, 'cases');
  const { data, error } = useSWR<{ cases: CaseSummaryDto[] }>(key);
  const { mutate } = useSWRConfig();
  const [caseId, setCaseId] = useState<number | null>(null);
  const [state, setState] = useState<{ kind: 'idle' | 'saving' } | { kind: 'done'; c: CaseSummaryDto } | { kind: 'error'; text: string }>({ kind: 'idle' });
  if (error) return <p role="alert" className="mt-3 text-sm text-loss">Could not load the cases: {error.message}</p>;
  if (!data) return null;
  const open = data.cases.filter((c) => OPEN_TO_EDITS.has(c.status));
  if (!open.length) return <p className="mt-3 text-sm text-muted">No draft or returned case to adopt it in.</p>;
  const chosen = open.find((c) => c.id === caseId) ?? open[0];
  const adopt = async () => {
    setState({ kind: 'saving' });
    try {
      // an override of an engine type deleted from the library since would be refused: it goes
      const known = new Set(engineIds.map(String));
      const kept = Object.fromEntries(Object.entries(chosen.engineLives).filter(([id]) => known.has(id)));
      const r = await sendJson<{ case: CaseSummaryDto }>(api(ws.slug, `cases/${chosen.id}`), 'PATCH', { version: chosen.version, engineLives: { ...kept, [engine.id]: hours } });
      await mutate((k) => typeof k === 'string' && k.startsWith(api(ws.slug, 'cases')));
      setState({ kind: 'done', c: r.case });
    } catch (e) {
      const text = e instanceof ApiError ? [e.message, ...e.problems.map((p) => `${p.path}: ${p.message}`)].join(' ') : 'Could not reach the server; nothing was saved.';
      setState({ kind: 'error', text });
    }
  };
  return (
    <div className="mt-3 flex flex-wrap items-end gap-3 border-t border-rule pt-3 text-sm" data-testid="adopt-life">
      <div>
        <label className="label" htmlFor="adopt-life-case">Case</label>
        <select id="adopt-life-case" className="field" value={chosen.id} onChange={(e) => { setCaseId(Number(e.target.value)); setState({ kind: 'idle' }); }}>
          {open.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name} (#{c.id}){c.engineLives[String(engine.id)] !== undefined ? `: uses ${formatNumber(c.engineLives[String(engine.id)])} h now` : ''}
            </option>
          ))}
        </select>
      </div>
      <button type="button" className="btn btn-primary" disabled={state.kind === 'saving'} onClick={adopt}>
        {state.kind === 'saving' ? 'Saving…' : `Use ${formatNumber(hours)} h in case`}
      </button>
      <div role="status" aria-live="polite" className="text-sm" data-testid="adopt-life-status">
        {state.kind === 'done' ? (
          <>Case {state.c.name} now plans {engine.key} overhauls at {formatNumber(hours)} h. <Link className="text-accent underline" href={`/${ws.slug}/cases/${state.c.id}`}>Open the case</Link></>
        ) : state.kind === 'error' ? <span className="text-loss">{state.text}</span> : null}
      </div>
    </div>
  );
}
