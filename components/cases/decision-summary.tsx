'use client';

import useSWR from 'swr';
import type { DecisionSummary } from '@/lib/cases/decision-summary';
import type { ApiError } from '@/lib/fetcher';
import { formatMoney, formatNumber, formatPercent, formatYears, signTone, type NegativeStyle } from '@/lib/format';
import { MONTH_NAMES } from '@/lib/plan/fiscal-year';

const SOURCE_NOTE: Record<DecisionSummary['source'], string> = {
  frozen: 'From the frozen record stored at approval; later edits to the fleet do not reach these figures.',
  submitted: 'From the snapshot taken at submission: what the approvers decide on. Later edits to the fleet do not reach these figures.',
  live: 'From the live fleet data (the case is not submitted or approved): the figures change as the fleet, offers and assumptions are edited.',
};

const tone = (x: number) => signTone(x, { scale: 'k' });

/** The decision summary: loaded from the server (frozen record, submitted snapshot or live data, as the case stands). */
export function DecisionSummaryPanel({ slug, caseId, negativeStyle }: { slug: string; caseId: number; negativeStyle: NegativeStyle }) {
  const { data, error, isLoading } = useSWR<DecisionSummary, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/decision-summary`);
  if (error)
    return (
      <section role="alert" className="card border-loss/40 p-4 text-sm" data-testid="decision-summary-error">
        <h2 className="font-semibold text-loss">The decision summary cannot be computed: {error.message}</h2>
        {error.problems?.length ? <ul className="mt-1 list-disc pl-5">{error.problems.map((p, i) => <li key={i}><code className="text-xs">{p.path}</code>: {p.message}</li>)}</ul> : null}
      </section>
    );
  if (isLoading || !data)
    return (
      <section aria-busy="true" className="card h-48 animate-pulse bg-rule/40 p-4" data-testid="decision-summary-loading">
        <span className="sr-only">Computing the decision summary…</span>
      </section>
    );
  return <DecisionSummaryView summary={data} negativeStyle={negativeStyle} />;
}

/** What an approver reads in a minute: capital asked by fiscal year, what it returns, how likely it loses money, what was left out. */
export function DecisionSummaryView({ summary: s, negativeStyle }: { summary: DecisionSummary; negativeStyle: NegativeStyle }) {
  const k = (x: number) => formatMoney(x, { scale: 'k', negative: negativeStyle });
  const cur = s.currency;
  const fyStart = MONTH_NAMES[(s.fiscalYearStartMonth || 1) - 1];
  return (
    <section aria-labelledby="decision-summary-heading" className="card space-y-3 p-4" data-testid="decision-summary" data-source={s.source}>
      <div>
        <h2 id="decision-summary-heading" className="text-base font-semibold">Decision summary: the proposal</h2>
        <p className="text-xs text-muted" data-testid="decision-source">
          {s.recordVerifies === false ? <strong className="text-loss" data-testid="ds-not-verified">The frozen record does not verify: these figures may have been altered since approval. </strong> : null}
          {SOURCE_NOTE[s.source]} {s.valuation === 'expected' ? 'Expected values over engine failures.' : 'Median failure path.'} Fiscal years start in {fyStart}; amounts in {cur} k.
        </p>
      </div>

      <div className="grid gap-3 md:grid-cols-2 2xl:grid-cols-4">
        <div className="rounded border border-rule p-3">
          <h3 className="text-xs font-medium text-muted">Capital asked by fiscal year ({cur} k)</h3>
          <table className="mt-1 w-full text-sm" data-testid="ds-capital">
            <thead className="text-xs text-muted"><tr><th className="text-left font-normal">Year</th><th className="text-right font-normal">Capital</th><th className="text-right font-normal">Budget</th></tr></thead>
            <tbody>
              {s.capitalByFiscalYear.length === 0 ? <tr><td colSpan={3} className="text-muted">No repower capital asked.</td></tr> : null}
              {s.capitalByFiscalYear.map((r) => (
                <tr key={r.fiscalYear} data-testid={`ds-capital-${r.fiscalYear}`} title={r.trucks.join(', ')}>
                  <th scope="row" className="whitespace-nowrap text-left font-normal">{r.fiscalYear} <span className="text-xs text-muted">({r.trucks.length} truck{r.trucks.length === 1 ? '' : 's'})</span></th>
                  <td className="num pl-2 text-right" data-testid="ds-capital-amount">{k(r.capital)}</td>
                  <td className="num pl-2 text-right text-muted">{r.budget === null ? 'no limit' : k(r.budget)}</td>
                </tr>
              ))}
              <tr className="border-t border-rule font-semibold"><th scope="row" className="text-left">Total</th><td className="num text-right" data-testid="ds-total-capital">{k(s.totalCapital)}</td><td /></tr>
            </tbody>
          </table>
        </div>

        <div className="rounded border border-rule p-3">
          <h3 className="text-xs font-medium text-muted">What it returns ({cur} k)</h3>
          <p className="mt-1 text-sm">Expected NPV gain against rebuilding every engine</p>
          <p className={`num text-2xl font-semibold ${tone(s.gainVsRebuildAll)}`} data-testid="ds-gain">{k(s.gainVsRebuildAll)}</p>
          <dl className="mt-1 grid grid-cols-[1fr_auto] gap-x-3 text-sm">
            <dt>IRR</dt><dd className="num text-right" data-testid="ds-irr">{s.irr === null ? '— (see MIRR)' : formatPercent(s.irr, 1)}</dd>
            <dt>MIRR</dt><dd className="num text-right" data-testid="ds-mirr">{formatPercent(s.mirr, 1)}</dd>
            <dt>Payback (years)</dt><dd className="num text-right" data-testid="ds-payback">{formatYears(s.payback)}</dd>
            <dt>Discounted payback (years)</dt><dd className="num text-right" data-testid="ds-discounted-payback">{formatYears(s.discountedPayback)}</dd>
          </dl>
          <p className="mt-1 text-xs text-muted">IRR, MIRR and paybacks of the proposal&rsquo;s cash flow less that of rebuilding every engine.</p>
        </div>

        <div className="rounded border border-rule p-3">
          <h3 className="text-xs font-medium text-muted">Comparisons ({cur} k, against rebuilding every engine)</h3>
          <dl className="mt-1 grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-sm">
            <dt>Comparison: unconstrained best mix</dt><dd className={`num text-right ${tone(s.bestMixGain)}`} data-testid="ds-best-mix">{k(s.bestMixGain)}</dd>
            <dt>Proposal against the best mix</dt><dd className={`num text-right ${tone(s.gainVsBestMix)}`} data-testid="ds-vs-best-mix">{k(s.gainVsBestMix)}</dd>
            <dt>Comparison: repower every truck</dt><dd className={`num text-right ${tone(s.repowerAllGain)}`} data-testid="ds-repower-all">{k(s.repowerAllGain)}</dd>
          </dl>
          <h3 className="mt-3 text-xs font-medium text-muted">Saved a year against rebuilding every engine</h3>
          <dl className="mt-1 grid grid-cols-[1fr_auto] gap-x-3 text-sm">
            <dt>Fuel (kL/yr)</dt><dd className="num text-right" data-testid="ds-fuel">{formatNumber(s.fuelSavedLitresPerYear / 1000, 0)}</dd>
            <dt>CO2 (t/yr)</dt><dd className="num text-right" data-testid="ds-co2">{formatNumber(s.co2SavedTonnesPerYear, 0)}</dd>
          </dl>
        </div>

        <div className="rounded border border-rule p-3" data-testid="ds-risk">
          <h3 className="text-xs font-medium text-muted">How likely it loses money</h3>
          {s.risk ? (
            <>
              <p className="mt-1 text-sm">Chance of a loss: <span className="num text-lg font-semibold" data-testid="ds-prob-loss">{formatPercent(s.risk.probabilityOfLoss, 1)}</span></p>
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-sm">
                <dt>P10</dt><dd className={`num text-right ${tone(s.risk.p10)}`}>{k(s.risk.p10)}</dd>
                <dt>P50</dt><dd className={`num text-right ${tone(s.risk.p50)}`}>{k(s.risk.p50)}</dd>
                <dt>P90</dt><dd className={`num text-right ${tone(s.risk.p90)}`}>{k(s.risk.p90)}</dd>
              </dl>
              <p className="mt-1 text-xs text-muted" data-testid="ds-risk-run">
                {s.risk.label}. Monte Carlo run {s.risk.runId.slice(0, 8)}: {formatNumber(s.risk.iterations, 0)} iterations, seed {s.risk.seed}
                {s.risk.sampleFailures ? ', engine failures sampled' : ''}; by {s.risk.author}, finished {s.risk.finishedAt.slice(0, 16).replace('T', ' ')} UTC.
              </p>
            </>
          ) : (
            <p className="mt-1 text-sm text-muted" data-testid="ds-no-run">
              {s.source === 'live' ? 'No Monte Carlo run is pinned to this case yet; pin one on the risk page before submitting.' : `${s.source === 'frozen' ? 'Approved' : 'Submitted'} without a pinned Monte Carlo run.`}
            </p>
          )}
        </div>
      </div>

      <div className="grid gap-3 md:grid-cols-2">
        <div>
          <h3 className="text-xs font-medium text-muted">Left out by the budget: what each forgoes ({cur} k)</h3>
          {s.leftOut.length === 0 ? (
            <p className="text-sm text-muted" data-testid="ds-left-out-none">No paying repower is left out.</p>
          ) : (
            <table className="data-table mt-1" data-testid="ds-left-out">
              <thead><tr><th>Truck</th><th className="n">Capital</th><th className="n">Gain forgone</th><th>Why</th><th className="n">Extra budget to add it</th></tr></thead>
              <tbody>
                {s.leftOut.map((l) => (
                  <tr key={l.truckId}><td className="whitespace-nowrap font-mono text-xs">{l.truckId}</td><td className="n">{k(l.capital)}</td><td className="n">{k(l.gainForgone)}</td><td className="text-xs">{l.reason}</td><td className="n">{k(l.extraBudget)}</td></tr>
                ))}
              </tbody>
            </table>
          )}
          {s.notWorthIt.length ? <p className="mt-1 text-xs text-muted">Not proposed because the repower does not pay against the truck&rsquo;s better other policy: {s.notWorthIt.join(', ')}.</p> : null}
        </div>
        <div>
          <h3 className="text-xs font-medium text-muted">What swings the proposal&rsquo;s gain most (each driver ±20 %, {cur} k)</h3>
          {s.topDrivers.length === 0 ? (
            <p className="text-sm text-muted">Not computed.</p>
          ) : (
            <table className="data-table mt-1" data-testid="ds-drivers">
              <thead><tr><th>Driver</th><th className="n">Gain at −20 %</th><th className="n">Gain at +20 %</th><th className="n">Swing</th></tr></thead>
              <tbody>
                {s.topDrivers.map((d) => (
                  <tr key={d.driver}><td>{d.label}</td><td className={`n ${tone(d.low)}`}>{k(d.low)}</td><td className={`n ${tone(d.high)}`}>{k(d.high)}</td><td className="n">{k(d.swing)}</td></tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
      </div>
      <p className="text-xs text-muted" data-testid="ds-chosen">Proposed for repower ({s.chosenTrucks.length}): {s.chosenTrucks.join(', ') || 'none'}. Every other truck keeps or rebuilds its engine, whichever costs less.</p>
    </section>
  );
}
