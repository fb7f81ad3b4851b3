import { describe, expect, it } from 'vitest';
import { DEFAULT_ASSUMPTIONS } from '@/lib/validation/default-assumptions';
import { assumptionSetInputSchema } from '@/lib/validation/fleet';

describe('the values a new assumption set starts from', () => {
  it('are the reference values of MODEL.md, MACRS 7-year and overhauls expensed', () => {
    expect(DEFAULT_ASSUMPTIONS).toEqual({
      discountRate: 0.08, timing: 'end-of-year', horizonYears: null, inflation: 0.025, fuelPrice: 1.05, fuelEscalation: 0.03,
      fuelDensityKgPerL: 0.835, co2KgPerLitre: 2.697, lubePrice: 4.2, labourRate: 115, carbonPrice: 0, carbonEscalation: 0,
      marginPerTonne: 2.5, taxRate: 0.3, depreciation: { method: 'macrs', years: 7 }, rebuildAccounting: 'expense',
      valuation: 'expected', lostMarginShare: 1, // MODEL.md sections 11 and 5: the defaults
    });
  });

  it('pass the assumption-set schema once named, and are refused without a name', () => {
    expect(assumptionSetInputSchema.safeParse({ name: 'Site reference', assumptions: DEFAULT_ASSUMPTIONS }).success).toBe(true);
    const unnamed = assumptionSetInputSchema.safeParse({ name: '', assumptions: DEFAULT_ASSUMPTIONS });
    expect(unnamed.success).toBe(false);
    expect(unnamed.error?.issues.map((i) => i.path.join('.'))).toEqual(['name']);
  });
});
