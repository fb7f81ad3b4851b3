/**
 * Which trucks of a case a driver touches: the trucks whose npvs can change
 * when it moves. A driver on the assumptions, or on every truck ("*"),
 * touches every truck; a driver on one truck touches that truck; on an offer,
 * the trucks that use the offer; on an engine, the trucks that run it today
 * or get it from their offer. Every other truck's npvs are the base case's,
 * number for number (each truck is evaluated on its own: the case-wide year
 * tables are the same numbers for any set of trucks, a prefix of the
 * longest), so a sensitivity run re-evaluates only the touched trucks.
 */
import type { CaseFileInput } from '@/lib/validation/case';
import { DRIVER_CATALOGUE, type DriverRef } from './drivers';

/** Indices (in case order) of the trucks `d` touches, or null when it touches every truck. */
export function trucksTouched(c: CaseFileInput, d: DriverRef): number[] | null {
  const scope = DRIVER_CATALOGUE[d.key].scope;
  if (scope === 'assumption' || (scope === 'truck' && d.target === '*')) return null;
  const out: number[] = [];
  if (scope === 'truck') {
    c.trucks.forEach((t, i) => t.id === d.target && out.push(i));
    return out;
  }
  if (scope === 'offer') {
    c.trucks.forEach((t, i) => t.repowerOfferId === d.target && out.push(i));
    return out;
  }
  const offerEngine = new Map(c.repowerOffers.map((o) => [o.id, o.engineId]));
  c.trucks.forEach((t, i) => (t.engineId === d.target || offerEngine.get(t.repowerOfferId) === d.target) && out.push(i));
  return out;
}

/** The union of what several drivers touch, ascending (null: every truck). */
export function trucksTouchedByAll(c: CaseFileInput, drivers: readonly DriverRef[]): number[] | null {
  const seen = new Set<number>();
  for (const d of drivers) {
    const t = trucksTouched(c, d);
    if (t === null) return null;
    for (const i of t) seen.add(i);
  }
  return [...seen].sort((a, b) => a - b);
}

/** Whether a driver touches any truck of the case (one that touches none cannot move any figure). */
export function touchesAnyTruck(c: CaseFileInput, d: DriverRef): boolean {
  const t = trucksTouched(c, d);
  return t === null ? c.trucks.length > 0 : t.length > 0;
}
