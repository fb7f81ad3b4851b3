'use client';

import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { formatNumber, formatPercent } from '@/lib/format';
import { DEFAULT_ASSUMPTIONS } from '@/lib/validation/default-assumptions';
import { assumptionSetInputSchema, type AssumptionSetInput } from '@/lib/validation/fleet';
import { EntityForm, type FieldSpec } from './entity-form';
import { api, type AssumptionSetRow, type WorkspaceView } from './types';

const a = (name: string, label: string, hint?: string, nullable = false): FieldSpec => ({ name: `assumptions.${name}`, label, kind: 'number', hint, nullable });

const VALUATION_OPTIONS = [
  { value: 'expected', label: 'Expected over engine failures (recommended)' },
  { value: 'median-path', label: 'Median path (one deterministic path)' },
];
const valuationLabel = (v: unknown) => (v === 'median-path' ? 'median path' : 'expected');

function fields(currency: string): FieldSpec[] {
  return [
    { name: 'name', label: 'Name', kind: 'text' },
    a('discountRate', 'Discount rate (nominal, fraction)', '0.08 = 8 %'),
    a('inflation', 'Inflation (fraction/yr)'),
    a('horizonYears', 'Horizon cap (years)', 'Empty: each truck’s remaining life', true),
    { name: 'assumptions.timing', label: 'Cash-flow timing', kind: 'select', options: [{ value: 'end-of-year', label: 'End of year' }, { value: 'mid-year', label: 'Mid-year' }] },
    a('fuelPrice', `Fuel price (${currency}/L)`), a('fuelEscalation', 'Fuel escalation (fraction/yr)'),
    a('fuelDensityKgPerL', 'Fuel density (kg/L)'), a('co2KgPerLitre', 'CO2 per litre (kg/L)'),
    a('lubePrice', `Lube price (${currency}/L)`), a('labourRate', `Labour rate (${currency}/h)`),
    a('carbonPrice', `Carbon price (${currency}/t CO2)`), a('carbonEscalation', 'Carbon escalation (fraction/yr)'),
    a('marginPerTonne', `Margin per tonne (${currency}/t)`), a('taxRate', 'Tax rate (fraction)'),
    {
      name: 'assumptions.depreciation.method', label: 'Depreciation', kind: 'select',
      options: [{ value: 'macrs', label: 'MACRS (GDS half-year)' }, { value: 'straight-line', label: 'Straight line' }, { value: 'declining-balance', label: 'Declining balance (factor 2)' }, { value: 'none', label: 'None' }],
    },
    { name: 'assumptions.depreciation.years', label: 'Depreciation years', kind: 'number' },
    { name: 'assumptions.rebuildAccounting', label: 'Overhauls and repairs', kind: 'select', options: [{ value: 'expense', label: 'Expensed' }, { value: 'capitalise', label: 'Capitalised' }] },
    { name: 'assumptions.valuation', label: 'Valuation', kind: 'select', options: VALUATION_OPTIONS },
    { name: 'assumptions.lostMarginShare', label: 'Share of lost margin', kind: 'number', percent: true, hint: '0 % where a standby truck covers every day down' },
    { name: 'notes', label: 'Notes', kind: 'textarea', wide: true },
  ];
}

/** Named sets of economic assumptions (base, high fuel, low fuel …): new from the model's defaults, edit, copy, delete. */
export function AssumptionSets({ ws }: { ws: WorkspaceView }) {
  const key = api(ws.slug, 'assumption-sets');
  const { data, error } = useSWR<{ items: AssumptionSetRow[] }>(key);
  const { mutate } = useSWRConfig();
  const [editing, setEditing] = useState<AssumptionSetRow | 'new' | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  if (error) return <p role="alert" className="text-sm text-loss">Could not load assumption sets: {error.message}</p>;
  if (!data) return <p className="text-sm text-muted">Loading assumption sets…</p>;

  const save = async (values: AssumptionSetInput) => {
    if (!editing) return;
    if (editing === 'new') {
      await sendJson(key, 'POST', values);
      setMessage(`Added "${values.name}".`);
    } else {
      await sendJson(api(ws.slug, `assumption-sets/${editing.id}`), 'PUT', { ...values, version: editing.version });
    }
    await mutate(key);
    setEditing(null);
  };
  const copy = async (s: AssumptionSetRow) => {
    const names = new Set(data.items.map((x) => x.name));
    let name = `${s.name} (copy)`;
    for (let i = 2; names.has(name); i++) name = `${s.name} (copy ${i})`;
    try {
      const created = await sendJson<AssumptionSetRow>(key, 'POST', { name, notes: s.notes, assumptions: s.assumptions });
      await mutate(key);
      setMessage(`Copied "${s.name}" as "${name}".`);
      setEditing(created);
    } catch (e) {
      setMessage(e instanceof ApiError ? e.message : String(e));
    }
  };
  const remove = async (s: AssumptionSetRow) => {
    if (!window.confirm(`Delete the assumption set "${s.name}"?`)) return;
    try {
      await sendJson(api(ws.slug, `assumption-sets/${s.id}?version=${s.version}`), 'DELETE');
      await mutate(key);
      setEditing(null);
    } catch (e) {
      setMessage((e as Error).message);
    }
  };

  return (
    <section>
      {editing ? (
        <div className="mb-4">
          <h2 className="mb-2 text-base font-semibold">{editing === 'new' ? 'New assumption set' : `Edit “${editing.name}”`}</h2>
          {editing === 'new' ? <p className="mb-2 text-sm text-muted">Starts from the model&rsquo;s reference values; name it and change what differs for your site.</p> : null}
          <EntityForm
            key={editing === 'new' ? 'new' : `${editing.id}:${editing.version}`}
            schema={assumptionSetInputSchema}
            fields={fields(ws.currency)}
            defaultValues={editing === 'new' ? { name: '', notes: '', assumptions: { ...DEFAULT_ASSUMPTIONS, depreciation: { ...DEFAULT_ASSUMPTIONS.depreciation } } } : (editing as never)}
            submitLabel={editing === 'new' ? 'Add assumption set' : 'Save assumption set'}
            onSubmit={save}
            onCancel={() => setEditing(null)}
            extraActions={editing === 'new' ? null : <button type="button" className="btn btn-danger" onClick={() => remove(editing)}>Delete</button>}
            testId="assumption-form"
            numberFormat={ws.numberFormat}
          />
        </div>
      ) : ws.canEdit ? (
        <button type="button" className="btn btn-primary mb-2" onClick={() => { setMessage(null); setEditing('new'); }}>New set</button>
      ) : null}
      {message ? <p role="status" className="mb-2 text-sm">{message}</p> : null}
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="assumption-table">
          <thead>
            <tr>
              <th>Name</th><th className="n">Discount rate</th><th className="n">Inflation</th><th className="n">Fuel ({ws.currency}/L)</th><th className="n">Fuel escalation</th>
              <th className="n">Carbon ({ws.currency}/t)</th><th className="n">Margin ({ws.currency}/t)</th><th className="n">Tax rate</th><th>Depreciation</th><th>Valuation</th><th className="n">Lost margin share</th>{ws.canEdit ? <th><span className="sr-only">Actions</span></th> : null}
            </tr>
          </thead>
          <tbody>
            {data.items.map((s) => {
              const x = s.assumptions as Record<string, number> & { depreciation: { method: string; years?: number } };
              return (
                <tr key={s.id}>
                  <td>{s.name}</td><td className="n">{formatPercent(x.discountRate)}</td><td className="n">{formatPercent(x.inflation)}</td>
                  <td className="n">{formatNumber(x.fuelPrice, 2)}</td><td className="n">{formatPercent(x.fuelEscalation)}</td><td className="n">{formatNumber(x.carbonPrice, 0)}</td>
                  <td className="n">{formatNumber(x.marginPerTonne, 2)}</td><td className="n">{formatPercent(x.taxRate, 0)}</td>
                  <td>{x.depreciation.method}{x.depreciation.years ? ` ${x.depreciation.years} yr` : ''}</td>
                  <td>{valuationLabel(s.assumptions.valuation)}</td><td className="n">{formatPercent(x.lostMarginShare ?? 1, 0)}</td>
                  {ws.canEdit ? (
                    <td className="whitespace-nowrap text-right">
                      <button type="button" className="text-xs text-accent hover:underline" aria-label={`Edit ${s.name}`} onClick={() => setEditing(s)}>Edit</button>
                      <button type="button" className="ml-3 text-xs text-accent hover:underline" aria-label={`Copy ${s.name}`} onClick={() => copy(s)}>Copy</button>
                    </td>
                  ) : null}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </section>
  );
}
