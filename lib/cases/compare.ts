/**
 * Two cases side by side (pure): what changed in the inputs (assumptions,
 * engines, repower offers, trucks, plan settings; field by field, with each
 * field's label and unit) and what changed in the results (fleet and per
 * truck: NPV by policy, best policy, ΔNPV, capital by year), largest changes
 * first.
 *
 * Each side is a case as its pages read it (the caller passes the case/1 and
 * case-result/1 from lib/cases/evaluate.ts). Items are matched by their ids
 * (truck unit number, engine key, offer key); an item in one case only is one
 * row ("only in A" / "only in B"). Rates are shown in per cent and their
 * change in percentage points; money in the case's currency.
 *
 * Order: inputs whose kind of value changed (an item added or removed, a
 * choice or text changed) first, then numbers by the size of the change
 * relative to A's value (from 0 to anything counts as largest). Results: the
 * fleet rows first, then trucks, each by the size of the change in money; a
 * change of best policy leads its group; rows whose truck is in one case only
 * come last. A result that moved by less than half a cent is unchanged.
 */
import { toCsv } from '@/lib/csv';
import type { CaseResult, PolicyKey, TruckResult } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { toCents } from '@/lib/export/csv';
import type { PlanSettings } from '@/lib/validation/business-case';
import type { CaseFile } from '@/lib/validation/case';

export type CompareSide = {
  id: number;
  name: string;
  status: string;
  file: CaseFile;
  plan: PlanSettings;
  result: CaseResult;
};

export type Value = string | number | null;

export type InputSection = 'Case' | 'Assumptions' | 'Engine' | 'Repower offer' | 'Truck' | 'Plan';

export type InputChange = {
  section: InputSection;
  /** the engine key, offer key or truck unit; null for case, assumptions and plan */
  item: string | null;
  field: string;
  label: string;
  /** "%", "USD", "hours" …; "" when the value has none */
  unit: string;
  /** the values as shown (rates in per cent); null: not in that case */
  a: Value;
  b: Value;
  /** b − a for numbers (percentage points for rates), else null */
  change: number | null;
};

export type ResultChange = {
  /** "Fleet" or the truck's unit */
  scope: string;
  measure: string;
  unit: string;
  a: Value;
  b: Value;
  change: number | null;
};

export type CaseComparison = {
  a: { id: number; name: string; status: string };
  b: { id: number; name: string; status: string };
  currency: string;
  inputs: InputChange[];
  results: ResultChange[];
};

// ---------------------------------------------------------------- field labels

type Kind = 'money' | 'rate' | 'number' | 'text';
type FieldDef = { label: string; kind: Kind; unit?: string };

const POLICY_LABEL: Record<PolicyKey, string> = { keep: 'keep', rebuild: 'rebuild', repower: 'repower' };

export const ASSUMPTION_FIELDS: Record<string, FieldDef> = {
  discountRate: { label: 'Discount rate', kind: 'rate' },
  timing: { label: 'Cash-flow timing', kind: 'text' },
  horizonYears: { label: 'Horizon', kind: 'number', unit: 'years' },
  inflation: { label: 'Inflation', kind: 'rate', unit: '% a year' },
  fuelPrice: { label: 'Fuel price', kind: 'money', unit: 'per litre' },
  fuelEscalation: { label: 'Fuel price escalation', kind: 'rate', unit: '% a year' },
  fuelDensityKgPerL: { label: 'Fuel density', kind: 'number', unit: 'kg/L' },
  co2KgPerLitre: { label: 'CO2 per litre of fuel', kind: 'number', unit: 'kg/L' },
  lubePrice: { label: 'Lube oil price', kind: 'money', unit: 'per litre' },
  labourRate: { label: 'Labour rate', kind: 'money', unit: 'per hour' },
  carbonPrice: { label: 'Carbon price', kind: 'money', unit: 'per tonne CO2' },
  carbonEscalation: { label: 'Carbon price escalation', kind: 'rate', unit: '% a year' },
  marginPerTonne: { label: 'Margin per tonne', kind: 'money', unit: 'per tonne' },
  taxRate: { label: 'Tax rate', kind: 'rate' },
  'depreciation.method': { label: 'Depreciation method', kind: 'text' },
  'depreciation.years': { label: 'Depreciation life', kind: 'number', unit: 'years' },
  'depreciation.factor': { label: 'Declining-balance factor', kind: 'number' },
  rebuildAccounting: { label: 'Rebuild accounting', kind: 'text' },
  valuation: { label: 'Valuation', kind: 'text' },
  lostMarginShare: { label: 'Share of lost margin', kind: 'rate' },
};

export const ENGINE_FIELDS: Record<string, FieldDef> = {
  ratedKw: { label: 'Rated power', kind: 'number', unit: 'kW' },
  bsfcGPerKwh: { label: 'Fuel consumption (BSFC)', kind: 'number', unit: 'g/kWh' },
  lifeHours: { label: 'Planned life', kind: 'number', unit: 'hours' },
  weibullShape: { label: 'Failure shape (Weibull β)', kind: 'number' },
  weibullScaleHours: { label: 'Failure scale (Weibull η)', kind: 'number', unit: 'hours' },
  overhaulCost: { label: 'Overhaul cost', kind: 'money' },
  overhaulDowntimeDays: { label: 'Overhaul downtime', kind: 'number', unit: 'days' },
  failureCost: { label: 'Failure cost', kind: 'money' },
  failureDowntimeDays: { label: 'Failure downtime', kind: 'number', unit: 'days' },
  serviceIntervalHours: { label: 'Oil service interval', kind: 'number', unit: 'hours' },
  sumpLitres: { label: 'Sump capacity', kind: 'number', unit: 'litres' },
  serviceKitCost: { label: 'Service kit cost', kind: 'money' },
  serviceLabourHours: { label: 'Service labour', kind: 'number', unit: 'hours' },
  topUpLitresPerHour: { label: 'Oil top-up', kind: 'number', unit: 'litres per hour' },
};

export const OFFER_FIELDS: Record<string, FieldDef> = {
  engineId: { label: 'Engine', kind: 'text' },
  modulePrice: { label: 'Module price', kind: 'money' },
  installCost: { label: 'Installation cost', kind: 'money' },
  coreCredit: { label: 'Core credit', kind: 'money' },
  failedCoreCredit: { label: 'Core credit after a failure', kind: 'money' },
  downtimeDays: { label: 'Repower downtime', kind: 'number', unit: 'days' },
  productivityGain: { label: 'Productivity gain', kind: 'rate' },
  timing: { label: 'Repower timing', kind: 'text' },
};

export const TRUCK_FIELDS: Record<string, FieldDef> = {
  engineId: { label: 'Engine', kind: 'text' },
  repowerOfferId: { label: 'Repower offer', kind: 'text' },
  engineHours: { label: 'Engine hours', kind: 'number', unit: 'hours' },
  remainingLifeHours: { label: 'Hours to planned overhaul', kind: 'number', unit: 'hours' },
  annualHours: { label: 'Operating hours a year', kind: 'number', unit: 'hours' },
  loadFactor: { label: 'Load factor', kind: 'rate' },
  tonnesPerHour: { label: 'Payload moved', kind: 'number', unit: 'tonnes per hour' },
  fuelBurnLitresPerHour: { label: 'Measured fuel burn', kind: 'number', unit: 'litres per hour' },
};

// ---------------------------------------------------------------- inputs

const shown = (v: unknown, kind: Kind): Value => {
  if (v === undefined || v === null) return null;
  if (typeof v === 'number') return kind === 'rate' ? round12(v * 100) : v;
  return String(v);
};
/** Removes the floating-point tail of ×100 (0.07 · 100 = 7.000000000000001). */
const round12 = (x: number) => Number(x.toPrecision(12));

function unitOf(def: FieldDef, currency: string): string {
  if (def.kind === 'money') return def.unit ? `${currency} ${def.unit}` : currency;
  if (def.kind === 'rate') return def.unit ?? '%';
  return def.unit ?? '';
}

function flatten(o: Record<string, unknown>, prefix = ''): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(o)) {
    if (v && typeof v === 'object' && !Array.isArray(v)) Object.assign(out, flatten(v as Record<string, unknown>, `${prefix}${k}.`));
    else out[`${prefix}${k}`] = v;
  }
  return out;
}

function fieldChanges(
  section: InputSection,
  item: string | null,
  defs: Record<string, FieldDef>,
  a: Record<string, unknown>,
  b: Record<string, unknown>,
  currency: string,
): InputChange[] {
  const fa = flatten(a);
  const fb = flatten(b);
  const keys = [...new Set([...Object.keys(defs), ...Object.keys(fa), ...Object.keys(fb)])].filter((k) => k !== 'id');
  const out: InputChange[] = [];
  for (const field of keys) {
    const def = defs[field] ?? { label: field, kind: typeof (fa[field] ?? fb[field]) === 'number' ? 'number' : 'text' };
    const va = shown(fa[field], def.kind);
    const vb = shown(fb[field], def.kind);
    if (va === vb) continue;
    const change = typeof va === 'number' && typeof vb === 'number' ? round12(vb - va) : null;
    out.push({ section, item, field, label: def.label, unit: unitOf(def, currency), a: va, b: vb, change });
  }
  return out;
}

function listChanges<T extends { id: string }>(
  section: InputSection,
  defs: Record<string, FieldDef>,
  a: readonly T[],
  b: readonly T[],
  currency: string,
): InputChange[] {
  const ma = new Map(a.map((x) => [x.id, x]));
  const mb = new Map(b.map((x) => [x.id, x]));
  const out: InputChange[] = [];
  for (const id of [...new Set([...ma.keys(), ...mb.keys()])]) {
    const xa = ma.get(id);
    const xb = mb.get(id);
    if (xa && xb) out.push(...fieldChanges(section, id, defs, xa, xb, currency));
    else out.push({ section, item: id, field: 'present', label: 'In the case', unit: '', a: xa ? 'yes' : null, b: xb ? 'yes' : null, change: null });
  }
  return out;
}

function planRecord(p: PlanSettings): Record<string, unknown> {
  const out: Record<string, unknown> = { swapsPerMonth: p.swapsPerMonth, startMonth: p.startMonth };
  for (const [year, budget] of Object.entries(p.budgets)) if (budget !== null) out[`budgets.${year}`] = budget;
  return out;
}

function planDefs(a: PlanSettings, b: PlanSettings): Record<string, FieldDef> {
  const defs: Record<string, FieldDef> = {
    swapsPerMonth: { label: 'Swaps a month', kind: 'number' },
    startMonth: { label: 'Plan start month', kind: 'text' },
  };
  for (const y of new Set([...Object.keys(a.budgets), ...Object.keys(b.budgets)])) defs[`budgets.${y}`] = { label: `Budget, year ${y}`, kind: 'money' };
  return defs;
}

/** Size of an input change for ordering: Infinity for added, removed or text; else |b − a| / |a|. */
function inputWeight(c: InputChange): number {
  if (c.change === null) return Infinity;
  const a = Math.abs(c.a as number);
  return a === 0 ? Infinity : Math.abs(c.change) / a;
}

export function compareInputs(a: CompareSide, b: CompareSide): InputChange[] {
  const currency = b.file.currency;
  const out: InputChange[] = [];
  const caseDefs: Record<string, FieldDef> = { currency: { label: 'Currency', kind: 'text' } };
  out.push(...fieldChanges('Case', null, caseDefs, { currency: a.file.currency }, { currency: b.file.currency }, currency));
  out.push(...fieldChanges('Assumptions', null, ASSUMPTION_FIELDS, a.file.assumptions, b.file.assumptions, currency));
  out.push(...listChanges('Engine', ENGINE_FIELDS, a.file.engines, b.file.engines, currency));
  out.push(...listChanges('Repower offer', OFFER_FIELDS, a.file.repowerOffers, b.file.repowerOffers, currency));
  out.push(...listChanges('Truck', TRUCK_FIELDS, a.file.trucks, b.file.trucks, currency));
  out.push(...fieldChanges('Plan', null, planDefs(a.plan, b.plan), planRecord(a.plan), planRecord(b.plan), currency));
  // stable sort: equal weights keep the section order above
  return out.map((c, i) => ({ c, i, w: inputWeight(c) })).sort((x, y) => y.w - x.w || x.i - y.i).map((x) => x.c);
}

// ---------------------------------------------------------------- results

/** Half a cent: a smaller move of a money figure is floating-point noise, not a change. */
const NOISE = 0.005;

/** Capital (positive) of the repowers in the best mix of one truck, by period of spend. */
export function capitalByYear(t: TruckResult): Map<number, number> {
  const m = new Map<number, number>();
  t.options[t.best].breakdown.forEach((b, y) => {
    if (Math.abs(b.capital) > 1e-6) m.set(y, (m.get(y) ?? 0) - b.capital);
  });
  return m;
}

function fleetCapitalByYear(r: CaseResult): Map<number, number> {
  const m = new Map<number, number>();
  for (const t of r.trucks) for (const [y, v] of capitalByYear(t)) m.set(y, (m.get(y) ?? 0) + v);
  return m;
}

type Figures = { money: Array<[string, number]>; best: PolicyKey | null };

function truckFigures(t: TruckResult): Figures {
  const money: Array<[string, number]> = POLICIES.map((p) => [`NPV ${POLICY_LABEL[p]}`, t.options[p].npv]);
  money.push(['NPV of the best policy', t.options[t.best].npv]);
  money.push(['ΔNPV repower vs rebuild', t.repowerVsRebuild.deltaNpv]);
  money.push(['ΔNPV repower vs keep', t.repowerVsKeep.deltaNpv]);
  for (const [y, v] of [...capitalByYear(t)].sort((x, z) => x[0] - z[0])) money.push([`Capital, year ${y}`, v]);
  return { money, best: t.best };
}

function fleetFigures(r: CaseResult): Figures {
  const money: Array<[string, number]> = POLICIES.map((p) => [`NPV ${POLICY_LABEL[p]}`, r.fleet.npv[p]]);
  money.push(['NPV of the best mix', r.fleet.npv.best]);
  money.push(['ΔNPV repower vs rebuild', r.trucks.reduce((s, t) => s + t.repowerVsRebuild.deltaNpv, 0)]);
  money.push(['ΔNPV best mix vs rebuild', r.fleet.npv.best - r.fleet.npv.rebuild]);
  for (const [y, v] of [...fleetCapitalByYear(r)].sort((x, z) => x[0] - z[0])) money.push([`Capital, year ${y}`, v]);
  return { money, best: null };
}

function figureChanges(scope: string, fa: Figures | null, fb: Figures | null, currency: string): ResultChange[] {
  const out: ResultChange[] = [];
  if (fa?.best !== fb?.best && (fa?.best || fb?.best)) {
    out.push({ scope, measure: 'Best policy', unit: '', a: fa?.best ?? null, b: fb?.best ?? null, change: null });
  }
  const ma = new Map(fa?.money ?? []);
  const mb = new Map(fb?.money ?? []);
  const names = [...new Set([...ma.keys(), ...mb.keys()])];
  for (const measure of names) {
    const isCapital = measure.startsWith('Capital, year ');
    // a year without capital is 0 in a case that has the truck, not "missing"
    const va = ma.get(measure) ?? (fa && isCapital ? 0 : null);
    const vb = mb.get(measure) ?? (fb && isCapital ? 0 : null);
    const change = va !== null && vb !== null ? vb - va : null;
    if (change !== null && Math.abs(change) < NOISE) continue;
    out.push({ scope, measure, unit: currency, a: va, b: vb, change });
  }
  return out;
}

function byMoney(rows: ResultChange[]): ResultChange[] {
  const weight = (r: ResultChange) => (r.measure === 'Best policy' ? Infinity : r.change === null ? -1 : Math.abs(r.change));
  return rows.map((r, i) => ({ r, i, w: weight(r) })).sort((x, y) => y.w - x.w || x.i - y.i).map((x) => x.r);
}

export function compareResults(a: CompareSide, b: CompareSide): ResultChange[] {
  const currency = b.file.currency;
  const fleet = byMoney(figureChanges('Fleet', fleetFigures(a.result), fleetFigures(b.result), currency));
  const ta = new Map(a.result.trucks.map((t) => [t.id, t]));
  const tb = new Map(b.result.trucks.map((t) => [t.id, t]));
  const trucks: ResultChange[] = [];
  for (const id of [...new Set([...ta.keys(), ...tb.keys()])]) {
    const xa = ta.get(id);
    const xb = tb.get(id);
    trucks.push(...figureChanges(id, xa ? truckFigures(xa) : null, xb ? truckFigures(xb) : null, currency));
  }
  return [...fleet, ...byMoney(trucks)];
}

export function compareCases(a: CompareSide, b: CompareSide): CaseComparison {
  return {
    a: { id: a.id, name: a.name, status: a.status },
    b: { id: b.id, name: b.name, status: b.status },
    currency: b.file.currency,
    inputs: compareInputs(a, b),
    results: compareResults(a, b),
  };
}

// ---------------------------------------------------------------- CSV

/** Most change rows in one CSV (inputs and results together): 10,000 trucks × a few changed fields each. */
export const COMPARE_CSV_MAX_ROWS = 50_000;

const cents = (v: Value): Value => (typeof v === 'number' ? toCents(v) : v);

/**
 * The comparison as CSV through the one CSV writer (formula-looking text made
 * inert): one row per change, inputs first, then results, both in the order
 * above. Result money is rounded to the cent (said in the header); inputs are
 * as entered. Past `maxRows` a last row says how many were left out.
 */
export function comparisonCsv(c: CaseComparison, maxRows = COMPARE_CSV_MAX_ROWS): string {
  const header = ['Part', 'Section', 'Item', 'What', 'Unit', `Case A: ${c.a.name} (#${c.a.id})`, `Case B: ${c.b.name} (#${c.b.id})`, 'Change (B − A; results rounded to cents)'];
  const rows: Value[][] = [
    ...c.inputs.map((x) => ['Input', x.section, x.item, x.label, x.unit, x.a, x.b, x.change]),
    ...c.results.map((x) => ['Result', x.scope === 'Fleet' ? 'Fleet' : 'Truck', x.scope === 'Fleet' ? null : x.scope, x.measure, x.unit, cents(x.a), cents(x.b), cents(x.change)]),
  ];
  const kept = rows.slice(0, maxRows);
  if (rows.length > maxRows) kept.push([`${(rows.length - maxRows).toLocaleString('en-US')} more changes not listed (at most ${maxRows.toLocaleString('en-US')} rows)`, null, null, null, null, null, null, null]);
  if (rows.length === 0) kept.push(['No differences', null, null, null, null, null, null, null]);
  return toCsv(header, kept);
}
