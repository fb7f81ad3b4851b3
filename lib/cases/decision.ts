import 'server-only';
/**
 * The decision summary of a stored case, on the server: from the frozen
 * record once approved (never recomputed), from the snapshot taken at
 * submission while submitted, from the live fleet data for a draft. The pure
 * figures are lib/cases/decision-summary.ts; this module loads, evaluates and
 * reads the pinned Monte Carlo run.
 */
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { evaluateCaseDetailed, type CaseFile, type CaseResult } from '@/lib/engine';
import { fetchPinnedRun, type PinnedRun } from '@/lib/risk/runs';
import { db } from '@/lib/db';
import { notFound } from '@/lib/http';
import { readFrozenRecord, verifyFrozen } from '@/lib/approvals/canonical';
import { buildDecisionSummary, proposalTopDrivers, type DecisionRisk, type DecisionSummary } from './decision-summary';
import { loadValidCase } from './evaluate';
import { programmeOf } from './programme';
import { proposalFromProgramme, type Proposal } from './proposal';
import type { PlanSettings } from '@/lib/validation/business-case';

/** The summary's risk block from a pinned run. */
export function riskOfPinnedRun(run: PinnedRun | null): DecisionRisk | null {
  if (!run) return null;
  return {
    runId: run.id,
    label: run.measure.label,
    sampleFailures: run.sampleFailures,
    startedAt: run.startedAt,
    iterations: run.iterations,
    seed: run.seed,
    author: run.author ? run.author.name || run.author.email : 'a removed account',
    finishedAt: run.finishedAt,
    probabilityOfLoss: run.summary.probLoss,
    p10: run.summary.p10,
    p50: run.summary.p50,
    p90: run.summary.p90,
  };
}

export interface DecisionContext {
  caseId: number;
  caseName: string;
  status: string;
  source: DecisionSummary['source'];
  currency: string;
  fiscalYearStartMonth: number;
  plan: PlanSettings;
  pinnedRun: PinnedRun | null;
}

/** Evaluate a validated case file, build its proposal from the plan settings and its decision summary (with the top drivers). */
export async function decideFigures(file: CaseFile, ctx: DecisionContext): Promise<{ result: CaseResult; proposal: Proposal; summary: DecisionSummary }> {
  const { result } = evaluateCaseDetailed(file, { trusted: true });
  const proposal = proposalFromProgramme(result, await programmeOf(file, ctx.plan), ctx.plan);
  const summary = buildDecisionSummary({
    caseId: ctx.caseId,
    caseName: ctx.caseName,
    status: ctx.status,
    source: ctx.source,
    currency: ctx.currency,
    fiscalYearStartMonth: ctx.fiscalYearStartMonth,
    planStartMonth: ctx.plan.startMonth,
    file,
    result,
    plan: proposal.plan,
    policies: proposal.policies,
    timings: proposal.timings,
    timingSpecs: proposal.timingSpecs,
    drivers: proposalTopDrivers(file, proposal.policies, 3, ctx.currency, proposal.timingSpecs),
    risk: riskOfPinnedRun(ctx.pinnedRun),
  });
  return { result, proposal, summary };
}

/** The decision summary to show for a case (see the module comment). */
export async function fetchDecisionSummary(access: Access, caseId: number, k: Knex = db()): Promise<DecisionSummary> {
  const raw = await k('business_cases').where({ id: caseId, workspaceId: access.workspace.id }).first('frozenRecord', 'frozenCase', 'frozenResult', 'frozenHash', 'status');
  if (!raw) throw notFound('No such business case in this workspace.');
  const frozen = readFrozenRecord(raw.frozenRecord);
  if (frozen) return { ...frozen.summary, status: raw.status, source: 'frozen', recordVerifies: verifyFrozen(raw) };
  const { row, file } = await loadValidCase(access, caseId);
  const source: DecisionSummary['source'] = row.frozenCase ? 'frozen' : row.status === 'submitted' && row.submittedCase ? 'submitted' : 'live';
  return (await decideFigures(file, {
    caseId: row.id,
    caseName: row.name,
    status: row.status,
    source,
    currency: access.workspace.currency,
    fiscalYearStartMonth: access.workspace.settings.fiscalYearStartMonth,
    plan: row.plan,
    pinnedRun: await fetchPinnedRun(caseId, k),
  })).summary;
}
