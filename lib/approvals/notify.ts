import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { readMailConfig } from '@/lib/mail/config';
import { buildDecisionSummary, type DecisionSummary } from '@/lib/cases/decision-summary';
import { programmeOf } from '@/lib/cases/programme';
import { proposalFromProgramme } from '@/lib/cases/proposal';
import { evaluateCaseDetailed, type CaseFile } from '@/lib/engine';
import { formatMoney } from '@/lib/format';
import { caseDecidedMail, caseSubmittedMail, type MailHeadline } from '@/lib/mail/messages';
import { enqueueMail } from '@/lib/mail/queue';
import { readPlanSettings } from '@/lib/validation/business-case';
import { readFrozenRecord } from './canonical';
import type { Decision } from './workflow';

type Row = { id: number; name: string; status?: string; submittedBy: number | null; submittedCase?: string | null; frozenRecord?: string | null; plan?: string; createdAt?: string };

const caseLink = (slug: string, id: number) => `${readMailConfig().appUrl}/${slug}/approvals/${id}`;
const packLink = (slug: string, id: number) => `${readMailConfig().appUrl}/api/workspaces/${encodeURIComponent(slug)}/cases/${id}/decision-pack`;

/** The headline the mail quotes, from a decision summary, in the workspace's money format (thousands, as the pages show it). */
export function mailHeadline(s: DecisionSummary, negative: Access['workspace']['settings']['negativeStyle']): MailHeadline {
  const k = (x: number) => formatMoney(x, { scale: 'k', negative });
  return {
    currency: s.currency,
    capital: k(s.totalCapital),
    gain: k(s.gainVsRebuildAll),
    byFiscalYear: s.capitalByFiscalYear.map((y) => `${y.fiscalYear} ${k(y.capital)}`).join('; '),
    trucks: s.chosenTrucks.length,
  };
}

/**
 * The figures of what the approvers decide on: the frozen record's summary once
 * approved, else the proposal of the snapshot taken at submission (evaluated
 * here: pure, no database; the drivers and the pinned run are not needed for
 * the headline). Null when neither is stored or the snapshot cannot be
 * evaluated — the mail then goes without figures rather than not at all.
 */
export async function headlineOfRow(access: Access, row: Row): Promise<MailHeadline | null> {
  const neg = access.workspace.settings.negativeStyle;
  const record = readFrozenRecord(row.frozenRecord);
  if (record) return mailHeadline(record.summary, neg);
  if (!row.submittedCase) return null;
  try {
    const file = JSON.parse(row.submittedCase) as CaseFile;
    const settings = readPlanSettings(row.plan, row.createdAt ?? new Date().toISOString());
    const { result } = evaluateCaseDetailed(file, { trusted: true });
    const proposal = proposalFromProgramme(result, await programmeOf(file, settings), settings);
    const summary = buildDecisionSummary({
      caseId: row.id, caseName: row.name, status: row.status ?? 'submitted', source: 'submitted', currency: access.workspace.currency,
      fiscalYearStartMonth: access.workspace.settings.fiscalYearStartMonth, planStartMonth: settings.startMonth,
      file, result, plan: proposal.plan, policies: proposal.policies, timings: proposal.timings, timingSpecs: proposal.timingSpecs, drivers: [], risk: null,
    });
    return mailHeadline(summary, neg);
  } catch (e) {
    console.error('approval mail: the headline figures could not be computed', e);
    return null;
  }
}

async function personName(trx: Knex, userId: number): Promise<string> {
  const u = await trx('users').where({ id: userId }).first('name', 'email');
  return u ? u.name || u.email : 'Someone';
}

/**
 * Mail to the workspace's approvers (admins decide too, but are only written to
 * when there is no approver), never to the submitter. Written to the outbox in
 * the submitting transaction `trx`; sent once it has committed.
 */
export async function notifySubmitted(trx: Knex, access: Access, row: Row, comment: string) {
  const members = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.userId')
    .where('m.workspaceId', access.workspace.id)
    .whereIn('m.role', ['approver', 'admin'])
    .whereNot('u.id', access.userId)
    .select('u.email', 'm.role');
  const approvers = members.filter((m) => m.role === 'approver');
  const to = (approvers.length ? approvers : members).map((m) => m.email as string);
  const body = caseSubmittedMail({
    workspaceName: access.workspace.name, caseName: row.name, submitter: await personName(trx, access.userId), comment, link: caseLink(access.workspace.slug, row.id),
    packLink: packLink(access.workspace.slug, row.id), headline: await headlineOfRow(access, row),
  });
  await enqueueMail(trx, { ...body, to, workspace: access.workspace.slug });
  return { queued: to.length > 0, to };
}

/** Mail to whoever submitted the round, written in the deciding transaction `trx`. */
export async function notifyDecision(trx: Knex, access: Access, row: Row, decision: Decision, final: boolean, comment: string) {
  if (row.submittedBy == null) return { queued: false, to: [] as string[] };
  const submitter = await trx('users').where({ id: row.submittedBy }).first('email');
  if (!submitter) return { queued: false, to: [] as string[] };
  const body = caseDecidedMail({
    workspaceName: access.workspace.name, caseName: row.name, decider: await personName(trx, access.userId), decision, final, comment, link: caseLink(access.workspace.slug, row.id),
    packLink: packLink(access.workspace.slug, row.id), headline: await headlineOfRow(access, row),
  });
  await enqueueMail(trx, { ...body, to: [submitter.email], workspace: access.workspace.slug });
  return { queued: true, to: [submitter.email as string] };
}
