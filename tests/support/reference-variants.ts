/**
 * The case variants the reference checks run on: scenarios/one-truck.json
 * with one rule of MODEL.md exercised at a time, a few combinations, and the
 * demo mine (scenarios/aldervane-north-pit.json, every truck).
 * Each variant is a full case/1 document with `valuation: 'median-path'`.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { CaseFileInput } from '@/lib/validation/case';

type Json = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

const root = path.resolve(__dirname, '..', '..');
export function loadScenario(name: string): CaseFileInput {
  return JSON.parse(readFileSync(path.join(root, 'scenarios', name), 'utf8')) as CaseFileInput;
}

/** A deep copy of `base` with `edit` applied to it. */
export function variantOf(base: CaseFileInput, edit: (c: Json) => void): CaseFileInput {
  const c = JSON.parse(JSON.stringify(base)) as Json;
  edit(c);
  return c as CaseFileInput;
}

const medianPath = (c: Json) => {
  c.assumptions.valuation = 'median-path';
};

export interface Variant {
  name: string;
  /** what the variant exercises (MODEL.md section) */
  source: string;
  caseFile: CaseFileInput;
}

export function referenceVariants(): Variant[] {
  const one = variantOf(loadScenario('one-truck.json'), medianPath);
  const v = (name: string, source: string, edit: (c: Json) => void): Variant => ({
    name,
    source,
    caseFile: variantOf(one, edit),
  });
  const failingOld = (c: Json) => {
    // old engine fails at 10000·((16500/10000)^2 + ln 2)^(1/2) ≈ 18,481 h, before its 20,000 h life
    c.engines[0].weibullScaleHours = 10000;
    c.engines[0].weibullShape = 2;
    c.repowerOffers[0].failedCoreCredit = 40000;
  };
  const capitalise = (dep: Json) => (c: Json) => {
    c.assumptions.rebuildAccounting = 'capitalise';
    c.assumptions.depreciation = dep;
  };
  return [
    { name: 'one-truck', source: 'scenarios/one-truck.json', caseFile: one },
    v('engine past life', 'MODEL.md §3 period-0 events', (c) => {
      c.trucks[0].engineHours = 21000;
    }),
    v('engine exactly at life', 'MODEL.md §3 "at or past its planned life"', (c) => {
      c.trucks[0].engineHours = 20000;
    }),
    v('repower now', 'MODEL.md §3 "now"', (c) => {
      c.repowerOffers[0].timing = 'now';
    }),
    v('capitalise, straight-line 5', 'MODEL.md §6', capitalise({ method: 'straight-line', years: 5 })),
    v('capitalise, declining-balance 5 ×2', 'MODEL.md §6', capitalise({ method: 'declining-balance', years: 5, factor: 2 })),
    v('capitalise, declining-balance 7 ×1.5', 'MODEL.md §6', capitalise({ method: 'declining-balance', years: 7, factor: 1.5 })),
    v('capitalise, macrs 3', 'MODEL.md §6, IRS Pub 946 A-1', capitalise({ method: 'macrs', years: 3 })),
    v('capitalise, macrs 7', 'MODEL.md §6, IRS Pub 946 A-1', capitalise({ method: 'macrs', years: 7 })),
    v('capitalise, macrs 20', 'MODEL.md §6, IRS Pub 946 A-1', capitalise({ method: 'macrs', years: 20 })),
    v('capitalise, none', 'MODEL.md §6 none', capitalise({ method: 'none' })),
    v('expense, macrs 5', 'MODEL.md §6', (c) => {
      c.assumptions.depreciation = { method: 'macrs', years: 5 };
    }),
    v('expense, none', 'MODEL.md §6 none', (c) => {
      c.assumptions.depreciation = { method: 'none' };
    }),
    v('mid-year timing', 'MODEL.md §2', (c) => {
      c.assumptions.timing = 'mid-year';
    }),
    v('horizon cap 2', 'MODEL.md §2', (c) => {
      c.assumptions.horizonYears = 2;
    }),
    v('failing old engine', 'MODEL.md §3 failed swap', failingOld),
    v('lostMarginShare 0.5', 'MODEL.md §5', (c) => {
      c.assumptions.lostMarginShare = 0.5;
    }),
    v('productivityGain 0.02', 'MODEL.md §5', (c) => {
      c.repowerOffers[0].productivityGain = 0.02;
    }),
    v('measured fuel burn', 'MODEL.md §4', (c) => {
      c.trucks[0].fuelBurnLitresPerHour = 260;
    }),
    v('planned life at the last hour of the horizon', 'MODEL.md §3 end-of-horizon rule', (c) => {
      // 16,500 h + 3,500 h = 20,000 h exactly at the end of year 1 = N
      c.trucks[0].remainingLifeHours = 3500;
    }),
    v('planned life at the last hour of year 1 of 2', 'MODEL.md §3 "the year\'s last hour included"', (c) => {
      c.trucks[0].annualHours = 3500;
      c.trucks[0].remainingLifeHours = 7000;
    }),
    v('long life, carbon price', 'MODEL.md §2, §4', (c) => {
      c.trucks[0].remainingLifeHours = 62000;
      c.assumptions.carbonPrice = 30;
      c.assumptions.carbonEscalation = 0.05;
    }),
    v('everything at once', 'MODEL.md §§2–7', (c) => {
      failingOld(c);
      c.assumptions.lostMarginShare = 0.5;
      c.repowerOffers[0].productivityGain = 0.02;
      c.trucks[0].fuelBurnLitresPerHour = 260;
      c.assumptions.timing = 'mid-year';
      c.trucks[0].remainingLifeHours = 62000;
      c.assumptions.carbonPrice = 30;
      capitalise({ method: 'macrs', years: 7 })(c);
    }),
    v('failing old engine, repower now', 'MODEL.md §3', (c) => {
      failingOld(c);
      c.repowerOffers[0].timing = 'now';
      c.repowerOffers[0].productivityGain = 0.02;
    }),
    {
      name: 'aldervane-north-pit',
      source: 'scenarios/aldervane-north-pit.json',
      caseFile: variantOf(loadScenario('aldervane-north-pit.json'), medianPath),
    },
  ];
}
