/**
 * Issue 12, critical: values the schemas used to accept made the engine run
 * until the heap limit (an engine with weibullShape 0.01, or a life or scale of
 * 0.001 or 5e-324) or allocate a schedule as long as the tax life
 * (depreciation.years 1e9: "invalid table size"; 1e8: 5 s blocked). Each is
 * now refused with its path, by the case file and by the register's forms;
 * every number of every schema has a finite range (docs/methodology.md,
 * "Input limits").
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { assumptionsSchema, engineSchema, repowerOfferSchema, truckSchema, validateCase } from '@/lib/validation/case';
import { assumptionSetInputSchema, engineInputSchema, offerInputSchema, truckInputSchema } from '@/lib/validation/fleet';
import { planSettingsSchema } from '@/lib/validation/business-case';
import { monteCarloRequestSchema } from '@/lib/validation/risk';
import { DRIVER_CATALOGUE } from '@/lib/engine/sensitivity';

const root = path.resolve(__dirname, '../../..');
const read = (f: string) => JSON.parse(readFileSync(path.join(root, 'scenarios', f), 'utf8'));
const oneTruck = read('one-truck.json');

function problemsOf(change: (c: any) => void) {
  const c = structuredClone(oneTruck);
  change(c);
  const v = validateCase(c);
  return v.ok ? [] : v.problems;
}

const engineForm = {
  key: 'E1', name: 'Test engine', ratedKw: 2000, bsfcGPerKwh: 208, lifeHours: 20000, weibullShape: 3.2, weibullScaleHours: 24000,
  overhaulCost: 900000, overhaulDowntimeDays: 9, failureCost: 1350000, failureDowntimeDays: 28, serviceIntervalHours: 250,
  sumpLitres: 290, serviceKitCost: 850, serviceLabourHours: 5, topUpLitresPerHour: 0.12,
};

describe('issue 12: the values that killed the server are refused with their paths', () => {
  it.each([
    ['weibullShape', 0.01, 'must be at least 0.5'],
    ['lifeHours', 0.001, 'must be at least 500 hours'],
    ['lifeHours', 5e-324, 'must be at least 500 hours'],
    ['weibullScaleHours', 0.001, 'must be at least 500 hours'],
    ['weibullScaleHours', 5e-324, 'must be at least 500 hours'],
  ])('engines[0].%s = %s', (field, value, message) => {
    expect(problemsOf((c) => (c.engines[0][field] = value))).toContainEqual({ path: `engines[0].${field}`, message });
    const form = engineInputSchema.safeParse({ ...engineForm, [field]: value });
    expect(form.success).toBe(false);
    expect(form.error?.issues.map((i) => [i.path.join('.'), i.message])).toContainEqual([field, message]);
  });

  it.each([1e9, 1e8])('assumptions.depreciation.years = %s', (years) => {
    for (const method of ['straight-line', 'declining-balance', 'none'] as const) {
      expect(problemsOf((c) => (c.assumptions.depreciation = { method, years }))).toContainEqual({
        path: 'assumptions.depreciation.years',
        message: 'must be at most 100 years',
      });
    }
    const set = assumptionSetInputSchema.safeParse({ name: 'Base', assumptions: { ...oneTruck.assumptions, depreciation: { method: 'straight-line', years } } });
    expect(set.success).toBe(false);
  });

  it('refuses a horizon of more than 100 years from tiny annual hours when horizonYears is null, at the truck', () => {
    const problems = problemsOf((c) => {
      c.assumptions.horizonYears = null;
      c.trucks[0].annualHours = 1;
      c.trucks[0].remainingLifeHours = 500_000;
    });
    expect(problems).toEqual([
      {
        path: 'trucks[0].remainingLifeHours',
        message: 'gives 500,000 years at 1 hours a year, more than the 100 years allowed; lower it, raise annualHours or set assumptions.horizonYears',
      },
    ]);
    // the same truck under a horizon cap is fine
    expect(problemsOf((c) => {
      c.assumptions.horizonYears = 100;
      c.trucks[0].annualHours = 1;
      c.trucks[0].remainingLifeHours = 500_000;
    })).toEqual([]);
  });

  it('refuses a declining-balance factor above the years (it would write off more than the spend in year 1)', () => {
    expect(problemsOf((c) => (c.assumptions.depreciation = { method: 'declining-balance', years: 1 }))).toEqual([
      {
        path: 'assumptions.depreciation.factor',
        message: 'must be at most the 1 depreciation years (factor 2 would write off more than the spend in the first year); it defaults to 2',
      },
    ]);
    expect(problemsOf((c) => (c.assumptions.depreciation = { method: 'declining-balance', years: 5, factor: 10.5 }))).toContainEqual({
      path: 'assumptions.depreciation.factor',
      message: 'must be at most 10',
    });
    expect(problemsOf((c) => (c.assumptions.depreciation = { method: 'declining-balance', years: 5, factor: 5 }))).toEqual([]);
  });

  it('refuses register trucks, offers and money beyond their ranges', () => {
    const truck = { unitNumber: 'T1', engineTypeId: 1, engineHours: 0, remainingLifeHours: 1, annualHours: 6000, loadFactor: 0.5, tonnesPerHour: 800 };
    expect(truckInputSchema.safeParse(truck).success).toBe(true);
    expect(truckInputSchema.safeParse({ ...truck, engineHours: 1_000_001 }).error?.issues[0].message).toBe('must be at most 1,000,000 hours');
    expect(truckInputSchema.safeParse({ ...truck, remainingLifeHours: 0 }).error?.issues[0].message).toBe('must be greater than 0 hours');
    expect(truckInputSchema.safeParse({ ...truck, annualHours: 0.5 }).error?.issues[0].message).toBe('must be at least 1 hour');
    const offer = { key: 'O1', engineTypeId: 1, modulePrice: 1e10, installCost: 0, coreCredit: 0, downtimeDays: 365 };
    expect(offerInputSchema.safeParse(offer).success).toBe(true);
    expect(offerInputSchema.safeParse({ ...offer, modulePrice: 1.0000001e10 }).error?.issues[0].message).toBe('must be at most 10,000,000,000');
    expect(offerInputSchema.safeParse({ ...offer, downtimeDays: 366 }).error?.issues[0].message).toBe('must be at most 365 days');
    expect(planSettingsSchema.safeParse({ budgets: { '0': 1e13 }, swapsPerMonth: 2, startMonth: '2027-01' }).success).toBe(false);
  });

  it('keeps the seeded demo data and the scenarios valid', () => {
    expect(validateCase(read('one-truck.json')).ok).toBe(true);
    expect(validateCase(read('aldervane-north-pit.json')).ok).toBe(true);
    for (const set of read('aldervane-assumption-sets.json').sets) {
      expect(assumptionSetInputSchema.safeParse({ name: set.name, assumptions: set.assumptions }).success).toBe(true);
    }
  });

  it('lets no sensitivity or Monte Carlo driver range reach outside what the case accepts', () => {
    for (const [key, info] of Object.entries(DRIVER_CATALOGUE)) {
      for (const value of [info.min, info.max]) {
        const c = structuredClone(oneTruck);
        c.assumptions.horizonYears = 100;
        const target =
          info.scope === 'assumption' ? c.assumptions : info.scope === 'engine' ? c.engines[0] : info.scope === 'offer' ? c.repowerOffers[0] : c.trucks[0];
        target[key] = value;
        if (key === 'coreCredit' || key === 'failedCoreCredit') c.repowerOffers[0].modulePrice = 1e10 - c.repowerOffers[0].installCost;
        if (key === 'lifeHours' || key === 'weibullScaleHours' || key === 'weibullShape') c.trucks[0].engineHours = 0;
        const v = validateCase(c);
        expect(v.ok ? [] : v.problems, `${key} = ${value}`).toEqual([]);
      }
    }
    expect(monteCarloRequestSchema.safeParse({ iterations: 10, seed: 2 ** 31 }).success).toBe(false);
  });

  it('docs/methodology.md lists the range of every number of the case file under "Input limits"', () => {
    const doc = readFileSync(path.join(root, 'docs/methodology.md'), 'utf8');
    const section = doc.slice(doc.indexOf('## Input limits'), doc.indexOf('\n## ', doc.indexOf('## Input limits') + 3));
    const numeric = (shape: Record<string, unknown>) => Object.keys(shape).filter((k) => !['id', 'engineId', 'repowerOfferId', 'timing', 'depreciation', 'rebuildAccounting'].includes(k));
    const fields = [engineSchema, repowerOfferSchema, truckSchema, assumptionsSchema].flatMap((s) => numeric(s.shape));
    expect(fields.length).toBeGreaterThan(35);
    for (const f of fields) expect(section, f).toContain(`\`${f}\``);
  });
});
