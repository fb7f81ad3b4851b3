'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';
import { MONTH_NAMES } from '@/lib/plan/fiscal-year';
import { parseNumberText } from '@/lib/number-input';

type Settings = { units: 'metric' | 'us'; negativeStyle: 'parentheses' | 'minus'; fiscalYearStartMonth: number; numberFormat: 'point' | 'comma'; actualsTolerancePercent: number };

const UNIT_LABELS: Record<Settings['units'], string> = { metric: 'Metric (kW, L, g/kWh, L/h)', us: 'US customary (hp, US gal, lb/hp-h, gal/h)' };
const NEGATIVE_LABELS: Record<Settings['negativeStyle'], string> = { parentheses: '(1,250)', minus: '−1,250' };
const NUMBER_FORMAT_LABELS: Record<Settings['numberFormat'], string> = { point: '18,950.5 (decimal point)', comma: '18.950,5 (decimal comma)' };

/** Display units, negative style, how numbers are typed and the fiscal year's first month (admins; read-only text for others). Stored values stay metric; the register, the engine library and the truck and engine forms read and take the chosen units. */
export function DisplaySettings({ slug, initial, canEdit }: { slug: string; initial: Settings; canEdit: boolean }) {
  const router = useRouter();
  const [values, setValues] = useState(initial);
  const [message, setMessage] = useState<string | null>(null);
  const [toleranceText, setToleranceText] = useState(String(initial.actualsTolerancePercent));
  const save = async (e: React.FormEvent) => {
    e.preventDefault();
    const tol = parseNumberText(toleranceText, values.numberFormat, { example: '5' });
    if (!tol.ok || tol.value === null) {
      setMessage(`Plan-against-actual tolerance: ${tol.ok ? 'enter a percentage such as 5' : tol.message}`);
      return;
    }
    try {
      await sendJson(`/api/workspaces/${slug}/settings`, 'PATCH', { ...values, actualsTolerancePercent: tol.value });
      setMessage('Saved.');
      router.refresh();
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  };
  if (!canEdit) {
    // read-only for those who cannot save: the values as text, nothing to click
    return (
      <section className="card max-w-xl p-4" data-testid="display-settings" aria-label="Display settings">
        <h2 className="text-base font-semibold">Display</h2>
        <dl className="mt-2 grid grid-cols-[10rem_1fr] gap-y-1 text-sm">
          <dt className="text-muted">Units</dt>
          <dd data-testid="setting-units">{UNIT_LABELS[initial.units]}</dd>
          <dt className="text-muted">Negative amounts</dt>
          <dd data-testid="setting-negative">{NEGATIVE_LABELS[initial.negativeStyle]}</dd>
          <dt className="text-muted">Typing numbers</dt>
          <dd data-testid="setting-number-format">{NUMBER_FORMAT_LABELS[initial.numberFormat]}</dd>
          <dt className="text-muted">Fiscal year starts</dt>
          <dd data-testid="setting-fiscal-year">{MONTH_NAMES[initial.fiscalYearStartMonth - 1]}</dd>
          <dt className="text-muted">Actuals tolerance</dt>
          <dd data-testid="setting-actuals-tolerance">± {initial.actualsTolerancePercent} %</dd>
        </dl>
        <p className="mt-3 text-xs text-muted" data-testid="settings-who-changes">Only a workspace admin can change these settings; ask one of your admins.</p>
      </section>
    );
  }
  return (
    <form onSubmit={save} className="card max-w-xl p-4" data-testid="display-settings">
      <fieldset>
        <legend className="text-base font-semibold">Display</legend>
        <p className="label mt-2">Units</p>
        {(['metric', 'us'] as const).map((u) => (
          <label key={u} className="mr-4 text-sm">
            <input type="radio" name="units" value={u} checked={values.units === u} onChange={() => setValues({ ...values, units: u })} />{' '}
            {UNIT_LABELS[u]}
          </label>
        ))}
        <p className="mt-1 text-xs text-muted">The fleet register, the engine library and the truck and engine forms use these units. Everything is stored and computed in metric; case results (litres), assumption prices (per litre), risk drivers, fleet files and case files stay metric, and their labels say so.</p>
        <p className="label mt-3">Negative amounts</p>
        {(['parentheses', 'minus'] as const).map((s) => (
          <label key={s} className="mr-4 text-sm">
            <input type="radio" name="negativeStyle" value={s} checked={values.negativeStyle === s} onChange={() => setValues({ ...values, negativeStyle: s })} />{' '}
            {NEGATIVE_LABELS[s]}
          </label>
        ))}
        <label className="label mt-3 block" htmlFor="fiscal-year-start">Fiscal year starts in</label>
        <select
          id="fiscal-year-start"
          className="field"
          value={values.fiscalYearStartMonth}
          onChange={(e) => setValues({ ...values, fiscalYearStartMonth: Number(e.target.value) })}
        >
          {MONTH_NAMES.map((name, i) => (
            <option key={name} value={i + 1}>{name}</option>
          ))}
        </select>
        <p className="mt-1 text-xs text-muted">
          Budgets, capital and plan tables are by fiscal year, named after the calendar year the fiscal year ends in
          {values.fiscalYearStartMonth === 1
            ? ' (January start: FY2027 is the calendar year 2027).'
            : ` (${MONTH_NAMES[values.fiscalYearStartMonth - 1]} start: FY2027 runs from ${MONTH_NAMES[values.fiscalYearStartMonth - 1]} 2026 to ${MONTH_NAMES[values.fiscalYearStartMonth - 2]} 2027).`}
        </p>
        <p className="label mt-3">Typing numbers</p>
        {(['point', 'comma'] as const).map((f) => (
          <label key={f} className="mr-4 text-sm">
            <input type="radio" name="numberFormat" value={f} checked={values.numberFormat === f} onChange={() => setValues({ ...values, numberFormat: f })} />{' '}
            {NUMBER_FORMAT_LABELS[f]}
          </label>
        ))}
        <p className="mt-1 text-xs text-muted">How the forms and the fleet import read typed numbers; thousands may also be grouped with spaces. Figures on pages and in downloads are shown as before.</p>
        <label className="label mt-3 block" htmlFor="actuals-tolerance">Plan-against-actual tolerance (%)</label>
        <input id="actuals-tolerance" className="field w-24 text-right tabular-nums" inputMode="decimal" value={toleranceText} onChange={(e) => setToleranceText(e.target.value)} />
        <p className="mt-1 text-xs text-muted">An approved case&apos;s plan against actual flags a truck whose operating hours or fuel burn stray more than ± this share from the case (0.1 to 100 %, default 5 %).</p>
      </fieldset>
      <button type="submit" className="btn btn-primary mt-3">Save display settings</button>
      {message ? <p role="status" className="mt-2 text-sm">{message}</p> : null}
    </form>
  );
}
