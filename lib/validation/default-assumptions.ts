import type { z } from 'zod';
import type { assumptionsSchema } from './case';

/**
 * Where a new assumption set starts: the reference values of MODEL.md's worked
 * example (8 % nominal discount, 2.5 % inflation, diesel at 1.05 a litre rising
 * 3 % a year, 30 % tax, MACRS 7-year, overhauls expensed), valued as the
 * expectation over engine failures with every day down's margin lost. No carbon price until
 * the user sets one.
 */
export const DEFAULT_ASSUMPTIONS = {
  discountRate: 0.08,
  timing: 'end-of-year',
  horizonYears: null,
  inflation: 0.025,
  fuelPrice: 1.05,
  fuelEscalation: 0.03,
  fuelDensityKgPerL: 0.835,
  co2KgPerLitre: 2.697,
  lubePrice: 4.2,
  labourRate: 115,
  carbonPrice: 0,
  carbonEscalation: 0,
  marginPerTonne: 2.5,
  taxRate: 0.3,
  depreciation: { method: 'macrs', years: 7 },
  rebuildAccounting: 'expense',
  valuation: 'expected',
  lostMarginShare: 1,
} as const satisfies z.input<typeof assumptionsSchema>;
