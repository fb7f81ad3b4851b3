import 'server-only';
/**
 * The data of a case's decision pack, read from the same figures the case
 * pages show: the evaluated case (its frozen record once approved, the
 * submitted snapshot while submitted), its saved plan (the proposal) and the
 * approval trail.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { fetchCaseApproval } from '@/lib/approvals/queries';
import type { Access } from '@/lib/auth/access';
import { evaluateStoredCase, loadValidCase } from '@/lib/cases/evaluate';
import { proposalPolicies } from '@/lib/cases/proposal';
import type { CaseResultDto } from '@/lib/cases/types';
import { VALUATION_LABEL } from '@/lib/cases/valuation';
import type { CaseFile } from '@/lib/engine';
import { formatNumber, formatPercent } from '@/lib/format';
import { interimDecisionSummary } from './interim-summary';
import { fiscalYearOfPeriod } from './layout';
import type { PackFonts } from './render';
import type { DecisionPackData, DecisionSummary, PackAssumption, PackChartYear } from './types';

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

export function fiscalYearStartMonthOf(access: Access): number {
  const m = (access.workspace.settings as { fiscalYearStartMonth?: number }).fiscalYearStartMonth;
  return Number.isInteger(m) && (m as number) >= 1 && (m as number) <= 12 ? (m as number) : 1;
}

/** The proposal's capital and net cash flow against rebuilding every engine, by fiscal year. */
export function chartYears(dto: CaseResultDto, fiscalYearStartMonth: number): PackChartYear[] {
  const policies = proposalPolicies(dto.result, dto.plan);
  const byFy = new Map<number, PackChartYear>();
  for (const t of dto.result.trucks) {
    const p = t.options[policies[t.id] ?? 'rebuild'];
    p.cashFlows.forEach((cf, y) => {
      const f = fiscalYearOfPeriod(dto.case.plan.startMonth, y, fiscalYearStartMonth);
      const e = byFy.get(f) ?? { fiscalYear: f, capital: 0, cashFlow: 0 };
      e.capital -= p.breakdown[y]?.capital ?? 0;
      e.cashFlow += cf - (t.options.rebuild.cashFlows[y] ?? 0);
      byFy.set(f, e);
    });
  }
  return [...byFy.values()].sort((a, b) => a.fiscalYear - b.fiscalYear);
}

export function keyAssumptions(file: CaseFile, currency: string, fiscalYearStartMonth: number): PackAssumption[] {
  const a = file.assumptions;
  const pct = (x: number) => formatPercent(x, 1);
  return [
    { label: 'Valuation', value: VALUATION_LABEL[a.valuation] },
    { label: 'Discount rate (real)', value: pct(a.discountRate) },
    { label: 'Cash-flow timing', value: a.timing === 'mid-year' ? 'mid-year' : 'end of year' },
    { label: 'Horizon', value: a.horizonYears === null ? 'each truck’s remaining life' : `${a.horizonYears} years` },
    { label: 'Inflation', value: pct(a.inflation) },
    { label: `Fuel price (${currency}/L)`, value: formatNumber(a.fuelPrice, 2) },
    { label: 'Fuel escalation', value: pct(a.fuelEscalation) },
    { label: `Carbon price (${currency}/t CO2)`, value: formatNumber(a.carbonPrice, 2) },
    { label: 'Carbon escalation', value: pct(a.carbonEscalation) },
    { label: `Margin (${currency}/t)`, value: formatNumber(a.marginPerTonne, 2) },
    { label: 'Share of lost margin counted', value: pct(a.lostMarginShare) },
    { label: 'Tax rate', value: pct(a.taxRate) },
    { label: 'Depreciation', value: a.depreciation.method === 'none' ? 'none' : `${a.depreciation.method}, ${a.depreciation.years} years` },
    { label: 'Rebuild accounting', value: a.rebuildAccounting === 'capitalise' ? 'capitalised' : 'expensed' },
    { label: `Labour rate (${currency}/h)`, value: formatNumber(a.labourRate, 2) },
    { label: 'Fiscal year starts', value: MONTHS[fiscalYearStartMonth - 1] },
  ];
}

export async function buildDecisionPackData(access: Access, id: number, now = new Date()): Promise<DecisionPackData> {
  const dto = await evaluateStoredCase(access, id);
  const { file } = await loadValidCase(access, id);
  const approval = await fetchCaseApproval(access, id);
  const fyStart = fiscalYearStartMonthOf(access);
  const summary: DecisionSummary = interimDecisionSummary(dto, { discountRate: file.assumptions.discountRate, fiscalYearStartMonth: fyStart });
  const policies = proposalPolicies(dto.result, dto.plan);
  const chosen = new Set(summary.chosenTrucks);
  const fy = (period: number | null) => (period === null ? null : fiscalYearOfPeriod(dto.case.plan.startMonth, period, fyStart));
  return {
    summary,
    workspaceName: access.workspace.name,
    negativeStyle: dto.negativeStyle,
    generatedAt: now.toISOString(),
    assumptionSetName: dto.case.assumptionSetName,
    chart: chartYears(dto, fyStart),
    ranking: dto.ranking.map((r) => ({
      rank: r.rank, truckId: r.truckId, policy: policies[r.truckId] ?? 'rebuild', gain: r.gain, profitabilityIndex: r.profitabilityIndex,
      capital: r.capital, fiscalYear: fy(r.capitalYear), inProposal: chosen.has(r.truckId),
    })),
    schedule: dto.schedule.map((s) => ({ truckId: s.truckId, month: s.label, due: s.dueLabel, movedEarlier: s.movedEarlier, late: s.late, fiscalYear: fy(s.capitalYear) })),
    shopCapacityPerMonth: dto.case.plan.swapsPerMonth,
    assumptions: keyAssumptions(file, dto.currency, fyStart),
    trail: approval.events.map((e) => ({ at: e.at, who: e.who, action: e.action, comment: e.comment })),
    approvalsRequired: approval.approvalsRequired,
    frozen: approval.frozen,
  };
}

let fontCache: Promise<PackFonts> | null = null;

/**
 * IBM Plex Sans from app/fonts, as WOFF (fontkit cannot subset the WOFF2 files' composite glyphs: it throws a
 * RangeError at the end of the document); Helvetica if they cannot be read.
 */
export function loadPackFonts(): Promise<PackFonts> {
  fontCache ??= (async () => {
    try {
      const dir = path.join(process.cwd(), 'app', 'fonts');
      const [regular, bold] = await Promise.all([readFile(path.join(dir, 'ibm-plex-sans-latin-400-normal.woff')), readFile(path.join(dir, 'ibm-plex-sans-latin-600-normal.woff'))]);
      return { regular, bold };
    } catch (e) {
      console.error('decision pack: IBM Plex Sans not readable, using Helvetica', e);
      return null;
    }
  })();
  return fontCache;
}
