'use client';

import { useMemo } from 'react';
import { offerPowerFit } from '@/lib/fleet/offer-power';
import type { Selection } from '@/lib/validation/business-case';

export type CaseOptions = {
  assumptionSets: Array<{ id: number; name: string }>;
  /** engineKw: rated power of the engine fitted today */
  trucks: Array<{ id: number; unitNumber: string; payloadClass: string; repowerOfferId: number | null; engineKw?: number | null }>;
  /** ratedKw: rated power of the engine the offer fits */
  offers: Array<{ id: number; key: string; supplier: string; ratedKw?: number | null }>;
};

/**
 * Which trucks a case holds and the offer for each (null = the truck's own).
 * The selection keeps the register's order so a saved case reads the same way.
 * Where the offer that applies (the chosen one, else the truck's own) fits an
 * engine far from the truck's power, the row says so (`offerPowerFit`, the
 * register form's rule).
 */
export function TruckSelectionTable({ options, value, onChange, rowErrors = {} }: {
  options: CaseOptions;
  value: Selection;
  onChange: (next: Selection) => void;
  /** messages per truck id, shown on that truck's row */
  rowErrors?: Record<number, string>;
}) {
  const offerKey = useMemo(() => new Map(options.offers.map((o) => [o.id, o.key])), [options]);
  const offerKw = useMemo(() => new Map(options.offers.map((o) => [o.id, o.ratedKw ?? null])), [options]);
  const chosen = new Map(value.map((s) => [s.truckId, s.repowerOfferId]));
  const rebuild = (next: Map<number, number | null>) =>
    onChange(options.trucks.filter((t) => next.has(t.id)).map((t) => ({ truckId: t.id, repowerOfferId: next.get(t.id) ?? null })));
  const all = chosen.size === options.trucks.length;

  return (
    <>
      <label className="mb-2 inline-flex items-center gap-2 text-sm">
        <input type="checkbox" checked={all} onChange={() => rebuild(all ? new Map() : new Map(options.trucks.map((t) => [t.id, chosen.get(t.id) ?? null])))} /> All trucks
      </label>
      <div className="max-h-72 overflow-y-auto rounded border border-rule">
        <table className="data-table">
          <thead><tr><th>Include</th><th>Truck</th><th>Class</th><th>Repower offer</th></tr></thead>
          <tbody>
            {options.trucks.map((t) => {
              const applies = chosen.get(t.id) ?? t.repowerOfferId;
              const fit = chosen.has(t.id) && applies !== null ? offerPowerFit(t.engineKw ?? 0, offerKw.get(applies) ?? 0) : null;
              const power = fit && fit.kind !== 'fits' ? fit.message : null;
              return (
              <tr key={t.id}>
                <td>
                  <input
                    type="checkbox"
                    aria-label={`Include ${t.unitNumber}`}
                    checked={chosen.has(t.id)}
                    onChange={() => {
                      const n = new Map(chosen);
                      if (n.has(t.id)) n.delete(t.id);
                      else n.set(t.id, null);
                      rebuild(n);
                    }}
                  />
                </td>
                <td className="font-mono text-xs">{t.unitNumber}</td>
                <td>{t.payloadClass}</td>
                <td>
                  <select
                    aria-label={`Offer for ${t.unitNumber}`}
                    className="field py-0.5"
                    disabled={!chosen.has(t.id)}
                    aria-invalid={rowErrors[t.id] ? true : undefined}
                    value={chosen.get(t.id) ?? ''}
                    onChange={(e) => rebuild(new Map(chosen).set(t.id, e.target.value === '' ? null : Number(e.target.value)))}
                  >
                    <option value="">Truck&rsquo;s own{t.repowerOfferId ? ` (${offerKey.get(t.repowerOfferId)})` : ' (none)'}</option>
                    {options.offers.map((o) => <option key={o.id} value={o.id}>{o.key} — {o.supplier}</option>)}
                  </select>
                  {rowErrors[t.id] ? <p className="mt-0.5 text-xs text-loss">{rowErrors[t.id]}</p> : null}
                  {power ? <p className="mt-0.5 max-w-md text-xs text-caution" data-testid={`selection-power-warning-${t.unitNumber}`}>{power}</p> : null}
                </td>
              </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </>
  );
}
