import { DECISION_LABELS, type Decision } from '@/lib/approvals/workflow';
import { ROLE_LABELS, type Role } from '@/lib/auth/roles';

/** Plain text and HTML of each message the product sends; every one links back to the app. */
export type MailBody = { subject: string; text: string; html: string };

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

/** The figures an approval mail quotes, already formatted as the pages show them. */
export type MailHeadline = {
  currency: string;
  /** capital asked, in thousands */
  capital: string;
  /** expected NPV gain against rebuilding every engine, in thousands */
  gain: string;
  /** "FY2027 12,000; FY2028 3,000" */
  byFiscalYear: string;
  trucks: number;
};

function headlineLines(h: MailHeadline | null | undefined): string[] {
  if (!h) return [];
  return [
    `Capital asked: ${h.capital} ${h.currency} k to repower ${h.trucks} truck${h.trucks === 1 ? '' : 's'}${h.byFiscalYear ? ` (${h.byFiscalYear})` : ''}.\nExpected NPV gain against rebuilding every engine: ${h.gain} ${h.currency} k.`,
  ];
}

function layout(paragraphs: string[], link: { href: string; label: string }, footer: string, more: Array<{ href: string; label: string }> = []): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 12px">${esc(p).replace(/\n/g, '<br>')}</p>`).join('')
    + more.map((m) => `<p style="margin:0 0 12px"><a href="${esc(m.href)}" style="color:#35618f">${esc(m.label)}</a></p>`).join('');
  return `<!doctype html><html><body style="font-family:system-ui,sans-serif;color:#15181c;background:#f7f7f5;padding:16px">
<div style="max-width:560px;background:#fff;border:1px solid #e3e4e1;border-radius:4px;padding:20px">
<div style="font:12px monospace;letter-spacing:2px;text-transform:uppercase;color:#b0562b;margin-bottom:12px">Haulcase</div>
${body}<p style="margin:16px 0"><a href="${esc(link.href)}" style="background:#15181c;color:#f7f7f5;padding:8px 14px;border-radius:4px;text-decoration:none">${esc(link.label)}</a></p>
<p style="margin:0;font-size:12px;color:#5d646d">${esc(footer)}<br>If the button does not work, open: ${esc(link.href)}</p></div></body></html>`;
}

const quote = (comment: string) => (comment.trim() ? `Comment: “${comment.trim()}”` : '');

export function caseSubmittedMail(p: { workspaceName: string; caseName: string; submitter: string; comment: string; link: string; packLink?: string; headline?: MailHeadline | null }): MailBody {
  const lines = [`${p.submitter} submitted the business case “${p.caseName}” in ${p.workspaceName} for your approval.`, ...headlineLines(p.headline), quote(p.comment)].filter(Boolean);
  const pack = p.packLink ? `\nDecision pack (PDF): ${p.packLink}` : '';
  return {
    subject: `Approval requested: ${p.caseName}`,
    text: `${lines.join('\n\n')}\n\nReview it here: ${p.link}${pack}\n`,
    html: layout(lines, { href: p.link, label: 'Review the case' }, 'You receive this because you approve capital cases in this workspace.', p.packLink ? [{ href: p.packLink, label: 'Download the decision pack (PDF)' }] : []),
  };
}

export function caseDecidedMail(p: { workspaceName: string; caseName: string; decider: string; decision: Decision; final: boolean; comment: string; link: string; packLink?: string; headline?: MailHeadline | null }): MailBody {
  const what = p.decision === 'approve' && !p.final ? 'approved (more approvals are still needed)' : DECISION_LABELS[p.decision];
  const lines = [`${p.decider} ${what} the business case “${p.caseName}” in ${p.workspaceName}.`, ...headlineLines(p.headline), quote(p.comment)].filter(Boolean);
  const word = p.decision === 'approve' ? (p.final ? 'Approved' : 'Approval') : p.decision === 'reject' ? 'Rejected' : 'Sent back';
  const pack = p.packLink ? `\nDecision pack (PDF): ${p.packLink}` : '';
  return {
    subject: `${word}: ${p.caseName}`,
    text: `${lines.join('\n\n')}\n\nSee the case: ${p.link}${pack}\n`,
    html: layout(lines, { href: p.link, label: 'See the case' }, 'You receive this because you submitted this case.', p.packLink ? [{ href: p.packLink, label: 'Download the decision pack (PDF)' }] : []),
  };
}

export function invitationMail(p: { workspaceName: string; inviter: string; role: Role; link: string; expiresAt: string }): MailBody {
  const lines = [
    `${p.inviter} invited you to join ${p.workspaceName} on Haulcase as ${ROLE_LABELS[p.role].toLowerCase()}.`,
    `The link works once and until ${p.expiresAt.slice(0, 16).replace('T', ' ')} UTC.`,
  ];
  return {
    subject: `You are invited to ${p.workspaceName} on Haulcase`,
    text: `${lines.join('\n\n')}\n\nAccept the invitation: ${p.link}\n`,
    html: layout(lines, { href: p.link, label: 'Accept the invitation' }, 'If you did not expect this, ignore it: nothing happens unless the link is used.'),
  };
}

export function passwordResetMail(p: { link: string; minutes: number }): MailBody {
  const lines = [`Someone (hopefully you) asked to reset the password of this Haulcase account.`, `The link works once, for ${p.minutes} minutes.`];
  return {
    subject: 'Reset your Haulcase password',
    text: `${lines.join('\n\n')}\n\nChoose a new password: ${p.link}\n\nIf you did not ask for this, ignore this message; your password stays as it is.\n`,
    html: layout(lines, { href: p.link, label: 'Choose a new password' }, 'If you did not ask for this, ignore this message; your password stays as it is.'),
  };
}
