'use client';

import Link from 'next/link';
import useSWR from 'swr';
import type { CaseResultDto } from '@/lib/cases/types';
import type { ApiError } from '@/lib/fetcher';
import { formatMoney, formatNumber } from '@/lib/format';
import type { NumberFormat } from '@/lib/number-input';
import { periodMonths, periodName } from '@/lib/plan/fiscal-year';
import { EvaluationProblems, ResultsSkeleton } from './case-results';
import { PlanControls } from './plan-controls';
import { POLICY_LABEL } from './policy';

/** Ranking for repower, the exact capital plan per year of spend, and the swap schedule. */
export function PlanView({ slug, caseId, canEdit, numberFormat }: { slug: string; caseId: number; canEdit: boolean; numberFormat: NumberFormat }) {
  const { data, error, isLoading, mutate } = useSWR<CaseResultDto, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/result`);
  if (error) return <EvaluationProblems error={error} />;
  if (isLoading || !data) return <ResultsSkeleton />;
  const neg = data.negativeStyle;
  const k = (x: number) => formatMoney(x, { scale: 'k', negative: neg });
  const truckLink = (id: string) => <Link className="font-mono text-xs text-accent hover:underline" href={`/${slug}/cases/${caseId}/trucks/${encodeURIComponent(id)}`}>{id}</Link>;
  const chosen = new Set(data.proposal.chosenTrucks);
  const start = data.case.plan.startMonth;
  const yearName = (y: number | null) => (y === null ? '—' : periodName(start, y, data.fiscalYearStartMonth));
  return (
    <div className="space-y-4">
      <PlanControls data={data} slug={slug} canEdit={canEdit} numberFormat={numberFormat} onSaved={() => mutate()} />
      <section aria-label="Capital plan" className="card p-3" data-testid="capital-plan">
        <h2 className="text-sm font-semibold">The proposal: each truck&rsquo;s repower timing that maximises the fleet&rsquo;s expected NPV within the budgets and the shop&rsquo;s capacity</h2>
        <p className="text-sm" data-testid="plan-proposal">
          Capital <span className="num font-semibold" data-testid="plan-proposal-capital">{k(data.proposal.totalCapital)}</span> {data.currency} k
          {data.proposal.capitalByFiscalYear.length ? <> ({data.proposal.capitalByFiscalYear.map((r) => `${r.fiscalYear} ${k(r.capital)}`).join(' · ')})</> : null};
          expected NPV gain <span className="num font-semibold" data-testid="plan-proposal-gain">{k(data.proposal.gainVsRebuildAll)}</span> {data.currency} k against rebuilding every engine.
          <span className="text-muted"> Comparisons: unconstrained best mix {k(data.proposal.bestMixGain)}; repower every truck {k(data.proposal.repowerAllGain)}.</span>
        </p>
        <p className="text-xs text-muted">Solved exactly as one programme over every truck&rsquo;s timings (repower now, at its next or a later planned overhaul, or some months late), each period&rsquo;s budget and each month&rsquo;s swaps together. A truck no timing fits is left out: it takes its better other policy and forgoes the gain shown; the extra budget is what its best timing would need on top of what is left. Gain over each truck&rsquo;s better other policy {k(data.plan.totalGain)} {data.currency} k for {k(data.plan.totalSpent)} {data.currency} k of capital. A period runs 12 months from the plan&rsquo;s first month and is named by the fiscal year it starts in.</p>
        <table className="data-table mt-2">
          <thead><tr><th>Fiscal year of spend</th><th className="n">Budget ({data.currency} k)</th><th className="n">Spent ({data.currency} k)</th><th className="n">Gain ({data.currency} k)</th><th>Chosen</th><th>Left out: gain forgone · extra budget to add it ({data.currency} k)</th></tr></thead>
          <tbody>
            {data.plan.years.map((y) => (
              <tr key={y.year} data-year={y.year}>
                <td title={periodMonths(start, y.year)}>{yearName(y.year)} <span className="text-xs text-muted">{periodMonths(start, y.year)}</span></td>
                <td className="n">{y.budget === null ? 'no limit' : k(y.budget)}</td>
                <td className="n">{k(y.spent)}</td>
                <td className="n">{k(y.gain)}</td>
                <td className="text-xs" data-testid={`chosen-${y.year}`}>{y.chosen.map((c) => c.truckId).join(', ') || '—'}</td>
                <td className="text-xs" data-testid={`left-out-${y.year}`}>{y.leftOut.map((l) => `${l.truckId} (forgoes ${k(l.gain)} · needs +${k(l.extraBudget)})`).join(', ') || '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {data.plan.notWorthIt.length ? <p className="mt-2 text-xs text-muted">Not worth repowering (no gain over the better other policy): {data.plan.notWorthIt.map((c) => c.truckId).join(', ')}.</p> : null}
      </section>
      <div className="grid gap-4 xl:grid-cols-2">
        <section aria-label="Ranking" className="card overflow-x-auto p-3">
          <h2 className="text-sm font-semibold">Ranking for repower, by gain over the better other policy</h2>
          <table className="data-table mt-2" data-testid="ranking-table">
            <thead><tr><th className="n">Rank</th><th>Truck</th><th>Against</th><th className="n">Gain, ΔNPV ({data.currency} k)</th><th className="n">PI</th><th className="n">Capital ({data.currency} k)</th><th>Spend</th><th>In the proposal</th></tr></thead>
            <tbody>
              {data.ranking.map((r) => (
                <tr key={r.truckId} data-in-proposal={chosen.has(r.truckId) ? 'yes' : 'no'} className={chosen.has(r.truckId) ? 'bg-accent/5' : ''}>
                  <td className="n">{r.rank}</td>
                  <td>{truckLink(r.truckId)}</td>
                  <td>{POLICY_LABEL[r.bestOther]}</td>
                  <td className={`n ${r.gain > 0 ? 'text-gain' : 'text-loss'}`}>{k(r.gain)}</td>
                  <td className="n">{formatNumber(r.profitabilityIndex, 2)}</td>
                  <td className="n">{k(r.capital)}</td>
                  <td>{yearName(r.capitalYear)}</td>
                  <td>{chosen.has(r.truckId) ? <span className="font-semibold text-accent">proposed</span> : 'no'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
        <section aria-label="Swap schedule" className="card overflow-x-auto p-3">
          <h2 className="text-sm font-semibold">Swap schedule: at most {data.case.plan.swapsPerMonth} a month, in the month the programme plans</h2>
          <p className="text-xs text-muted" data-testid="schedule-due-note">
            {data.valuation === 'expected'
              ? 'Due: the month the engine reaches its planned life (the planned repower; now for a repower now or an engine past its life). A swap planned later runs the old engine on past that life when the programme finds it pays or a budget or the shop requires it. Its capital is planned in the year of the planned swap. The expected figures also count the chance that the engine fails first, which would bring the swap forward.'
              : 'Due: the month of the repower on the median failure path (at the planned life, or at the median failure age when that comes first).'}
          </p>
          <table className="data-table mt-2" data-testid="schedule-table">
            <thead><tr><th>Month</th><th>Truck</th><th>Due</th><th>Note</th></tr></thead>
            <tbody>
              {data.schedule.length === 0 ? <tr><td colSpan={4} className="text-muted">No swaps chosen.</td></tr> : null}
              {data.schedule.map((s) => (
                <tr key={s.truckId} className={s.movedEarlier || s.late ? 'bg-caution-ground' : ''}>
                  <td className="font-mono text-xs">{s.label}</td>
                  <td>{truckLink(s.truckId)}</td>
                  <td className="font-mono text-xs">{s.dueLabel}</td>
                  <td className="text-xs">{s.movedEarlier ? `moved ${s.dueMonth - s.month} month(s) earlier: shop full in ${s.dueLabel}` : s.late ? `${s.month - s.dueMonth} month(s) after it is due: the programme's timing (budget, shop or value)` : 'on due month'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </div>
    </div>
  );
}
