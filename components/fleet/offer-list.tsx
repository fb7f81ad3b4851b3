'use client';

import { Fragment, useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { formatMoney, formatNumber, formatPercent } from '@/lib/format';
import { offerInputSchema, type OfferInput } from '@/lib/validation/fleet';
import { EntityForm, type FieldSpec } from './entity-form';
import { QuoteDocuments } from './quote-documents';
import { api, type EngineRow, type OfferRow, type WorkspaceView } from './types';

/** Repower offers: each supplier quote for a module, with its quote documents beside it. */
export function OfferList({ ws }: { ws: WorkspaceView }) {
  const key = api(ws.slug, 'offers');
  const { data, error } = useSWR<{ items: OfferRow[] }>(key);
  const engines = useSWR<{ items: EngineRow[] }>(api(ws.slug, 'engines'));
  const { mutate } = useSWRConfig();
  const [editing, setEditing] = useState<OfferRow | 'new' | null>(null);
  const [open, setOpen] = useState<number | null>(null);
  const [notice, setNotice] = useState<{ ok: boolean; text: string } | null>(null);
  if (error) return <p role="alert" className="text-sm text-loss">Could not load offers: {error.message}</p>;
  if (!data || !engines.data) return <p className="text-sm text-muted">Loading offers…</p>;

  const fields: FieldSpec[] = [
    { name: 'key', label: 'Key (id in case files)', kind: 'text' },
    { name: 'supplier', label: 'Supplier', kind: 'text' },
    { name: 'engineTypeId', label: 'Engine module type', kind: 'select', numericOptions: true, options: engines.data.items.map((e) => ({ value: e.id, label: e.key })) },
    { name: 'timing', label: 'Timing', kind: 'select', options: [{ value: 'at-overhaul', label: 'At the next overhaul' }, { value: 'now', label: 'Now' }] },
    { name: 'modulePrice', label: `Module price (${ws.currency})`, kind: 'number' },
    { name: 'installCost', label: `Install cost (${ws.currency})`, kind: 'number' },
    { name: 'coreCredit', label: `Core credit (${ws.currency})`, kind: 'number', hint: 'For the old engine' },
    { name: 'failedCoreCredit', label: `Failed core credit (${ws.currency})`, kind: 'number', nullable: true, hint: 'credit for a core that failed in service; blank: the core credit' },
    { name: 'downtimeDays', label: 'Days down (d)', kind: 'number' },
    { name: 'productivityGain', label: 'Productivity gain (fraction)', kind: 'number', hint: '0.02 = 2 % more t/h' },
    { name: 'notes', label: 'Notes', kind: 'textarea', wide: true },
  ];
  const save = async (values: OfferInput) => {
    const current = editing === 'new' ? null : editing;
    if (current) await sendJson(api(ws.slug, `offers/${current.id}`), 'PUT', { ...values, version: current.version });
    else await sendJson(key, 'POST', values);
    await mutate(key);
    setEditing(null);
  };
  const remove = async (o: OfferRow) => {
    if (!window.confirm(`Delete the repower offer ${o.key} from ${o.supplier}, with its quote documents?`)) return;
    setNotice(null);
    try {
      await sendJson(api(ws.slug, `offers/${o.id}?version=${o.version}`), 'DELETE');
      if (editing !== 'new' && editing?.id === o.id) setEditing(null);
      if (open === o.id) setOpen(null);
      setNotice({ ok: true, text: `Deleted ${o.key} and its quote documents.` });
    } catch (e) {
      // 409: still in use (the answer names the trucks and cases) or changed by someone else
      setNotice({ ok: false, text: e instanceof ApiError ? e.message : 'Could not reach the server; nothing was deleted.' });
    }
    await mutate(key);
  };
  const money = (x: number) => formatMoney(x, { negative: ws.negativeStyle });

  return (
    <section>
      {editing ? (
        <div className="mb-4">
          <h2 className="mb-2 text-base font-semibold">{editing === 'new' ? 'Add a repower offer' : `Edit ${editing.key}`}</h2>
          <EntityForm
            key={editing === 'new' ? 'new' : `${editing.id}:${editing.version}`}
            schema={offerInputSchema}
            fields={fields}
            defaultValues={editing === 'new' ? { key: '', supplier: '', engineTypeId: engines.data.items[0]?.id, timing: 'at-overhaul', productivityGain: 0, failedCoreCredit: null, notes: '' } : editing}
            submitLabel={editing === 'new' ? 'Add offer' : 'Save offer'}
            onSubmit={save}
            onCancel={() => setEditing(null)}
            testId="offer-form"
            numberFormat={ws.numberFormat}
          />
        </div>
      ) : ws.canEdit ? (
        <button type="button" className="btn btn-primary mb-2" onClick={() => setEditing('new')}>Add offer</button>
      ) : null}
      {notice ? <p role={notice.ok ? 'status' : 'alert'} className={`mb-2 text-sm ${notice.ok ? '' : 'text-loss'}`} data-testid="offer-notice">{notice.text}</p> : null}
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="offer-table">
          <thead>
            <tr>
              <th>Key</th><th>Supplier</th><th>Module</th><th className="n">Module price ({ws.currency})</th><th className="n">Install ({ws.currency})</th>
              <th className="n">Core credit ({ws.currency})</th><th className="n">Failed core credit ({ws.currency})</th><th className="n">Days down (d)</th><th className="n">Productivity gain</th><th>Timing</th><th><span className="sr-only">Actions</span></th>
            </tr>
          </thead>
          <tbody>
            {data.items.map((o) => (
              <Fragment key={o.id}>
                <tr>
                  <td className="font-mono text-xs">{o.key}</td><td>{o.supplier}</td><td className="font-mono text-xs">{o.engineKey}</td>
                  <td className="n">{money(o.modulePrice)}</td><td className="n">{money(o.installCost)}</td><td className="n">{money(o.coreCredit)}</td>
                  <td className="n" title={o.failedCoreCredit == null ? 'the core credit' : undefined}>{o.failedCoreCredit == null ? <span className="text-muted">= core credit</span> : money(o.failedCoreCredit)}</td>
                  <td className="n">{formatNumber(o.downtimeDays, 1)}</td><td className="n">{formatPercent(o.productivityGain)}</td>
                  <td>{o.timing === 'now' ? 'now' : 'at overhaul'}</td>
                  <td className="whitespace-nowrap text-right">
                    <button type="button" className="text-xs text-accent hover:underline" onClick={() => setOpen(open === o.id ? null : o.id)} aria-expanded={open === o.id}>Quotes</button>
                    {ws.canEdit ? (
                      <>
                        <button type="button" className="ml-3 text-xs text-accent hover:underline" aria-label={`Edit ${o.key}`} onClick={() => setEditing(o)}>Edit</button>
                        <button type="button" className="ml-3 text-xs text-loss hover:underline" aria-label={`Delete ${o.key}`} onClick={() => remove(o)}>Delete</button>
                      </>
                    ) : null}
                  </td>
                </tr>
                {open === o.id ? (
                  <tr><td colSpan={11} className="bg-paper py-2"><QuoteDocuments ws={ws} offerId={o.id} offerKey={o.key} /></td></tr>
                ) : null}
              </Fragment>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
