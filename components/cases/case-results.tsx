'use client';

import useSWR from 'swr';
import type { CaseResultDto } from '@/lib/cases/types';
import { VALUATION_LABEL, VALUATION_NOTE } from '@/lib/cases/valuation';
import type { ApiError } from '@/lib/fetcher';
import { FleetSummary } from './fleet-summary';
import { FleetYearsChart } from './fleet-years-chart';
import { TruckTable } from './truck-table';

/** The evaluated case: read from the server (the engine never runs in the browser). */
export function CaseResults({ slug, caseId }: { slug: string; caseId: number }) {
  const { data, error, isLoading } = useSWR<CaseResultDto, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/result`);
  if (error) return <EvaluationProblems error={error} />;
  if (isLoading || !data) return <ResultsSkeleton />;
  return (
    <div className="space-y-4">
      <div>
        <h2 className="text-base font-semibold">
          {data.case.name} <span className="text-sm font-normal text-muted">— {data.case.assumptionSetName} assumptions, {data.result.trucks.length} trucks, {data.case.status}</span>{' '}
          <ValuationBadge valuation={data.valuation} />
        </h2>
        <p className="text-xs text-muted">{VALUATION_NOTE[data.valuation]}</p>
      </div>
      <FleetSummary data={data} />
      <FleetYearsChart years={data.fleetYears} currency={data.currency} />
      <TruckTable data={data} slug={slug} />
    </div>
  );
}

/** Which valuation the figures are, beside a headline. */
export function ValuationBadge({ valuation }: { valuation: CaseResultDto['valuation'] }) {
  return (
    <span className="ml-1 inline-block rounded border border-rule bg-paper px-1.5 py-0.5 align-middle text-xs font-medium text-ink" data-testid="valuation-label" title="The valuation the figures are (set in the case's assumptions)">
      {VALUATION_LABEL[valuation]}
    </span>
  );
}

export function ResultsSkeleton() {
  return (
    <div aria-busy="true" className="space-y-3" data-testid="results-loading">
      <div className="grid gap-3 lg:grid-cols-4">{[0, 1, 2, 3].map((i) => <div key={i} className="h-28 animate-pulse rounded bg-rule/60" />)}</div>
      <div className="h-96 animate-pulse rounded bg-rule/60" />
      <span className="sr-only">Evaluating the case…</span>
    </div>
  );
}

export function EvaluationProblems({ error }: { error: ApiError }) {
  return (
    <div role="alert" className="card border-loss/40 p-4" data-testid="evaluation-problems">
      <h2 className="font-semibold text-loss">{error.message}</h2>
      {error.problems?.length ? (
        <ul className="mt-2 list-disc pl-5 text-sm">
          {error.problems.map((p, i) => <li key={i}><code className="font-mono text-xs">{p.path}</code>: {p.message}</li>)}
        </ul>
      ) : null}
    </div>
  );
}
