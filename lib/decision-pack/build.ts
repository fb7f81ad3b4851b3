import 'server-only';
/**
 * The data of a case's decision pack, read from the same figures the case
 * pages show: the evaluated case (its frozen record once approved, the
 * submitted snapshot while submitted), its saved plan (the proposal) and the
 * approval trail.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { readFrozenRecord } from '@/lib/approvals/canonical';
import { fetchCaseApproval } from '@/lib/approvals/queries';
import type { Access } from '@/lib/auth/access';
import { fetchDecisionSummary } from '@/lib/cases/decision';
import { proposalIncrementalFlows, type DecisionSummary } from '@/lib/cases/decision-summary';
import { evaluateStoredCase, loadValidCase } from '@/lib/cases/evaluate';
import type { ProposalSwap } from '@/lib/cases/proposal';
import { VALUATION_LABEL } from '@/lib/cases/valuation';
import { db } from '@/lib/db';
import { fetchCase } from '@/lib/db/queries/cases';
import type { CaseFile, CaseResult } from '@/lib/engine';
import { formatNumber, formatPercent } from '@/lib/format';
import { notFound } from '@/lib/http';
import { fiscalLabelOfPeriod, MONTH_NAMES, rankTrucks, type RankedTruck } from '@/lib/plan';
import type { PackFonts } from './render';
import { loadPlanVsActual, type PlanVsActualView } from '@/lib/readings/plan-vs-actual-load';
import type { DecisionPackData, PackActuals, PackAssumption, PackChartYear } from './types';

/** The proposal's capital and net cash flow against rebuilding every engine, by fiscal year (periods sharing a label add up). */
export function chartYears(result: CaseResult, summary: DecisionSummary): PackChartYear[] {
  const { delta, capital } = proposalIncrementalFlows(result, summary.policies);
  const byFy = new Map<string, PackChartYear>();
  delta.forEach((cf, y) => {
    const f = fiscalLabelOfPeriod(summary.planStartMonth, y, summary.fiscalYearStartMonth);
    const e = byFy.get(f) ?? { fiscalYear: f, capital: 0, cashFlow: 0 };
    e.capital -= capital[y] ?? 0;
    e.cashFlow += cf;
    byFy.set(f, e);
  });
  return [...byFy.values()].sort((a, b) => a.fiscalYear.localeCompare(b.fiscalYear));
}

export function keyAssumptions(file: CaseFile, currency: string, fiscalYearStartMonth: number): PackAssumption[] {
  const a = file.assumptions;
  const pct = (x: number) => formatPercent(x, 1);
  return [
    { label: 'Valuation', value: VALUATION_LABEL[a.valuation] },
    { label: 'Discount rate', value: pct(a.discountRate) },
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
    { label: 'Fiscal year starts', value: MONTH_NAMES[fiscalYearStartMonth - 1] },
  ];
}

/**
 * The pack's data. An approved case is read from its frozen record (its case
 * file, result, proposal and summary as hashed; never recomputed); any other
 * case is evaluated as its pages evaluate it (the submitted snapshot while
 * submitted, the live data for a draft).
 */
export async function buildDecisionPackData(access: Access, id: number, now = new Date()): Promise<DecisionPackData> {
  const row = await fetchCase(access.workspace.id, id);
  if (!row) throw notFound('No such business case in this workspace.');
  const stored = await db()('business_cases').where({ id, workspaceId: access.workspace.id }).first('frozenRecord');
  const record = readFrozenRecord(stored?.frozenRecord);
  const summary = await fetchDecisionSummary(access, id);
  let file: CaseFile;
  let result: CaseResult;
  let ranking: RankedTruck[];
  let schedule: ProposalSwap[];
  if (record) {
    ({ case: file, result } = record);
    ranking = rankTrucks(result);
    schedule = record.proposal.schedule as ProposalSwap[];
  } else {
    const dto = await evaluateStoredCase(access, id);
    ({ file } = await loadValidCase(access, id));
    ({ result, ranking, schedule } = dto);
  }
  const approval = await fetchCaseApproval(access, id);
  const actuals = record && row.status === 'approved' ? packActuals(await loadPlanVsActual(access, id)) : null;
  const chosen = new Set(summary.chosenTrucks);
  const fy = (period: number | null) => (period === null ? null : fiscalLabelOfPeriod(summary.planStartMonth, period, summary.fiscalYearStartMonth));
  return {
    summary,
    workspaceName: access.workspace.name,
    negativeStyle: access.workspace.settings.negativeStyle,
    generatedAt: now.toISOString(),
    assumptionSetName: row.assumptionSetName,
    chart: chartYears(result, summary),
    ranking: ranking.map((r) => ({
      rank: r.rank, truckId: r.truckId, policy: summary.policies[r.truckId] ?? 'rebuild', gain: r.gain, profitabilityIndex: r.profitabilityIndex,
      capital: r.capital, fiscalYear: fy(r.capitalYear), inProposal: chosen.has(r.truckId),
    })),
    schedule: schedule.map((s) => ({ truckId: s.truckId, month: s.label, due: s.dueLabel, movedEarlier: s.movedEarlier, late: s.late, fiscalYear: fy(s.capitalYear) })),
    shopCapacityPerMonth: record?.proposal.settings.swapsPerMonth ?? row.plan.swapsPerMonth,
    assumptions: keyAssumptions(file, summary.currency, summary.fiscalYearStartMonth),
    trail: approval.events.map((e) => ({ at: e.at, who: e.who, action: e.action, comment: e.comment })),
    approvalsRequired: approval.approvalsRequired,
    frozen: approval.frozen,
    actuals,
  };
}

/** The pack's plan-against-actual section since the approval; null when no reading follows it. */
export function packActuals(view: PlanVsActualView): PackActuals | null {
  const f = view.figures;
  if (f.fleetMonths.length === 0) return null;
  return {
    from: f.fleetMonths[0].month,
    to: f.fleetMonths.at(-1)!.month,
    tolerancePercent: view.tolerancePercent,
    fleet: f.fleet,
    trucks: f.trucks.map((t) => ({ unit: t.unit, policy: t.policy, hoursVariance: t.hoursVariance, burnVariance: t.burnVariance, saving: t.total.saving, forecastSaving: t.total.forecastSaving, flags: t.flags })),
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
