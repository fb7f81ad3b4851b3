'use client';

import { useEffect, useState } from 'react';
import type { CaseResultDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import { planSettingsSchema } from '@/lib/validation/business-case';
import { periodMonths, periodName } from '@/lib/plan/fiscal-year';

type Problem = { path: string; message: string };

/** Budget per fiscal year of spend (a plan period, named by the fiscal year it starts in), swaps a month and the first month; saved with the case (versioned, audited). */
export function PlanControls({ data, slug, canEdit, onSaved }: { data: CaseResultDto; slug: string; canEdit: boolean; onSaved: () => Promise<unknown> }) {
  const years = [...new Set([...data.plan.years.map((y) => y.year), ...data.summary.capitalByYear.map((c) => c.year)])].sort((a, b) => a - b);
  const stored = data.case.plan;
  const [budgets, setBudgets] = useState<Record<string, string>>({});
  const [perMonth, setPerMonth] = useState(String(stored.swapsPerMonth));
  const [start, setStart] = useState(stored.startMonth);
  const [problems, setProblems] = useState<Problem[]>([]);
  const [message, setMessage] = useState('');
  const [busy, setBusy] = useState(false);
  useEffect(() => {
    setBudgets(Object.fromEntries(Object.entries(stored.budgets).map(([y, b]) => [y, b === null ? '' : String(b)])));
    setPerMonth(String(stored.swapsPerMonth));
    setStart(stored.startMonth);
  }, [stored]);
  const editable = canEdit && (data.case.status === 'draft' || data.case.status === 'returned');
  const err = (path: string) => problems.filter((p) => p.path === path || p.path === `plan.${path}`).map((p) => p.message).join('; ');

  async function save(e: React.FormEvent) {
    e.preventDefault();
    const parsedBudgets: Record<string, number | null> = {};
    const local: Problem[] = [];
    for (const [y, v] of Object.entries(budgets)) {
      const t = v.replace(/[,\s]/g, '');
      if (t === '') continue;
      const n = Number(t);
      if (!Number.isFinite(n)) local.push({ path: `budgets.${y}`, message: 'must be a number' });
      else parsedBudgets[y] = n;
    }
    const body = { budgets: parsedBudgets, swapsPerMonth: Number(perMonth), startMonth: start };
    const checked = planSettingsSchema.safeParse(body);
    if (!checked.success) local.push(...checked.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
    setProblems(local);
    if (local.length) return setMessage('Some values need attention.');
    setBusy(true);
    setMessage('');
    try {
      await sendJson(`/api/workspaces/${slug}/cases/${data.case.id}`, 'PATCH', { version: data.case.version, plan: body });
      await onSaved();
      setMessage('Plan saved.');
    } catch (x) {
      if (x instanceof ApiError) {
        setProblems(x.problems);
        setMessage(x.message);
      } else setMessage('Could not reach the server.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={save} className="card space-y-3 p-3" aria-label="Capital plan settings" noValidate>
      <h2 className="text-sm font-semibold">Capital budget per fiscal year of spend ({data.currency}) and shop capacity</h2>
      <div className="flex flex-wrap items-start gap-3">
        {years.map((y) => (
          <div key={y}>
            <label className="label" htmlFor={`budget-${y}`}>{periodName(stored.startMonth, y, data.fiscalYearStartMonth)} budget</label>
            <input id={`budget-${y}`} inputMode="decimal" className="field w-36 text-right" placeholder="no limit" disabled={!editable} value={budgets[String(y)] ?? ''} onChange={(e) => setBudgets({ ...budgets, [String(y)]: e.target.value })} aria-invalid={!!err(`budgets.${y}`)} />
            <p className="mt-0.5 text-xs text-muted">{periodMonths(stored.startMonth, y)}</p>
            <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err(`budgets.${y}`)}</p>
          </div>
        ))}
        <div>
          <label className="label" htmlFor="swaps-per-month">Swaps per month</label>
          <input id="swaps-per-month" type="number" min={1} className="field w-24 text-right" disabled={!editable} value={perMonth} onChange={(e) => setPerMonth(e.target.value)} aria-invalid={!!err('swapsPerMonth')} />
          <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err('swapsPerMonth')}</p>
        </div>
        <div>
          <label className="label" htmlFor="start-month">First month of the plan (now)</label>
          <input id="start-month" type="month" className="field w-40" disabled={!editable} value={start} onChange={(e) => setStart(e.target.value)} aria-invalid={!!err('startMonth')} />
          <p className="mt-0.5 text-xs text-loss" aria-live="polite">{err('startMonth')}</p>
        </div>
      </div>
      {editable ? (
        <div className="flex items-center gap-2">
          <button type="submit" className="btn btn-primary" disabled={busy}>{busy ? 'Planning…' : 'Save and plan'}</button>
          <p role="status" className="text-sm">{message}</p>
        </div>
      ) : (
        <p className="text-xs text-muted" data-testid="plan-read-only">{canEdit ? `This case is ${data.case.status}; only a draft or a case sent back for changes can be changed.` : 'Read only: your role can view the plan but not change it.'}</p>
      )}
    </form>
  );
}
