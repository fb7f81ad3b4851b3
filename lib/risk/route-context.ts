import 'server-only';
import { requireMember, type Access } from '@/lib/auth/access';
import { CAN, type Role } from '@/lib/auth/roles';
import { idParams, readParams } from '@/lib/http';
import { loadRiskCase, type RiskCase } from './case-source';

export type CaseParams = { workspace: string; id: string };

/** Who may start or cancel a Monte Carlo run: analysts and admins, and approvers who test a case they decide on. */
export const CAN_RUN_RISK: readonly Role[] = [...new Set<Role>([...CAN.edit, ...CAN.decide])];

/** Access first (401/403), then the case of that workspace (404), built and validated (422). */
export async function loadCaseForRoute(params: Promise<CaseParams>, roles: readonly Role[] = CAN.read): Promise<{ access: Access; risk: RiskCase }> {
  const p = await params;
  const access = await requireMember(p.workspace, roles);
  const { id: caseId } = readParams(idParams, p);
  return { access, risk: await loadRiskCase(access, caseId) };
}
