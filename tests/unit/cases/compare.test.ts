import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { compareCases, compareInputs, compareResults, comparisonCsv, type CompareSide } from '@/lib/cases/compare';
import type { CaseResult, PolicyKey, TruckResult } from '@/lib/engine/types';
import type { CaseFile } from '@/lib/validation/case';

// Hand-built case files and results: every expected value below is read off these literals.
const assumptions: CaseFile['assumptions'] = {
  discountRate: 0.08, timing: 'end-of-year', horizonYears: null, inflation: 0.025, fuelPrice: 1.05, fuelEscalation: 0.03,
  fuelDensityKgPerL: 0.835, co2KgPerLitre: 2.697, lubePrice: 4.2, labourRate: 115, carbonPrice: 0, carbonEscalation: 0,
  marginPerTonne: 2.5, taxRate: 0.3, depreciation: { method: 'macrs', years: 7 }, rebuildAccounting: 'expense', valuation: 'expected', lostMarginShare: 1,
};
const engine = {
  id: 'QSK60', ratedKw: 1865, bsfcGPerKwh: 212, lifeHours: 20000, weibullShape: 3, weibullScaleHours: 24000, overhaulCost: 450000,
  overhaulDowntimeDays: 12, failureCost: 900000, failureDowntimeDays: 30, serviceIntervalHours: 500, sumpLitres: 280, serviceKitCost: 1200,
  serviceLabourHours: 6, topUpLitresPerHour: 0.1,
};
const offer = { id: 'M1', engineId: 'QSK60', modulePrice: 1_200_000, installCost: 80_000, coreCredit: 100_000, downtimeDays: 10, productivityGain: 0, timing: 'at-overhaul' as const };
const truck = (id: string, engineHours: number) => ({
  id, engineId: 'QSK60', repowerOfferId: 'M1', engineHours, remainingLifeHours: 20000 - engineHours, annualHours: 6000, loadFactor: 0.55, tonnesPerHour: 900, fuelBurnLitresPerHour: null,
});
const file = (over: Partial<CaseFile> = {}): CaseFile => ({
  format: 'case/1', name: 'x', currency: 'USD', assumptions, engines: [engine], repowerOffers: [offer], trucks: [truck('T1', 12000), truck('T2', 4000)], ...over,
});

/** A truck result with the given npvs and repower capital by period (breakdown entries hold only what the compare reads). */
function truckResult(id: string, npv: Record<PolicyKey, number>, capital: Record<number, number> = {}): TruckResult {
  const best = (Object.keys(npv) as PolicyKey[]).reduce((x, y) => (npv[y] > npv[x] ? y : x));
  const breakdown = Array.from({ length: 6 }, (_, y) => ({ capital: -(capital[y] ?? 0) }));
  const policy = (p: PolicyKey) => ({ npv: npv[p], breakdown: p === 'repower' ? breakdown : breakdown.map(() => ({ capital: 0 })) });
  return {
    id, horizonYears: 5, best,
    options: { keep: policy('keep'), rebuild: policy('rebuild'), repower: policy('repower') },
    repowerVsRebuild: { deltaNpv: npv.repower - npv.rebuild }, repowerVsKeep: { deltaNpv: npv.repower - npv.keep },
  } as unknown as TruckResult;
}
function caseResult(trucks: TruckResult[]): CaseResult {
  const sum = (p: PolicyKey) => trucks.reduce((s, t) => s + t.options[p].npv, 0);
  const best = trucks.reduce((s, t) => s + t.options[t.best].npv, 0);
  return { format: 'case-result/1', name: 'x', trucks, fleet: { npv: { keep: sum('keep'), rebuild: sum('rebuild'), repower: sum('repower'), best } } } as unknown as CaseResult;
}
const plan = { budgets: { '0': 2_000_000 } as Record<string, number | null>, swapsPerMonth: 2, startMonth: '2026-01' };
const side = (id: number, f: CaseFile, r: CaseResult, p = plan): CompareSide => ({ id, name: `Case ${id}`, status: 'draft', file: f, plan: p, result: r });

describe('compareInputs', () => {
  it('lists nothing for two identical cases', () => {
    const r = caseResult([truckResult('T1', { keep: -5e6, rebuild: -4e6, repower: -3e6 })]);
    expect(compareInputs(side(1, file(), r), side(2, file(), r))).toEqual([]);
  });

  it('names each changed field with its label and unit, rates in per cent and their change in points', () => {
    const b = file({ assumptions: { ...assumptions, discountRate: 0.1, fuelPrice: 1.2, depreciation: { method: 'straight-line', years: 7 } } });
    const changes = compareInputs(side(1, file(), caseResult([])), side(2, b, caseResult([])));
    expect(changes.find((c) => c.field === 'discountRate')).toEqual({ section: 'Assumptions', item: null, field: 'discountRate', label: 'Discount rate', unit: '%', a: 8, b: 10, change: 2 });
    expect(changes.find((c) => c.field === 'fuelPrice')).toMatchObject({ label: 'Fuel price', unit: 'USD per litre', a: 1.05, b: 1.2, change: 0.15 });
    expect(changes.find((c) => c.field === 'depreciation.method')).toMatchObject({ label: 'Depreciation method', a: 'macrs', b: 'straight-line', change: null });
    expect(changes.some((c) => c.field === 'depreciation.years')).toBe(false);
  });

  it('matches trucks by unit, engines and offers by key, and shows an item in one case only as one row', () => {
    const b = file({
      trucks: [truck('T1', 13000), truck('T3', 100)],
      repowerOffers: [{ ...offer, modulePrice: 1_300_000 }],
    });
    const changes = compareInputs(side(1, file(), caseResult([])), side(2, b, caseResult([])));
    const t1 = changes.filter((c) => c.item === 'T1');
    expect(t1.map((c) => c.label).sort()).toEqual(['Engine hours', 'Hours to planned overhaul']);
    expect(t1.find((c) => c.field === 'engineHours')).toMatchObject({ section: 'Truck', unit: 'hours', a: 12000, b: 13000, change: 1000 });
    expect(changes.filter((c) => c.item === 'T2')).toEqual([{ section: 'Truck', item: 'T2', field: 'present', label: 'In the case', unit: '', a: 'yes', b: null, change: null }]);
    expect(changes.filter((c) => c.item === 'T3')).toMatchObject([{ a: null, b: 'yes' }]);
    expect(changes.find((c) => c.item === 'M1')).toMatchObject({ section: 'Repower offer', label: 'Module price', unit: 'USD', change: 100_000 });
  });

  it('puts added, removed and text changes first, then numbers by the size of the change relative to A', () => {
    const b = file({
      assumptions: { ...assumptions, fuelPrice: 1.155 /* +10 % */, labourRate: 172.5 /* +50 % */, carbonPrice: 20 /* from 0 */, valuation: 'median-path' },
      trucks: [truck('T1', 12120) /* +1 % */],
    });
    const order = compareInputs(side(1, file(), caseResult([])), side(2, b, caseResult([]))).map((c) => `${c.item ?? ''}${c.field}`);
    // weights: valuation (text), carbon price (from 0) and T2 (removed) are infinite, in section order; then 50 %, 10 %, 1 %
    expect(order.slice(0, 3)).toEqual(['carbonPrice', 'valuation', 'T2present']);
    expect(order.indexOf('labourRate')).toBeLessThan(order.indexOf('fuelPrice'));
    expect(order.indexOf('fuelPrice')).toBeLessThan(order.indexOf('T1engineHours'));
  });

  it('compares plan settings: budgets by year in the currency, swaps a month, start month', () => {
    const p = { budgets: { '0': 2_500_000, '1': 1_000_000 }, swapsPerMonth: 3, startMonth: '2026-01' };
    const changes = compareInputs(side(1, file(), caseResult([])), side(2, file(), caseResult([]), p));
    expect(changes.filter((c) => c.section === 'Plan').map((c) => [c.label, c.unit, c.a, c.b, c.change])).toEqual([
      ['Budget, year 1', 'USD', null, 1_000_000, null],
      ['Swaps a month', '', 2, 3, 1],
      ['Budget, year 0', 'USD', 2_000_000, 2_500_000, 500_000],
    ]);
  });
});

describe('compareResults', () => {
  const a = caseResult([
    truckResult('T1', { keep: -5_000_000, rebuild: -4_000_000, repower: -3_500_000 }, { 1: 1_180_000 }),
    truckResult('T2', { keep: -2_000_000, rebuild: -2_100_000, repower: -2_300_000 }),
  ]);
  const b = caseResult([
    truckResult('T1', { keep: -5_000_000, rebuild: -4_000_000, repower: -3_400_000 }, { 2: 1_180_000 }),
    truckResult('T2', { keep: -2_000_000, rebuild: -1_900_000, repower: -2_300_000 }),
  ]);
  const rows = compareResults(side(1, file(), a), side(2, file(), b));

  it('gives the fleet first, its largest change first, and leaves unchanged figures out', () => {
    const fleet = rows.filter((r) => r.scope === 'Fleet');
    expect(rows.slice(0, fleet.length)).toEqual(fleet);
    // fleet: rebuild −6.1 M → −5.9 M (+200 k); repower −5.8 M → −5.7 M (+100 k); best −5.5 M → −5.3 M (+200 k)
    expect(fleet.find((r) => r.measure === 'NPV rebuild')).toMatchObject({ a: -6_100_000, b: -5_900_000, change: 200_000, unit: 'USD' });
    expect(fleet.find((r) => r.measure === 'NPV keep')).toBeUndefined();
    expect(fleet.find((r) => r.measure === 'Capital, year 1')).toMatchObject({ a: 1_180_000, b: 0, change: -1_180_000 });
    expect(fleet.find((r) => r.measure === 'Capital, year 2')).toMatchObject({ a: 0, b: 1_180_000, change: 1_180_000 });
    const sizes = fleet.map((r) => Math.abs(r.change as number));
    expect(sizes).toEqual([...sizes].sort((x, y) => y - x));
  });

  it('leads with a truck whose best policy changed, then by money', () => {
    const trucks = rows.filter((r) => r.scope !== 'Fleet');
    expect(trucks[0]).toEqual({ scope: 'T2', measure: 'Best policy', unit: '', a: 'keep', b: 'rebuild', change: null });
    // T1: ΔNPV repower vs rebuild 500 k → 600 k; T2: NPV rebuild +200 k, ΔNPV repower vs rebuild −200 k
    expect(trucks.find((r) => r.scope === 'T1' && r.measure === 'ΔNPV repower vs rebuild')).toMatchObject({ a: 500_000, b: 600_000, change: 100_000 });
    expect(trucks.find((r) => r.scope === 'T2' && r.measure === 'ΔNPV repower vs rebuild')).toMatchObject({ change: -200_000 });
    const sizes = trucks.slice(1).map((r) => Math.abs(r.change as number));
    expect(sizes).toEqual([...sizes].sort((x, y) => y - x));
  });

  it('treats a move below half a cent as no change, and puts a truck in one case only last', () => {
    const c = caseResult([truckResult('T1', { keep: -5_000_000.004, rebuild: -4_000_000, repower: -3_500_000 }, { 1: 1_180_000 }), truckResult('T9', { keep: -1, rebuild: -2, repower: -3 })]);
    const r = compareResults(side(1, file(), a), side(3, file(), c));
    expect(r.some((x) => x.scope === 'T1' && x.measure === 'NPV keep')).toBe(false);
    const t9 = r.filter((x) => x.scope === 'T9' && x.measure === 'NPV keep');
    expect(t9).toEqual([{ scope: 'T9', measure: 'NPV keep', unit: 'USD', a: null, b: -1, change: null }]);
    expect(r.at(-1)?.change).toBeNull();
  });
});

describe('comparisonCsv', () => {
  const a = caseResult([truckResult('T1', { keep: -5_000_000, rebuild: -4_000_000, repower: -3_500_000.123456 })]);
  const b = caseResult([truckResult('T1', { keep: -5_000_000, rebuild: -4_000_000, repower: -3_400_000.1 })]);
  const fb = file({ assumptions: { ...assumptions, fuelPrice: 1.2 } });

  it('writes one row per change, inputs then results, money of results to the cent, names made inert', () => {
    const cmp = compareCases({ ...side(1, file(), a), name: '=HYPERLINK("x")' }, side(2, fb, b));
    const rows = Papa.parse<string[]>(comparisonCsv(cmp).trim(), { skipEmptyLines: true }).data;
    // a header cell starts with "Case A:", so a spreadsheet reads it as text
    expect(rows[0][5]).toBe('Case A: =HYPERLINK("x") (#1)');
    expect(rows[1]).toEqual(['Input', 'Assumptions', '', 'Fuel price', 'USD per litre', '1.05', '1.2', '0.15']);
    const repower = rows.find((r) => r[0] === 'Result' && r[2] === 'T1' && r[3] === 'NPV repower');
    expect(repower).toEqual(['Result', 'Truck', 'T1', 'NPV repower', 'USD', '-3500000.12', '-3400000.1', '100000.02']);
  });

  it('makes an item that looks like a formula inert', () => {
    const cmp = compareCases(side(1, file(), a), side(2, file({ trucks: [truck('T1', 12000), truck('T2', 4000), truck('=1+2', 0)] }), a));
    const rows = Papa.parse<string[]>(comparisonCsv(cmp).trim(), { skipEmptyLines: true }).data;
    expect(rows[1].slice(0, 4)).toEqual(['Input', 'Truck', "'=1+2", 'In the case']);
  });

  it('stops at the row limit and says how many were left out', () => {
    const rows = Papa.parse<string[]>(comparisonCsv(compareCases(side(1, file(), a), side(2, fb, b)), 2).trim(), { skipEmptyLines: true }).data;
    expect(rows).toHaveLength(1 + 2 + 1);
    expect(rows.at(-1)?.[0]).toMatch(/^\d+ more changes not listed \(at most 2 rows\)$/);
  });

  it('says so when the two cases do not differ', () => {
    const rows = Papa.parse<string[]>(comparisonCsv(compareCases(side(1, file(), a), side(2, file(), a))).trim()).data;
    expect(rows[1][0]).toBe('No differences');
  });
});
