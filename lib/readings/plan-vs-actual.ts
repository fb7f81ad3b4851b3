/**
 * Plan against actual (issue 20): an approved case's forecast held against the
 * monthly readings recorded after its approval. Pure: no I/O, no clock; the
 * caller passes the frozen case/1, its frozen case-result/1, the proposal's
 * policy per truck, the plan's first month, the readings and a tolerance.
 * Nothing is re-evaluated: every forecast figure comes from the frozen result.
 *
 * **Months and periods.** Month index m counts calendar months from the plan's
 * first month ("YYYY-MM", m = 0), as the capital plan does
 * (lib/plan/fiscal-year.ts). Month m lies in the engine's year y = ⌊m/12⌋ + 1;
 * period 0 ("now") is booked in month 0. Months after a truck's horizon N
 * expect nothing.
 *
 * **From the frozen result, per truck, policy X and year y ≥ 1** (MODEL.md
 * sections 2 and 4; the breakdown is signed as cash, costs negative):
 * - hours H_y = min(A, R − (y−1)·A), never negative (A annual hours, R remaining life);
 * - fuel price f_y = fuelPrice·(1+fuelEscalation)^(y−1); a litre's price with
 *   its carbon p_y = f_y + co2KgPerLitre/1000 · carbonPrice·(1+carbonEscalation)^(y−1);
 * - expected litres L_y^X = −fuel_y^X / f_y (the engine's own litres: its fuel
 *   cost is litres · f_y); burn ℓ_y^X = L_y^X / H_y (L per operating hour);
 * - other operating cost per hour o_y^X = (cost_y^X − L_y^X·p_y) / H_y, where
 *   cost_y^X = −(fuel + carbon + lube + overhauls + failures + lostMargin −
 *   extraMargin)_y (pre-tax, undiscounted, capital excluded);
 * - planned capital K_y^X = −capital_y^X, booked in the month of the truck's
 *   scheduled swap when it lies in year y (period 0: month 0), else in the
 *   year's first month.
 *
 * **Per truck and month m** (P the proposal's policy, R rebuild):
 * - hours h = meter − previous meter (a repower month: the new meter), the
 *   forecast hours Ĥ = H_y/12; a first reading without an earlier one is a
 *   baseline only (its month is not compared);
 * - fuel: actual litres F; expected for the actual hours E = ℓ_y^P · h;
 *   fuel cost at the case's prices F·p_y against E·p_y;
 * - events and days down against the expected counts of P's `events`
 *   (period y's counts /12 a month, period 0's in month 0) and days
 *   (overhauls × the overhaul days of the engine fitted under P, repairs ×
 *   its failure days, repowers × the offer's days);
 * - capital C (the recorded repowers' cost) against K^P of the month.
 *
 * **Saving** (against rebuilding, as the proposal's gain is measured):
 *   forecast   S_f = (cost_y^R − cost_y^P)/12 − (K^P − K^R)_m
 *   realised   S_r = (ℓ_y^R·p_y + o_y^R)·h − (F·p_y + o_y^P·h + C)
 * i.e. what rebuilding would have cost on the actual hours minus what the
 * proposal cost on them: its actual fuel at the case's prices, its other costs
 * at the forecast's rate per hour, and the capital actually spent. Period 0's
 * other costs (events "now") enter both in month 0. Overhauls, failures and
 * days down recorded are compared as counts, not costed (the readings carry no
 * cost for them). With readings equal to the forecast (h = Ĥ, F = E, C = K^P)
 * S_r = S_f exactly; 5 % more fuel lowers S_r by 0.05·F·p_y.
 *
 * **Flags**: over the months shown, a truck whose hours Σh/ΣĤ − 1 or whose
 * burn ΣF/ΣE − 1 stray beyond ± tolerance.
 *
 * **Worked example** (also `tests/unit/readings/plan-vs-actual.test.ts`):
 * year 1, fuel price 1.00 /L, no carbon, rebuild burns 200 L/h with other
 * costs of 100 /h, the proposal (repower) 180 L/h with 90 /h, annual hours
 * 6,000 (500 h a month), no capital in the month. A month with h = 480 h and
 * F = 90,000 L: E = 180 × 480 = 86,400 L (F is 4.17 % over);
 * S_f = (200 + 100 − 180 − 90) × 500 = 15,000;
 * S_r = (200 + 100) × 480 − (90,000 + 90 × 480) = 144,000 − 133,200 = 10,800.
 */
import type { CaseFile } from '@/lib/validation/case';
import type { CaseResult, PolicyKey, TruckResult } from '@/lib/engine/types';
import { fiscalYearOf } from '@/lib/plan/fiscal-year';

export type ActualReading = {
  /** the truck's unit number (the case file's truck id) */
  unit: string;
  month: string;
  hourMeter: number;
  fuelLitres: number;
  overhauls: number;
  failures: number;
  daysDown: number;
  repowerDate: string | null;
  repowerCost: number | null;
};

export type PlanVsActualInput = {
  file: CaseFile;
  result: CaseResult;
  policies: Record<string, string>;
  /** the plan's first month, "YYYY-MM" (month index 0) */
  startMonth: string;
  /** month index of each scheduled swap, by truck */
  swapMonths?: Record<string, number>;
  /** readings of the case's trucks; those before `startMonth` serve only as baselines */
  readings: ActualReading[];
  /** e.g. 0.05 for ± 5 % */
  tolerance: number;
  fiscalYearStartMonth?: number;
};

/** Sums over some months, actual against forecast. */
export type Figures = {
  months: number;
  hours: number;
  forecastHours: number;
  litres: number;
  /** expected litres for the actual hours under the proposal's policy */
  expectedLitres: number;
  fuelCost: number;
  expectedFuelCost: number;
  overhauls: number;
  failures: number;
  repowers: number;
  expectedOverhauls: number;
  expectedFailures: number;
  expectedRepowers: number;
  daysDown: number;
  expectedDaysDown: number;
  capital: number;
  plannedCapital: number;
  saving: number;
  forecastSaving: number;
};

export type MonthFigures = Figures & { month: string; index: number; fiscalYear: number };

export type TruckPlanVsActual = {
  unit: string;
  policy: PolicyKey;
  months: MonthFigures[];
  total: Figures;
  /** Σh/ΣĤ − 1 and ΣF/ΣE − 1 over the months (null without forecast hours / expected litres) */
  hoursVariance: number | null;
  burnVariance: number | null;
  flags: Array<'hours' | 'burn'>;
};

export type PlanVsActual = {
  trucks: TruckPlanVsActual[];
  fleet: Figures;
  /** fleet figures by month (months any truck has), for the chart */
  fleetMonths: MonthFigures[];
  fiscalYears: number[];
  tolerance: number;
};

const ZERO: Figures = {
  months: 0, hours: 0, forecastHours: 0, litres: 0, expectedLitres: 0, fuelCost: 0, expectedFuelCost: 0, overhauls: 0, failures: 0, repowers: 0,
  expectedOverhauls: 0, expectedFailures: 0, expectedRepowers: 0, daysDown: 0, expectedDaysDown: 0, capital: 0, plannedCapital: 0, saving: 0, forecastSaving: 0,
};
const KEYS = Object.keys(ZERO) as (keyof Figures)[];

export function addFigures(a: Figures, b: Figures): Figures {
  const out = { ...a };
  for (const k of KEYS) out[k] = a[k] + b[k];
  return out;
}

export function monthIndex(start: string, month: string): number {
  return (Number(month.slice(0, 4)) - Number(start.slice(0, 4))) * 12 + (Number(month.slice(5, 7)) - Number(start.slice(5, 7)));
}

export function monthOfIndex(start: string, m: number): string {
  const total = Number(start.slice(0, 4)) * 12 + Number(start.slice(5, 7)) - 1 + m;
  return `${String(Math.floor(total / 12)).padStart(4, '0')}-${String((total % 12) + 1).padStart(2, '0')}`;
}

/** What the frozen result says of one truck and policy in year y (see the module comment). */
export type YearForecast = { hours: number; litres: number; burn: number; litrePrice: number; fuelPrice: number; otherPerHour: number; cost: number; capital: number; otherCost: number };

export function yearForecast(file: CaseFile, truck: TruckResult, policy: PolicyKey, y: number): YearForecast {
  const t = file.trucks.find((x) => x.id === truck.id)!;
  const a = file.assumptions;
  const b = truck.options[policy].breakdown[y];
  const hours = y === 0 ? 0 : Math.max(0, Math.min(t.annualHours, t.remainingLifeHours - (y - 1) * t.annualHours));
  const gf = y === 0 ? 1 : Math.pow(1 + a.fuelEscalation, y - 1);
  const gc = y === 0 ? 1 : Math.pow(1 + a.carbonEscalation, y - 1);
  const fuelPrice = a.fuelPrice * gf;
  const litrePrice = fuelPrice + (a.co2KgPerLitre / 1000) * a.carbonPrice * gc;
  if (!b) return { hours: 0, litres: 0, burn: 0, litrePrice, fuelPrice, otherPerHour: 0, cost: 0, capital: 0, otherCost: 0 };
  // with a zero fuel price the litres follow from the carbon cost, else from the policy's burn over the horizon
  const carbonPerLitre = litrePrice - fuelPrice;
  const opt = truck.options[policy];
  const litres = fuelPrice > 0 ? -b.fuel / fuelPrice : carbonPerLitre > 0 ? -b.carbon / carbonPerLitre : opt.fuelLitresPerHour * hours;
  const cost = -(b.fuel + b.carbon + b.lube + b.overhauls + b.failures + b.lostMargin + b.extraMargin);
  const otherCost = cost - litres * litrePrice;
  return { hours, litres, burn: hours > 0 ? litres / hours : 0, litrePrice, fuelPrice, otherPerHour: hours > 0 ? otherCost / hours : 0, cost, capital: -b.capital, otherCost };
}

const isPolicy = (p: string): p is PolicyKey => p === 'keep' || p === 'rebuild' || p === 'repower';

/** The month a period's planned capital is booked in. */
function capitalMonth(y: number, swapMonth: number | undefined): number {
  if (y === 0) return 0;
  if (swapMonth !== undefined && swapMonth >= 12 * (y - 1) && swapMonth < 12 * y) return swapMonth;
  return 12 * (y - 1);
}

export function planVsActual(input: PlanVsActualInput): PlanVsActual {
  const { file, result, startMonth, tolerance } = input;
  const fyStart = input.fiscalYearStartMonth ?? 1;
  const byUnit = new Map<string, ActualReading[]>();
  for (const r of input.readings) {
    const list = byUnit.get(r.unit) ?? [];
    list.push(r);
    byUnit.set(r.unit, list);
  }
  const trucks: TruckPlanVsActual[] = [];
  const fleetByMonth = new Map<number, MonthFigures>();
  for (const truck of result.trucks) {
    const stated = input.policies[truck.id];
    const policy: PolicyKey = stated && isPolicy(stated) ? stated : 'rebuild';
    const t = file.trucks.find((x) => x.id === truck.id)!;
    const engine = (id: string) => file.engines.find((e) => e.id === id);
    const offer = file.repowerOffers.find((o) => o.id === t.repowerOfferId);
    const fitted = policy === 'repower' && offer ? engine(offer.engineId) : engine(t.engineId);
    const start = engine(t.engineId);
    const N = truck.horizonYears;
    const fc = (p: PolicyKey, y: number) => yearForecast(file, truck, p, y);
    const readings = [...(byUnit.get(truck.id) ?? [])].sort((a, b) => (a.month < b.month ? -1 : 1));
    const months: MonthFigures[] = [];
    for (let i = 0; i < readings.length; i++) {
      const r = readings[i];
      const m = monthIndex(startMonth, r.month);
      if (m < 0 || i === 0) continue; // before the plan, or a baseline
      const prev = readings[i - 1];
      const h = r.repowerDate !== null ? r.hourMeter : r.hourMeter - prev.hourMeter;
      const y = Math.floor(m / 12) + 1;
      const inHorizon = y <= N;
      const P = inHorizon ? fc(policy, y) : null;
      const R = inHorizon ? fc('rebuild', y) : null;
      const ev = inHorizon ? truck.options[policy].events[y] : null;
      const ev0 = m === 0 ? truck.options[policy].events[0] : null;
      const evCount = (k: 'overhauls' | 'repairs' | 'repowers') => (ev ? ev[k] / 12 : 0) + (ev0 ? ev0[k] : 0);
      const expectedOverhauls = evCount('overhauls');
      const expectedFailures = evCount('repairs');
      const expectedRepowers = evCount('repowers');
      // period 0's events ("now") fall on the engine fitted at the start, or are the repower itself
      const expectedDaysDown =
        expectedOverhauls * (fitted?.overhaulDowntimeDays ?? 0) + expectedFailures * (start?.failureDowntimeDays ?? 0) + expectedRepowers * (offer?.downtimeDays ?? 0);
      let planned = 0;
      let plannedR = 0;
      for (let yy = 0; yy <= N; yy++) {
        if (capitalMonth(yy, input.swapMonths?.[truck.id]) !== m) continue;
        planned += fc(policy, yy).capital;
        plannedR += fc('rebuild', yy).capital;
      }
      const p0 = m === 0 ? fc(policy, 0).otherCost : 0;
      const r0 = m === 0 ? fc('rebuild', 0).otherCost : 0;
      const capital = r.repowerDate !== null ? (r.repowerCost ?? 0) : 0;
      const litrePrice = P?.litrePrice ?? 0;
      const expectedLitres = P ? P.burn * h : 0;
      const forecastSaving = (P && R ? (R.cost - P.cost) / 12 : 0) + (r0 - p0) - (planned - plannedR);
      const saving = R && P ? (R.burn * litrePrice + R.otherPerHour) * h + r0 - (r.fuelLitres * litrePrice + P.otherPerHour * h + p0 + capital) + plannedR : r0 - p0 - capital + plannedR;
      const f: MonthFigures = {
        month: r.month,
        index: m,
        fiscalYear: fiscalYearOf(Number(r.month.slice(0, 4)), Number(r.month.slice(5, 7)), fyStart),
        months: 1,
        hours: h,
        forecastHours: P ? P.hours / 12 : 0,
        litres: r.fuelLitres,
        expectedLitres,
        fuelCost: r.fuelLitres * litrePrice,
        expectedFuelCost: expectedLitres * litrePrice,
        overhauls: r.overhauls,
        failures: r.failures,
        repowers: r.repowerDate !== null ? 1 : 0,
        expectedOverhauls,
        expectedFailures,
        expectedRepowers,
        daysDown: r.daysDown,
        expectedDaysDown,
        capital,
        plannedCapital: planned,
        saving,
        forecastSaving,
      };
      months.push(f);
      const fm = fleetByMonth.get(m);
      fleetByMonth.set(m, fm ? { ...addFigures(fm, f), month: f.month, index: m, fiscalYear: f.fiscalYear, months: 1 } : { ...f });
    }
    trucks.push(summariseTruck(truck.id, policy, months, tolerance));
  }
  const fleetMonths = [...fleetByMonth.values()].sort((a, b) => a.index - b.index);
  const fleet = trucks.reduce((s, t) => addFigures(s, t.total), ZERO);
  const fiscalYears = [...new Set(fleetMonths.map((m) => m.fiscalYear))].sort((a, b) => a - b);
  return { trucks, fleet, fleetMonths, fiscalYears, tolerance };
}

/** Sums a truck's months and sets its flags. */
export function summariseTruck(unit: string, policy: PolicyKey, months: MonthFigures[], tolerance: number): TruckPlanVsActual {
  const total = months.reduce<Figures>((s, m) => addFigures(s, m), ZERO);
  const hoursVariance = total.forecastHours > 0 ? total.hours / total.forecastHours - 1 : null;
  const burnVariance = total.expectedLitres > 0 ? total.litres / total.expectedLitres - 1 : null;
  const flags: TruckPlanVsActual['flags'] = [];
  // a variance equal to the tolerance (within rounding) is not a flag
  const over = (v: number | null) => v !== null && Math.abs(v) > tolerance + 1e-12;
  if (over(hoursVariance)) flags.push('hours');
  if (over(burnVariance)) flags.push('burn');
  return { unit, policy, months, total, hoursVariance, burnVariance, flags };
}

/** The same figures restricted to one fiscal year (null: every month since approval). */
export function forFiscalYear(pva: PlanVsActual, fiscalYear: number | null): PlanVsActual {
  if (fiscalYear === null) return pva;
  const keep = (m: MonthFigures) => m.fiscalYear === fiscalYear;
  const trucks = pva.trucks.map((t) => summariseTruck(t.unit, t.policy, t.months.filter(keep), pva.tolerance));
  return { ...pva, trucks, fleet: trucks.reduce((s, t) => addFigures(s, t.total), ZERO), fleetMonths: pva.fleetMonths.filter(keep) };
}
