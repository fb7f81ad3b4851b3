'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';

type Settings = { units: 'metric' | 'us'; negativeStyle: 'parentheses' | 'minus'; numberFormat: 'point' | 'comma' };

/** Display units and negative style (admins). Stored values stay metric; the register, the engine library and the truck and engine forms read and take the chosen units. */
export function DisplaySettings({ slug, initial, canEdit }: { slug: string; initial: Settings; canEdit: boolean }) {
  const router = useRouter();
  const [values, setValues] = useState(initial);
  const [message, setMessage] = useState<string | null>(null);
  const save = async (e: React.FormEvent) => {
    e.preventDefault();
    try {
      await sendJson(`/api/workspaces/${slug}/settings`, 'PATCH', values);
      setMessage('Saved.');
      router.refresh();
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : String(err));
    }
  };
  return (
    <form onSubmit={save} className="card max-w-xl p-4" data-testid="display-settings">
      <fieldset disabled={!canEdit}>
        <legend className="text-base font-semibold">Display</legend>
        <p className="label mt-2">Units</p>
        {(['metric', 'us'] as const).map((u) => (
          <label key={u} className="mr-4 text-sm">
            <input type="radio" name="units" value={u} checked={values.units === u} onChange={() => setValues({ ...values, units: u })} />{' '}
            {u === 'metric' ? 'Metric (kW, L, g/kWh, L/h)' : 'US customary (hp, US gal, lb/hp-h, gal/h)'}
          </label>
        ))}
        <p className="mt-1 text-xs text-muted">The fleet register, the engine library and the truck and engine forms use these units. Everything is stored and computed in metric; case results (litres), assumption prices (per litre), risk drivers, fleet files and case files stay metric, and their labels say so.</p>
        <p className="label mt-3">Negative amounts</p>
        {(['parentheses', 'minus'] as const).map((s) => (
          <label key={s} className="mr-4 text-sm">
            <input type="radio" name="negativeStyle" value={s} checked={values.negativeStyle === s} onChange={() => setValues({ ...values, negativeStyle: s })} />{' '}
            {s === 'parentheses' ? '(1,250)' : '−1,250'}
          </label>
        ))}
        <p className="label mt-3">Typing numbers</p>
        {(['point', 'comma'] as const).map((f) => (
          <label key={f} className="mr-4 text-sm">
            <input type="radio" name="numberFormat" value={f} checked={values.numberFormat === f} onChange={() => setValues({ ...values, numberFormat: f })} />{' '}
            {f === 'point' ? '18,950.5 (decimal point)' : '18.950,5 (decimal comma)'}
          </label>
        ))}
        <p className="mt-1 text-xs text-muted">How the forms and the fleet import read typed numbers; thousands may also be grouped with spaces. Figures on pages and in downloads are shown as before.</p>
      </fieldset>
      {canEdit ? <button type="submit" className="btn btn-primary mt-3">Save display settings</button> : <p className="mt-3 text-xs text-muted">Only a workspace admin can change these.</p>}
      {message ? <p role="status" className="mt-2 text-sm">{message}</p> : null}
    </form>
  );
}
