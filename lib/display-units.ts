/**
 * Display units. Values are stored in MODEL.md's metric units; a workspace
 * that reads US customary sees them converted with the engine's helpers.
 */
import {
  gPerKwhToLbPerHpH, kwToHp, litresPerHourToGallonsPerHour, litresToUsGallons,
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

/** Digits that keep each quantity readable in its unit (lb/hp-h is a small number). */
export const DISPLAY_DIGITS: Record<UnitSystem, Record<Quantity, number>> = {
  metric: { power: 0, bsfc: 0, burn: 1, volume: 0 },
  us: { power: 0, bsfc: 3, burn: 1, volume: 0 },
};

export function toDisplay(q: Quantity, value: number | null | undefined, units: UnitSystem): number | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null;
  return units === 'us' ? TO_US[q](value) : value;
}
