import 'server-only';
/**
 * The case/1 a risk analysis runs on: a business case's frozen file once
 * approved (risk on the numbers that were approved), else the case as the
 * case page builds it from stored data (lib/cases/evaluate.ts); validated.
 */
import type { Access } from '@/lib/auth/access';
import { evaluateStoredCase, loadValidCase } from '@/lib/cases/evaluate';
import type { ProposalPolicies } from '@/lib/cases/proposal';
import type { TimingSpec } from '@/lib/engine/timing';
import { db } from '@/lib/db';
import { invalid, notFound } from '@/lib/http';
import { validateCase, type CaseFile } from '@/lib/validation/case';

/** The proposal a risk analysis holds fixed: each truck's policy, and each repowered truck's timing (the fleet programme's). */
export interface RiskProposal {
  policies: ProposalPolicies;
  timings: Record<string, TimingSpec>;
}

export interface RiskCase {
  id: number;
  name: string;
  status: string;
  caseFile: CaseFile;
}

export async function loadRiskCase(access: Access, caseId: number): Promise<RiskCase> {
  const row = await db()('business_cases').where({ id: caseId, workspaceId: access.workspace.id }).first('id', 'name', 'status', 'frozenCase');
  if (!row) throw notFound('No such business case.');
  if (!row.frozenCase) {
    // the same case the case page evaluates (same loader, same problems)
    const { file } = await loadValidCase(access, caseId);
    return { id: row.id, name: row.name, status: row.status, caseFile: file };
  }
  const v = validateCase(JSON.parse(row.frozenCase));
  if (!v.ok) throw invalid(v.problems.map((p) => ({ path: `case.${p.path}`, message: p.message })), 'The frozen case is not valid.');
  return { id: row.id, name: row.name, status: row.status, caseFile: v.value };
}

/**
 * The case's proposal (lib/cases/proposal.ts): the trucks its saved plan
 * chooses are repowered, every other truck follows the better of keep and
 * rebuild, from the same case the page evaluates (frozen, submitted or live).
 */
export async function loadProposal(access: Access, risk: RiskCase): Promise<RiskProposal> {
  const evaluated = await evaluateStoredCase(access, risk.id);
  return { policies: evaluated.proposal.policies, timings: evaluated.proposal.timings ?? {} };
}
