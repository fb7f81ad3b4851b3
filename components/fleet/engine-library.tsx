'use client';

import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import { DISPLAY_DIGITS, toDisplay, UNIT_LABEL, type Quantity } from '@/lib/display-units';
import { sendJson } from '@/lib/fetcher';
import { reliabilityFigures } from '@/lib/engine/reliability-figures';
import { formatMoney, formatNumber, formatPercent } from '@/lib/format';
import { engineInputSchema, type EngineInput } from '@/lib/validation/fleet';
import { EntityForm, type FieldSpec } from './entity-form';
import { OverhaulLifePanel } from './overhaul-life-panel';
import { api, type EngineRow, type WorkspaceView } from './types';

const n = (name: string, label: string, hint?: string, quantity?: Quantity): FieldSpec => ({ name, label, kind: 'number', hint, quantity });

/** The form's fields; money in the workspace's currency. */
const fieldsFor = (currency: string): FieldSpec[] => [
  { name: 'key', label: 'Key (id in case files)', kind: 'text' },
  { name: 'name', label: 'Name', kind: 'text', wide: true },
  n('ratedKw', 'Rated power', undefined, 'power'), n('bsfcGPerKwh', 'BSFC', undefined, 'bsfc'), n('lifeHours', 'Planned life (h)', 'Hours between overhauls'),
  n('weibullShape', 'Weibull shape β'), n('weibullScaleHours', 'Weibull scale η (h)'),
  n('overhaulCost', `Overhaul cost (${currency})`), n('overhaulDowntimeDays', 'Overhaul days down (d)'),
  n('failureCost', `Failure repair cost (${currency})`), n('failureDowntimeDays', 'Failure days down (d)'),
  n('serviceIntervalHours', 'Oil-service interval (h)'), n('sumpLitres', 'Sump', undefined, 'volume'), n('serviceKitCost', `Service kit cost (${currency})`),
  n('serviceLabourHours', 'Service labour (h)'), n('topUpLitresPerHour', 'Oil top-up', undefined, 'burn'),
  { name: 'notes', label: 'Notes', kind: 'textarea', wide: true },
];

/** The engine library: every engine type's rating, fuel, life, failure law and service figures. */
export function EngineLibrary({ ws }: { ws: WorkspaceView }) {
  const key = api(ws.slug, 'engines');
  const { data, error } = useSWR<{ items: EngineRow[] }>(key);
  const { mutate } = useSWRConfig();
  const [editing, setEditing] = useState<EngineRow | 'new' | null>(null);
  const [lifeOf, setLifeOf] = useState<number | null>(null);
  const u = UNIT_LABEL[ws.units];
  const q = (qty: Quantity, v: number) => formatNumber(toDisplay(qty, v, ws.units), DISPLAY_DIGITS[ws.units][qty]);
  if (error) return <p role="alert" className="text-sm text-loss">Could not load engine types: {error.message}</p>;
  if (!data) return <p className="text-sm text-muted">Loading engine types…</p>;
  const figures = new Map(data.items.map((e) => [e.id, reliabilityFigures(e)]));
  const aboveMedian = data.items.filter((e) => figures.get(e.id)?.plannedAboveMedian);

  const save = async (values: EngineInput) => {
    const current = editing === 'new' ? null : editing;
    if (current) await sendJson(api(ws.slug, `engines/${current.id}`), 'PUT', { ...values, version: current.version });
    else await sendJson(key, 'POST', values);
    await mutate(key);
    setEditing(null);
  };
  const remove = async (e: EngineRow) => {
    if (!window.confirm(`Delete engine type ${e.key}?`)) return;
    try {
      await sendJson(api(ws.slug, `engines/${e.id}?version=${e.version}`), 'DELETE');
      await mutate(key);
      setEditing(null);
    } catch (err) {
      window.alert((err as Error).message);
    }
  };

  return (
    <section>
      {editing ? (
        <div className="mb-4">
          <h2 className="mb-2 text-base font-semibold">{editing === 'new' ? 'Add an engine type' : `Edit ${editing.key}`}</h2>
          <EntityForm
            key={editing === 'new' ? `new:${ws.units}` : `${editing.id}:${editing.version}:${ws.units}`}
            schema={engineInputSchema}
            fields={fieldsFor(ws.currency)}
            units={ws.units}
            numberFormat={ws.numberFormat}
            defaultValues={editing === 'new' ? { key: '', name: '', notes: '' } : editing}
            submitLabel={editing === 'new' ? 'Add engine type' : 'Save engine type'}
            onSubmit={save}
            onCancel={() => setEditing(null)}
            extraActions={editing !== 'new' ? <button type="button" className="btn btn-danger" onClick={() => remove(editing)}>Delete</button> : null}
            testId="engine-form"
          />
        </div>
      ) : ws.canEdit ? (
        <button type="button" className="btn btn-primary mb-2" onClick={() => setEditing('new')}>Add engine type</button>
      ) : null}
      {aboveMedian.length ? (
        <div role="note" aria-label="Planned life above median life" className="mb-2 rounded border border-caution-rule bg-caution-ground px-3 py-2 text-sm text-caution" data-testid="life-above-median">
          <strong className="font-semibold">Planned life is above the median life: most engines of this type fail before their overhaul. Review the Weibull figures.</strong>{' '}
          {aboveMedian.map((e) => `${e.key} (planned ${formatNumber(e.lifeHours)} h, median ${formatNumber(figures.get(e.id)!.medianLifeHours)} h)`).join('; ')}.
        </div>
      ) : null}
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="engine-table">
          <thead>
            <tr>
              <th>Key</th><th>Name</th><th className="n">Rated ({u.power})</th><th className="n">BSFC ({u.bsfc})</th><th className="n">Life (h)</th>
              <th className="n">β</th><th className="n">η (h)</th>
              <th className="n" title="η·(ln 2)^(1/β): half of new engines fail in service before this age">Median life (h)</th>
              <th className="n" title="η·Γ(1 + 1/β)">Mean life (h)</th>
              <th className="n" title="1 − exp(−(planned life/η)^β), for a new engine">Fails before planned life</th><th className="n">Overhaul ({ws.currency})</th><th className="n">Failure ({ws.currency})</th>
              <th className="n">Oil interval (h)</th><th className="n">Sump ({u.volume})</th><th><span className="sr-only">Overhaul life</span></th>{ws.canEdit ? <th><span className="sr-only">Actions</span></th> : null}
            </tr>
          </thead>
          <tbody>
            {data.items.map((e) => (
              <tr key={e.id}>
                <td className="font-mono text-xs">{e.key}</td><td>{e.name}</td>
                <td className="n">{q('power', e.ratedKw)}</td><td className="n">{q('bsfc', e.bsfcGPerKwh)}</td><td className="n">{formatNumber(e.lifeHours)}</td>
                <td className="n">{formatNumber(e.weibullShape, 2)}</td><td className="n">{formatNumber(e.weibullScaleHours)}</td>
                <td className="n" data-testid="median-life">{formatNumber(figures.get(e.id)!.medianLifeHours)}</td>
                <td className="n" data-testid="mean-life">{formatNumber(figures.get(e.id)!.meanLifeHours)}</td>
                <td className={`n ${figures.get(e.id)!.plannedAboveMedian ? 'font-semibold text-caution' : ''}`} data-testid="fail-before-life">
                  {figures.get(e.id)!.plannedAboveMedian ? <span aria-label="Planned life above median life" title="Planned life is above the median life">▲ </span> : null}
                  {formatPercent(figures.get(e.id)!.failureBeforePlanned)}
                </td>
                <td className="n">{formatMoney(e.overhaulCost, { negative: ws.negativeStyle })}</td><td className="n">{formatMoney(e.failureCost, { negative: ws.negativeStyle })}</td>
                <td className="n">{formatNumber(e.serviceIntervalHours)}</td><td className="n">{q('volume', e.sumpLitres)}</td>
                <td className="text-right">
                  <button type="button" className="whitespace-nowrap text-xs text-accent hover:underline" aria-label={`Recommended overhaul life of ${e.key}`} aria-expanded={lifeOf === e.id} onClick={() => setLifeOf(lifeOf === e.id ? null : e.id)}>
                    Recommended life
                  </button>
                </td>
                {ws.canEdit ? <td className="text-right"><button type="button" className="text-xs text-accent hover:underline" aria-label={`Edit ${e.key}`} onClick={() => setEditing(e)}>Edit</button></td> : null}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-1 text-xs text-muted">
        Median life η·(ln 2)^(1/β), mean life η·Γ(1 + 1/β) and the chance of failing in service before the planned life, 1 − exp(−(life/η)^β), are for a new engine,
        from its Weibull law. &ldquo;Recommended life&rdquo; gives the planned life with the lowest expected cost per operating hour.
      </p>
      {lifeOf !== null && data.items.some((e) => e.id === lifeOf) ? <OverhaulLifePanel ws={ws} engine={data.items.find((e) => e.id === lifeOf)!} engineIds={data.items.map((e) => e.id)} onClose={() => setLifeOf(null)} /> : null}
    </section>
  );
}
