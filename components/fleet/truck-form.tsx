'use client';

import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { truckInputSchema, truckUpdateSchema, type TruckInput } from '@/lib/validation/fleet';
import { offerPowerFit } from '@/lib/fleet/offer-power';
import { EntityForm, type FieldSpec } from './entity-form';
import { api, type EngineRow, type OfferRow, type TruckRow, type WorkspaceView } from './types';

/** Add or edit one truck; the engine type and offer come from the workspace's library. */
export function TruckForm({ ws, truck, onDone }: { ws: WorkspaceView; truck: TruckRow | null; onDone: () => void }) {
  const { mutate } = useSWRConfig();
  const engines = useSWR<{ items: EngineRow[] }>(api(ws.slug, 'engines'));
  const offers = useSWR<{ items: OfferRow[] }>(api(ws.slug, 'offers'));
  const [deleteError, setDeleteError] = useState<string | null>(null);
  const fields: FieldSpec[] = [
    { name: 'unitNumber', label: 'Unit number', kind: 'text' },
    { name: 'payloadClass', label: 'Payload class', kind: 'text' },
    { name: 'engineTypeId', label: 'Engine type', kind: 'select', numericOptions: true, options: (engines.data?.items ?? []).map((e) => ({ value: e.id, label: e.key })) },
    { name: 'repowerOfferId', label: 'Repower offer', kind: 'select', numericOptions: true, nullable: true, options: (offers.data?.items ?? []).map((o) => ({ value: o.id, label: o.key })) },
    { name: 'engineHours', label: 'Engine hours (h)', kind: 'number', hint: 'Since new or last overhaul' },
    { name: 'remainingLifeHours', label: 'Remaining truck life (h)', kind: 'number' },
    { name: 'annualHours', label: 'Annual hours (h/yr)', kind: 'number' },
    { name: 'loadFactor', label: 'Load factor (0–1)', kind: 'number' },
    { name: 'tonnesPerHour', label: 'Productivity (t/h)', kind: 'number' },
    { name: 'fuelBurnLitresPerHour', label: 'Measured fuel burn', kind: 'number', nullable: true, hint: 'Leave empty if not measured', quantity: 'burn' },
    { name: 'notes', label: 'Notes', kind: 'textarea', wide: true },
  ];
  if (!engines.data || !offers.data) return <p className="text-sm text-muted">Loading engine types and offers…</p>;
  const save = async (values: TruckInput) => {
    if (truck) await sendJson(api(ws.slug, `trucks/${truck.id}`), 'PUT', { ...values, version: truck.version });
    else await sendJson(api(ws.slug, 'trucks'), 'POST', values);
    await mutate(api(ws.slug, 'trucks'));
    onDone();
  };
  const remove = async () => {
    if (!truck || !window.confirm(`Delete truck ${truck.unitNumber}?`)) return;
    setDeleteError(null);
    try {
      await sendJson(api(ws.slug, `trucks/${truck.id}?version=${truck.version}`), 'DELETE');
    } catch (e) {
      // 409: still named by a business case (the answer lists them) or changed by someone else
      setDeleteError(e instanceof ApiError ? e.message : 'Could not reach the server; nothing was deleted.');
      return;
    }
    await mutate(api(ws.slug, 'trucks'));
    onDone();
  };
  const defaults = truck
    ? { ...truck }
    : { unitNumber: '', payloadClass: '', engineTypeId: engines.data.items[0]?.id, repowerOfferId: null, fuelBurnLitresPerHour: null, notes: '' };
  return (
    <div className="mb-4">
      <h2 className="mb-2 text-base font-semibold">{truck ? `Edit truck ${truck.unitNumber}` : 'Add a truck'}</h2>
      {deleteError ? <p role="alert" className="mb-2 text-sm text-loss" data-testid="truck-delete-error">{deleteError}</p> : null}
      <EntityForm
        key={truck ? `${truck.id}:${truck.version}:${ws.units}` : `new:${ws.units}`}
        schema={truck ? truckUpdateSchema.omit({ version: true }) : truckInputSchema}
        fields={fields}
        units={ws.units}
        numberFormat={ws.numberFormat}
        defaultValues={defaults}
        submitLabel={truck ? 'Save truck' : 'Add truck'}
        onSubmit={save}
        onCancel={onDone}
        extraActions={truck ? <button type="button" className="btn btn-danger" onClick={remove}>Delete truck</button> : null}
        notice={(v) => {
          const engine = engines.data?.items.find((e) => e.id === Number(v.engineTypeId));
          const offer = offers.data?.items.find((o) => o.id === Number(v.repowerOfferId));
          const offerEngine = offer ? engines.data?.items.find((e) => e.id === offer.engineTypeId) : undefined;
          const fit = engine && offerEngine ? offerPowerFit(engine.ratedKw, offerEngine.ratedKw) : null;
          return fit && fit.kind !== 'fits' ? (
            <p role="note" className="mt-3 rounded border border-loss/40 bg-loss/5 px-2 py-1 text-sm" data-testid="offer-power-warning">
              {fit.message} (Threshold: more than 15 % below or 25 % above, common practice; see the methodology.) You can still save it.
            </p>
          ) : null;
        }}
        testId="truck-form"
      />
    </div>
  );
}
