import { describe, expect, it } from 'vitest';
import { fromPercent, percentInputText } from '@/lib/display-units';
import { DEFAULT_ASSUMPTIONS } from '@/lib/validation/default-assumptions';
import { assumptionSetInputSchema, offerInputSchema, offerUpdateSchema } from '@/lib/validation/fleet';
import { assumptionSetColumns, assumptionsOfRow } from '@/lib/db/assumption-columns';

const offer = { key: 'K1', supplier: 'S', engineTypeId: 1, modulePrice: 1_500_000, installCost: 140_000, coreCredit: 100_000, downtimeDays: 2.5, productivityGain: 0, timing: 'at-overhaul' };
const pathsOf = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  r.error?.issues.map((i) => [i.path.join('.'), i.message]) ?? [];

describe('the offer form: failed core credit', () => {
  it('is optional: absent or blank (null) stores null, the core credit applies', () => {
    expect(offerInputSchema.parse(offer).failedCoreCredit).toBeNull();
    expect(offerInputSchema.parse({ ...offer, failedCoreCredit: null }).failedCoreCredit).toBeNull();
  });
  it('takes a credit up to module price + install cost', () => {
    expect(offerInputSchema.parse({ ...offer, failedCoreCredit: 40_000 }).failedCoreCredit).toBe(40_000);
    expect(offerInputSchema.parse({ ...offer, failedCoreCredit: 1_640_000 }).failedCoreCredit).toBe(1_640_000);
    expect(offerUpdateSchema.parse({ ...offer, failedCoreCredit: 0, version: 3 }).failedCoreCredit).toBe(0);
  });
  it('is refused above module price + install cost, like the core credit, and when negative', () => {
    expect(pathsOf(offerInputSchema.safeParse({ ...offer, failedCoreCredit: 1_640_001 }))).toEqual([
      ['failedCoreCredit', 'must not exceed module price + install cost (the capital cost would be negative)'],
    ]);
    expect(pathsOf(offerUpdateSchema.safeParse({ ...offer, failedCoreCredit: 2e6, version: 1 })).map((p) => p[0])).toEqual(['failedCoreCredit']);
    expect(pathsOf(offerInputSchema.safeParse({ ...offer, failedCoreCredit: -1 }))).toEqual([['failedCoreCredit', 'must not be negative']]);
    expect(pathsOf(offerInputSchema.safeParse({ ...offer, coreCredit: 2e6, failedCoreCredit: 2e6 })).map((p) => p[0])).toEqual(['coreCredit', 'failedCoreCredit']);
  });
});

describe('the assumption-set form: valuation and share of lost margin', () => {
  const set = (a: Record<string, unknown>) => assumptionSetInputSchema.safeParse({ name: 'S', assumptions: { ...DEFAULT_ASSUMPTIONS, ...a } });
  it('defaults to the expected valuation and the whole margin lost', () => {
    const { valuation: _v, lostMarginShare: _l, ...older } = DEFAULT_ASSUMPTIONS;
    const r = assumptionSetInputSchema.parse({ name: 'S', assumptions: older });
    expect([r.assumptions.valuation, r.assumptions.lostMarginShare]).toEqual(['expected', 1]);
  });
  it('accepts median-path and any share in [0, 1]', () => {
    for (const v of [0, 0.5, 1]) expect(set({ valuation: 'median-path', lostMarginShare: v }).success).toBe(true);
  });
  it('refuses an unknown valuation and a share outside [0, 1]', () => {
    expect(pathsOf(set({ valuation: 'mean' }))).toEqual([['assumptions.valuation', 'must be "expected" or "median-path"']]);
    expect(pathsOf(set({ lostMarginShare: 1.01 }))).toEqual([['assumptions.lostMarginShare', 'must be at most 1 (100 %)']]);
    expect(pathsOf(set({ lostMarginShare: -0.1 }))).toEqual([['assumptions.lostMarginShare', 'must not be negative']]);
  });
});

describe('percentage fields: shown as per cent, stored as a fraction', () => {
  it('shows a fraction as the percentage a person would type', () => {
    expect(percentInputText(0.5)).toBe('50');
    expect(percentInputText(0.07)).toBe('7');
    expect(percentInputText(1)).toBe('100');
    expect(percentInputText(0.123)).toBe('12.3');
    expect(percentInputText(null)).toBe('');
  });
  it('stores what is typed as a fraction, which the schema then checks', () => {
    expect(fromPercent(50)).toBe(0.5);
    expect(fromPercent(60)).toBe(0.6);
    expect(fromPercent(0)).toBe(0);
    expect(set100(fromPercent(100))).toBe(true);
    expect(set100(fromPercent(101))).toBe(false);
  });
});
const set100 = (v: number) => assumptionSetInputSchema.safeParse({ name: 'S', assumptions: { ...DEFAULT_ASSUMPTIONS, lostMarginShare: v } }).success;

describe('assumption-set rows: the two assumptions live in columns', () => {
  it('moves them out of the JSON on write and back in on read', () => {
    const cols = assumptionSetColumns({ ...DEFAULT_ASSUMPTIONS, valuation: 'median-path', lostMarginShare: 0.6 });
    expect([cols.valuation, cols.lostMarginShare]).toEqual(['median-path', 0.6]);
    expect(JSON.parse(cols.assumptions)).not.toHaveProperty('valuation');
    expect(JSON.parse(cols.assumptions)).not.toHaveProperty('lostMarginShare');
    expect(assumptionsOfRow(cols)).toEqual({ ...DEFAULT_ASSUMPTIONS, valuation: 'median-path', lostMarginShare: 0.6 });
  });
  it('gives the model defaults when the assumptions leave them out', () => {
    const cols = assumptionSetColumns({ discountRate: 0.08 });
    expect([cols.valuation, cols.lostMarginShare]).toEqual(['expected', 1]);
  });
});
