'use client';

import { useEffect, useMemo, useState } from 'react';
import type { CaseResultDto, CaseSummaryDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import type { NumberFormat } from '@/lib/number-input';
import { periodMonths, periodName } from '@/lib/plan/fiscal-year';
import { monthLabel } from '@/lib/plan/schedule';
import {
  budgetLabel,
  budgetWarning,
  cheapestSwapByPeriod,
  formExtent,
  MAX_DELAY_LABEL,
  planFieldLabel,
  planFormText,
  readBudgetText,
  readPlanForm,
  START_LABEL,
  SWAPS_LABEL,
  type PlanFormText,
  type Problem,
} from '@/lib/plan/settings-input';
import { CapacityGrid } from './capacity-grid';

/** Periods of the case's horizon (0 = now … the longest truck's last year). */
const horizonPeriods = (data: CaseResultDto) => Math.max(2, ...Object.values(data.discountFactors).map((d) => d.length));

/**
 * The plan settings: a budget per fiscal year of spend (typed in the tables'
 * unit, thousands of the currency), the shop's usual swaps a month and its
 * capacity month by month (0 = shutdown), the most months a swap may be
 * planned late, and the first month. Saved with the case in one request
 * (versioned, audited): all of it or, when a field is wrong, none of it.
 */
export function PlanControls({ data, slug, canEdit, numberFormat, onSaved }: { data: CaseResultDto; slug: string; canEdit: boolean; numberFormat: NumberFormat; onSaved: () => Promise<unknown> }) {
  const stored = data.case.plan;
  const fy = data.fiscalYearStartMonth;
  const currency = data.currency;
  const { lastPeriod, months } = formExtent(data.dueSwaps, horizonPeriods(data));
  // a budget field for every period up to the last swap due (0 = now), and for any period the plan or a stored budget names
  const years = [...new Set([...Array.from({ length: lastPeriod + 1 }, (_, p) => p), ...data.plan.years.map((y) => y.year), ...Object.keys(stored.budgets).map(Number)])].sort((a, b) => a - b);
  const cheapest = useMemo(() => cheapestSwapByPeriod(data.dueSwaps), [data.dueSwaps]);
  const [text, setText] = useState<PlanFormText>(() => planFormText(stored, numberFormat, months));
  const [problems, setProblems] = useState<Problem[]>([]);
  const [message, setMessage] = useState('');
  const [busy, setBusy] = useState(false);
  // the stored settings come back formatted whenever the case changes (a save here or elsewhere), not on every refetch
  const storedKey = `${data.case.id}:${data.case.version}`;
  useEffect(() => {
    setText(planFormText(stored, numberFormat, months));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [storedKey, numberFormat, months]);

  const editable = canEdit && (data.case.status === 'draft' || data.case.status === 'returned');
  const ctx = {
    format: numberFormat,
    currency,
    periodName: (p: number) => periodName(stored.startMonth, p, fy),
    monthLabel: (m: number) => monthLabel(stored.startMonth, m),
    keepOverrides: Object.fromEntries(Object.entries(stored.capacityByMonth ?? {}).filter(([m]) => Number(m) >= months)),
  };
  const withLabel = (p: Problem) => {
    const label = planFieldLabel(p.path, ctx);
    return label && !p.message.startsWith(label) ? `${label}: ${p.message}` : p.message;
  };
  const err = (path: string) => problems.filter((p) => p.path === path || p.path === `plan.${path}`).map(withLabel).join('; ');
  const unplaced = problems.filter((p) => planFieldLabel(p.path, ctx) === null);

  async function save(e: React.FormEvent) {
    e.preventDefault();
    const read = readPlanForm(text, ctx);
    if (!read.ok) {
      setProblems(read.problems);
      setMessage(`Nothing saved: ${read.problems.length === 1 ? 'one value needs' : `${read.problems.length} values need`} attention.`);
      return;
    }
    setProblems([]);
    setBusy(true);
    setMessage('');
    try {
      const saved = await sendJson<{ case: CaseSummaryDto }>(`/api/workspaces/${slug}/cases/${data.case.id}`, 'PATCH', { version: data.case.version, plan: read.settings });
      setText(planFormText(saved.case.plan, numberFormat, months));
      await onSaved();
      setMessage('Plan saved.');
    } catch (x) {
      if (x instanceof ApiError) {
        setProblems(x.problems);
        setMessage(x.status === 409 ? 'Nothing saved: someone changed this case since you opened it. Reload the page to see their change.' : `Nothing saved: ${x.message}`);
      } else setMessage('Nothing saved: could not reach the server.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={save} className="card space-y-3 p-3" aria-label="Capital plan settings" noValidate>
      <h2 className="text-sm font-semibold">Capital budget per fiscal year of spend ({currency} k) and shop capacity</h2>
      <div className="flex flex-wrap items-start gap-3">
        {years.map((y) => {
          const name = periodName(stored.startMonth, y, fy);
          const label = budgetLabel(name, currency);
          const typed = readBudgetText(text.budgets[String(y)] ?? '', numberFormat, label);
          const warning = typed.ok ? budgetWarning(typed.value, cheapest.get(y), { periodName: name, currency, format: numberFormat }) : null;
          const problem = err(`budgets.${y}`);
          return (
            <div key={y} className="w-52">
              <label className="label" htmlFor={`budget-${y}`}>{label}</label>
              <input
                id={`budget-${y}`}
                inputMode="decimal"
                className="field w-36 text-right tabular-nums"
                placeholder="no limit"
                disabled={!editable}
                value={text.budgets[String(y)] ?? ''}
                onChange={(e) => setText({ ...text, budgets: { ...text.budgets, [String(y)]: e.target.value } })}
                aria-invalid={!!problem}
                aria-describedby={`budget-${y}-note`}
              />
              <p id={`budget-${y}-note`} className="mt-0.5 text-xs text-muted">{periodMonths(stored.startMonth, y)}</p>
              {warning ? <p className="mt-0.5 text-xs text-caution" data-testid={`budget-warning-${y}`} role="note">{warning}</p> : null}
              <p className="mt-0.5 text-xs text-loss" aria-live="polite" data-testid={`budget-error-${y}`}>{problem}</p>
            </div>
          );
        })}
      </div>
      <div className="flex flex-wrap items-start gap-3">
        <div>
          <label className="label" htmlFor="swaps-per-month">{SWAPS_LABEL}</label>
          <input id="swaps-per-month" inputMode="numeric" className="field w-24 text-right tabular-nums" disabled={!editable} value={text.swapsPerMonth} onChange={(e) => setText({ ...text, swapsPerMonth: e.target.value })} aria-invalid={!!err('swapsPerMonth')} />
          <p className="mt-0.5 text-xs text-muted">the shop&rsquo;s usual capacity, every month not set below</p>
          <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err('swapsPerMonth')}</p>
        </div>
        <div>
          <label className="label" htmlFor="max-delay-months">{MAX_DELAY_LABEL}</label>
          <input id="max-delay-months" data-testid="max-delay-months" inputMode="numeric" className="field w-24 text-right tabular-nums" disabled={!editable} value={text.maxDelayMonths} onChange={(e) => setText({ ...text, maxDelayMonths: e.target.value })} aria-invalid={!!err('maxDelayMonths')} />
          <p className="mt-0.5 text-xs text-muted">past its due month, when the shop or a budget needs it (0–12)</p>
          <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err('maxDelayMonths')}</p>
        </div>
        <div>
          <label className="label" htmlFor="start-month">{START_LABEL} (now)</label>
          <input id="start-month" type="month" className="field w-40" disabled={!editable} value={text.startMonth} onChange={(e) => setText({ ...text, startMonth: e.target.value })} aria-invalid={!!err('startMonth')} />
          <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err('startMonth')}</p>
        </div>
      </div>
      <CapacityGrid
        months={months}
        startMonth={stored.startMonth}
        fiscalYearStartMonth={fy}
        defaultText={text.swapsPerMonth}
        values={text.capacity}
        onChange={(m, t) => setText({ ...text, capacity: { ...text.capacity, [String(m)]: t } })}
        errorOf={(m) => err(`capacityByMonth.${m}`)}
        disabled={!editable}
        format={numberFormat}
      />
      {editable ? (
        <div className="flex flex-wrap items-center gap-2">
          <button type="submit" className="btn btn-primary" disabled={busy}>{busy ? 'Planning…' : 'Save and plan'}</button>
          <p role="status" className="text-sm" data-testid="plan-settings-status">{message}</p>
          {unplaced.length ? <p className="text-sm text-loss" aria-live="polite">{unplaced.map(withLabel).join('; ')}</p> : null}
        </div>
      ) : (
        <p className="text-xs text-muted" data-testid="plan-read-only">{canEdit ? `This case is ${data.case.status}; only a draft or a case sent back for changes can be changed.` : 'Read only: your role can view the plan but not change it.'}</p>
      )}
    </form>
  );
}
