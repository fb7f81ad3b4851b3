import { formatMoney, formatNumber, type NegativeStyle } from '@/lib/format';
import type { DriverView } from './types';

/** Money scale for a metric: a fleet's figures in millions, one truck's in thousands. */
export function moneyScale(fleet: boolean): { scale: 'k' | 'M'; suffix: string } {
  return fleet ? { scale: 'M', suffix: 'M' } : { scale: 'k', suffix: 'k' };
}

export function money(x: number | null | undefined, fleet: boolean, negative: NegativeStyle): string {
  return formatMoney(x, { scale: moneyScale(fleet).scale, negative, digits: fleet ? 2 : 0 });
}

/** A driver's value in its own unit: rates and shares as percentages, others with sensible digits. */
export function driverValue(d: Pick<DriverView, 'unit'> | undefined, v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (d?.unit.includes('%')) return `${formatNumber(v * 100, 2)} %`;
  const abs = Math.abs(v);
  return formatNumber(v, abs >= 1000 ? 0 : abs >= 10 ? 1 : abs >= 1 ? 3 : 4);
}

/** Unit for a table header: "%" drivers are shown in percent. */
export function unitLabel(d: Pick<DriverView, 'unit'> | undefined): string {
  return d?.unit ?? '';
}

/** Input ↔ stored value: percentages are typed as percent. */
export const toInput = (d: DriverView, v: number) => (d.unit.includes('%') ? Number((v * 100).toPrecision(6)) : Number(v.toPrecision(6)));
export const fromInput = (d: DriverView, v: number) => (d.unit.includes('%') ? v / 100 : v);

/**
 * The change from a driver's value in the case to another value: rates and shares (a "%" unit, stored as
 * fractions) in percentage points, "+3.2 pp" for 0.08 → 0.112; other drivers relative to the base,
 * "+72.5 %"; "" where a relative change has no meaning (a base of 0) or there is no value.
 */
export function changeLabel(d: Pick<DriverView, 'unit'> | undefined, base: number, value: number | null): string {
  if (value === null || !Number.isFinite(value) || !d) return '';
  const sign = (x: number) => (x > 0 ? '+' : x < 0 ? '−' : '');
  if (d.unit.includes('%')) {
    const points = Math.round((value - base) * 1000) / 10; // one decimal of a point
    return `${sign(points)}${formatNumber(Math.abs(points), 1)} pp`;
  }
  if (base === 0) return '';
  const rel = Math.round(((value - base) / Math.abs(base)) * 1000) / 10;
  return `${sign(rel)}${formatNumber(Math.abs(rel), 1)} %`;
}
