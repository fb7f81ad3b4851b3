'use client';

import Link from 'next/link';
import useSWR from 'swr';
import type { ProgrammeDto } from '@/lib/cases/programme-types';
import type { CaseResultDto } from '@/lib/cases/types';
import type { ApiError } from '@/lib/fetcher';
import { formatMoney, formatNumber } from '@/lib/format';
import type { NumberFormat } from '@/lib/number-input';
import { periodName } from '@/lib/plan/fiscal-year';
import { EvaluationProblems, ResultsSkeleton } from './case-results';
import { PlanControls } from './plan-controls';
import { POLICY_LABEL } from './policy';
import { ProgrammeView } from './programme-view';

/** The plan settings, the fleet programme they give (each truck's timing, binding limits, the fleet by fiscal year) and, below it, the ranking. */
export function PlanView({ slug, caseId, canEdit, numberFormat }: { slug: string; caseId: number; canEdit: boolean; numberFormat: NumberFormat }) {
  const { data, error, isLoading, mutate } = useSWR<CaseResultDto, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/result`);
  const programme = useSWR<ProgrammeDto, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/programme`);
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
      <PlanControls data={data} slug={slug} canEdit={canEdit} numberFormat={numberFormat} onSaved={() => Promise.all([mutate(), programme.mutate()])} />
      {programme.error ? (
        <EvaluationProblems error={programme.error} />
      ) : !programme.data ? (
        <div aria-busy="true" className="card h-64 animate-pulse bg-rule/60" data-testid="programme-loading"><span className="sr-only">Solving the fleet programme…</span></div>
      ) : (
        <ProgrammeView
          programme={programme.data}
          slug={slug}
          caseId={caseId}
          headline={
            <p className="mt-1 text-sm" data-testid="plan-proposal">
              The proposal: capital <span className="num font-semibold" data-testid="plan-proposal-capital">{k(data.proposal.totalCapital)}</span> {data.currency} k
              {data.proposal.capitalByFiscalYear.length ? <> ({data.proposal.capitalByFiscalYear.map((r) => `${r.fiscalYear} ${k(r.capital)}`).join(' · ')})</> : null};
              expected NPV gain <span className="num font-semibold" data-testid="plan-proposal-gain">{k(data.proposal.gainVsRebuildAll)}</span> {data.currency} k against rebuilding every engine.
              <span className="text-muted"> Comparisons: unconstrained best mix {k(data.proposal.bestMixGain)}; repower every truck {k(data.proposal.repowerAllGain)}.</span>
            </p>
          }
        />
      )}
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
    </div>
  );
}
