'use client';

import useSWR from 'swr';
import type { TruckResultDto } from '@/lib/cases/types';
import type { ApiError } from '@/lib/fetcher';
import { POLICIES } from '@/lib/engine/types';
import { formatMoney, formatNumber, formatPercent, formatYears } from '@/lib/format';
import { bestOtherPolicy, repowerComparison } from '@/lib/plan';
import { paybackHold, paybackWarning } from '@/lib/cases/payback';
import { CashFlowTable } from './cash-flow-table';
import { PaybackFigure } from './payback-figure';
import { EvaluationProblems, ResultsSkeleton } from './case-results';
import { VALUATION_NOTE } from '@/lib/cases/valuation';
import { CostStackChart, CumulativeDeltaChart, FuelChart, partYearOf } from './charts';
import { ValuationBadge } from './case-results';
import { EventTimeline } from './event-timeline';
import { ExpectedEventsTable } from './expected-events-table';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

/** What `failureBeforePlanned` is under each policy (MODEL.md section 11). */
const FAIL_LABEL = {
  keep: 'Fails in service within the horizon',
  rebuild: 'Fails in service before its overhaul',
  repower: 'Fails in service before the repower',
} as const;

export function TruckView({ slug, caseId, truckId }: { slug: string; caseId: number; truckId: string }) {
  const { data, error, isLoading } = useSWR<TruckResultDto, ApiError>(`/api/workspaces/${slug}/cases/${caseId}/trucks/${encodeURIComponent(truckId)}`);
  if (error) return <EvaluationProblems error={error} />;
  if (isLoading || !data) return <ResultsSkeleton />;
  const { result, detail, meta, currency, negativeStyle: neg, valuation } = data;
  const other = bestOtherPolicy(result);
  const c = repowerComparison(result);
  // a path of events to draw exists on the median path only; the expected valuation has counts per year instead
  const hasPath = POLICIES.some((p) => detail.policies[p].valuation === 'path' && meta.events[p].length > 0);
  const noGain = data.withoutGain.trucks[result.id];
  const partYear = partYearOf(detail, meta.annualHours);
  const delta = result.options.repower.cashFlows.map((x, i) => x - result.options[other].cashFlows[i]);
  const discountedHold = paybackHold(delta.map((x, i) => x * detail.policies.repower.periods[i].discountFactor));
  const holdNote = paybackWarning(discountedHold) ?? paybackWarning(paybackHold(delta));
  const noInvestment = paybackHold(delta).kind === 'no-investment';
  return (
    <div className="space-y-4">
      <p className="text-sm">
        <ValuationBadge valuation={valuation} /> <span className="text-xs text-muted">{VALUATION_NOTE[valuation]}</span>
      </p>
      <section aria-label="Truck summary" className="grid gap-3 md:grid-cols-4">
        {POLICIES.map((p) => (
          <div key={p} className="card p-3" style={{ borderTop: `3px solid ${POLICY_COLOUR[p]}` }}>
            <h2 className="text-xs font-medium text-muted">{POLICY_LABEL[p]}{result.best === p ? ' — best' : ''}</h2>
            <p className="num text-lg font-semibold" data-testid={`npv-${p}`}>{formatMoney(result.options[p].npv, { negative: neg })}</p>
            <p className="text-xs text-muted">NPV ({currency}); {formatNumber(result.options[p].costPerHour, 2)} {currency}/h; {formatNumber(result.options[p].fuelLitresPerHour, 1)} L/h</p>
            <p className="mt-1 flex justify-between gap-2 text-xs">
              <span className="text-muted">{FAIL_LABEL[p]}</span>
              <span className="num" data-testid={`fail-before-${p}`}>{formatPercent(result.options[p].failureBeforePlanned, 1)}</span>
            </p>
          </div>
        ))}
        <div className="card p-3 text-sm">
          <h2 className="text-xs font-medium text-muted">Repower vs {POLICY_LABEL[other].toLowerCase()} ({currency})</h2>
          <dl className="grid grid-cols-[1fr_auto] gap-x-3">
            <dt>ΔNPV</dt><dd className="num text-right">{formatMoney(c.deltaNpv, { negative: neg })}</dd>
            {other !== 'rebuild' ? <><dt>ΔNPV vs rebuild</dt><dd className="num text-right">{formatMoney(result.repowerVsRebuild.deltaNpv, { negative: neg })}</dd></> : null}
            <dt title="ΔNPV repower vs rebuild of the same case with the repower offer's productivity gain set to 0">ΔNPV vs rebuild without the productivity gain</dt>
            <dd className="num text-right" data-testid="delta-no-gain">{formatMoney(noGain, { negative: neg })}</dd>
            <dt>IRR</dt><dd className="num text-right">{formatPercent(c.irr)}</dd>
            <dt>MIRR</dt><dd className="num text-right">{formatPercent(c.mirr)}</dd>
            <dt>Payback (yr)</dt><dd className="num text-right" data-testid="truck-payback"><PaybackFigure years={c.paybackYears} hold={paybackHold(delta)} /></dd>
            <dt>Discounted payback (yr)</dt><dd className="num text-right" data-testid="truck-discounted-payback"><PaybackFigure years={c.discountedPaybackYears} hold={discountedHold} /></dd>
            <dt>PI</dt><dd className="num text-right">{formatNumber(c.profitabilityIndex, 2)}</dd>
          </dl>
        </div>
      </section>
      {holdNote ? <p role="note" className="rounded border border-loss/40 bg-loss/5 px-2 py-1 text-sm text-loss" data-testid="truck-payback-warning">{holdNote}: the payback does not hold (see the cumulative chart).</p> : null}
      {noInvestment ? <p role="note" className="text-sm text-muted" data-testid="truck-no-investment">Payback: — (no investment). Repowering this truck spends nothing more than {POLICY_LABEL[other].toLowerCase()} in any year before it gains, so there is nothing to pay back.</p> : null}
      <p className="text-xs text-muted">
        Engine {meta.engineId} at {formatNumber(meta.engineHours, 0)} h, {formatNumber(meta.annualHours, 0)} h a year; offer {meta.repowerOfferId} (engine {detail.repowerEngineId}); horizon {result.horizonYears} years; power demand {formatNumber(detail.powerKw, 0)} kW; fuel calibration ×{formatNumber(detail.calibrationFactor, 3)}.
      </p>
      <div className="grid gap-3 xl:grid-cols-3">
        <CumulativeDeltaChart result={result} detail={detail} currency={currency} partYear={partYear} />
        <CostStackChart detail={detail} currency={currency} />
        <FuelChart detail={detail} partYear={partYear} />
      </div>
      {hasPath ? <EventTimeline events={meta.events} horizonYears={result.horizonYears} currency={currency} /> : null}
      <ExpectedEventsTable result={result} valuation={valuation} />
      <CashFlowTable detail={detail} currency={currency} negative={neg} />
    </div>
  );
}
