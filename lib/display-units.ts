/**
 * Display units. Values are stored in MODEL.md's metric units; a workspace
 * that reads US customary sees them converted with the engine's helpers.
 */
import {
  gallonsPerHourToLitresPerHour, gPerKwhToLbPerHpH, hpToKw, kwToHp, lbPerHpHToGPerKwh, litresPerHourToGallonsPerHour,
  litresToUsGallons, usGallonsToLitres,
} from '@/lib/engine/units';

export type UnitSystem = 'metric' | 'us';
export type Quantity = 'power' | 'bsfc' | 'burn' | 'volume';

export const UNIT_LABEL: Record<UnitSystem, Record<Quantity, string>> = {
  metric: { power: 'kW', bsfc: 'g/kWh', burn: 'L/h', volume: 'L' },
  us: { power: 'hp', bsfc: 'lb/hp-h', burn: 'gal/h', volume: 'US gal' },
};

const TO_US: Record<Quantity, (x: number) => number> = {
  power: kwToHp,
  bsfc: gPerKwhToLbPerHpH,
  burn: litresPerHourToGallonsPerHour,
  volume: litresToUsGallons,
};

const FROM_US: Record<Quantity, (x: number) => number> = {
  power: hpToKw,
  bsfc: lbPerHpHToGPerKwh,
  burn: gallonsPerHourToLitresPerHour,
  volume: usGallonsToLitres,
};

/** Digits that keep each quantity readable in its unit (lb/hp-h is a small number). */
export const DISPLAY_DIGITS: Record<UnitSystem, Record<Quantity, number>> = {
  metric: { power: 0, bsfc: 0, burn: 1, volume: 0 },
  us: { power: 0, bsfc: 3, burn: 1, volume: 0 },
};

export function toDisplay(q: Quantity, value: number | null | undefined, units: UnitSystem): number | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null;
  return units === 'us' ? TO_US[q](value) : value;
}

/** A value typed in the workspace's units → the stored (metric) value. */
export function fromDisplay(q: Quantity, value: number, units: UnitSystem): number {
  return units === 'us' ? FROM_US[q](value) : value;
}

/**
 * A stored value as it goes into a form field in the workspace's units: as
 * stored in metric; converted and kept to 6 significant digits in US
 * customary (3,486.66 hp), so the field reads as a person would type it.
 *
 * @example inputText('power', 2600, 'us') // = '3486.66'
 */
export function inputText(q: Quantity, value: number | null | undefined, units: UnitSystem): string {
  const shown = toDisplay(q, value, units);
  if (shown === null) return '';
  return units === 'us' ? String(Number(shown.toPrecision(6))) : String(shown);
}

/**
 * A fraction shown as a percentage in a form field (0.5 → "50"), kept to 12
 * significant digits so 0.07 reads "7", not "7.000000000000001".
 *
 * @example percentInputText(0.6) // = '60'
 */
export function percentInputText(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '';
  return String(Number((fraction * 100).toPrecision(12)));
}

/** A percentage typed in a form → the stored fraction (50 → 0.5). */
export const fromPercent = (shown: number): number => shown / 100;
