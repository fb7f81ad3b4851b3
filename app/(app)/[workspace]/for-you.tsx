import Link from 'next/link';
import { ROLE_LABELS } from '@/lib/auth/roles';
import type { fetchOverview, OverviewCase } from '@/lib/db/queries/overview';

type Overview = Awaited<ReturnType<typeof fetchOverview>>;

const plural = (n: number, one: string, many: string) => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;
const day = (iso: string | null) => (iso ? iso.slice(0, 10) : '');

function CaseList({ cases, href, testId, note }: { cases: OverviewCase[]; href: (c: OverviewCase) => string; testId: string; note: (c: OverviewCase) => string }) {
  if (cases.length === 0) return null;
  return (
    <ul className="mt-2 space-y-1 text-sm" data-testid={testId}>
      {cases.map((c) => (
        <li key={c.id} className="flex flex-wrap items-baseline gap-x-2">
          <Link className="text-accent hover:underline" href={href(c)}>{c.name}</Link>
          <span className="text-xs text-muted">{note(c)}</span>
        </li>
      ))}
    </ul>
  );
}

function Panel({ title, testId, children, empty }: { title: string; testId: string; children?: React.ReactNode; empty?: string }) {
  return (
    <section className="card p-4" data-testid={testId}>
      <h2 className="text-sm font-semibold" data-testid={`${testId}-title`}>{title}</h2>
      {empty ? <p className="mt-1 text-sm text-muted">{empty}</p> : null}
      {children}
    </section>
  );
}

/** The overview's first block: what needs the caller, by role. */
export function ForYou({ slug, overview, outboxShown }: { slug: string; overview: Overview; outboxShown: boolean }) {
  const { role, waiting, drafts, returned, approved, admin } = overview;
  const caseHref = (c: OverviewCase) => `/${slug}/cases/${c.id}`;
  const panels: React.ReactNode[] = [];

  if (role === 'approver' || role === 'admin') {
    panels.push(
      <Panel key="waiting" testId="waiting-for-you" title={waiting.length ? `${plural(waiting.length, 'case', 'cases')} waiting for you` : 'No case waits for your decision'}>
        <CaseList cases={waiting} testId="waiting-list" href={(c) => `/${slug}/approvals/${c.id}`} note={(c) => `submitted ${day(c.at)}${c.who ? ` by ${c.who}` : ''}`} />
        {waiting.length ? <p className="mt-2 text-xs text-muted">Open a case to approve it, reject it or return it for changes.</p> : null}
      </Panel>,
    );
  }
  if (role === 'analyst' || role === 'admin') {
    const whose = role === 'admin' ? 'Drafts in this workspace' : 'Your drafts';
    panels.push(
      <Panel key="drafts" testId="your-drafts" title={`${whose}: ${drafts.length.toLocaleString('en-US')}`} empty={drafts.length ? undefined : 'None open. Start one from Business cases.'}>
        <CaseList cases={drafts} testId="drafts-list" href={caseHref} note={(c) => `changed ${day(c.at)}`} />
      </Panel>,
      <Panel key="returned" testId="returned-to-you" title={returned.length ? `${plural(returned.length, 'case', 'cases')} sent back for changes` : 'No case sent back for changes'}>
        <CaseList cases={returned} testId="returned-list" href={caseHref} note={(c) => `sent back ${day(c.at)}; change it and submit it again`} />
      </Panel>,
    );
  }
  if (role === 'viewer') {
    panels.push(
      <Panel key="approved" testId="approved-cases" title={approved.length ? `${plural(approved.length, 'approved case', 'approved cases')}` : 'No case approved yet'} empty={approved.length ? undefined : 'Approved cases appear here once an approver has decided.'}>
        <CaseList cases={approved} testId="approved-list" href={caseHref} note={(c) => `approved ${day(c.at)}`} />
      </Panel>,
    );
  }
  if (admin) {
    panels.push(
      <Panel key="admin" testId="admin-hints" title="Members and mail">
        <ul className="mt-2 space-y-1 text-sm">
          <li>
            <Link className="text-accent hover:underline" href={`/${slug}/members`}>{plural(admin.members, 'member', 'members')}</Link>
            <span className="text-muted">, {plural(admin.admins, ROLE_LABELS.admin.toLowerCase(), `${ROLE_LABELS.admin.toLowerCase()}s`)}{admin.invitations ? `; ${plural(admin.invitations, 'invitation', 'invitations')} not yet accepted` : ''}</span>
          </li>
          <li data-testid="mail-hint">
            {admin.mailFailed ? <span className="text-loss">{plural(admin.mailFailed, 'message', 'messages')} could not be sent. </span> : null}
            {admin.mailWaiting ? <span>{plural(admin.mailWaiting, 'message', 'messages')} waiting to be sent. </span> : null}
            {!admin.mailFailed && !admin.mailWaiting ? <span className="text-muted">All mail sent. </span> : null}
            {outboxShown ? <Link className="text-accent hover:underline" href={`/${slug}/outbox`}>Outbox</Link> : null}
          </li>
        </ul>
      </Panel>,
    );
  }
  return <div className="mb-6 grid gap-3 md:grid-cols-2 xl:grid-cols-3" data-testid="for-you">{panels}</div>;
}
