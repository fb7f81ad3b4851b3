import type { Metadata } from 'next';
import { AuditDiff } from '@/components/audit/audit-diff';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { AccessDenied } from '@/components/ui/access-denied';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { entityLabel, kindLabel } from '@/lib/audit-labels';
import { AUDIT_PAGE_SIZE, fetchAuditFacets, fetchAuditLog } from '@/lib/db/queries/audit';
import { zodProblems } from '@/lib/http';
import { auditFilterSchema, searchParamsObject } from '@/lib/validation/audit';

export const metadata: Metadata = { title: 'Audit log' };

type SP = Promise<Record<string, string | string[] | undefined>>;

export default async function AuditPage({ params, searchParams }: { params: Promise<{ workspace: string }>; searchParams: SP }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  if (!hasRole(access, CAN.audit)) return <AccessDenied need={CAN.audit} have={access.role} />;
  const view = { showEmails: access.role === 'admin' };
  const raw = searchParamsObject(await searchParams);
  const parsed = auditFilterSchema.safeParse(raw);
  const filter = parsed.success ? parsed.data : { page: 1 };
  const problems = parsed.success ? [] : zodProblems(parsed.error);
  const [{ rows, total }, facets] = await Promise.all([fetchAuditLog(access.workspace.id, filter, view), fetchAuditFacets(access.workspace.id, view)]);
  const query = new URLSearchParams(Object.entries(raw).filter(([k, v]) => k !== 'page' && v) as [string, string][]);
  const page = filter.page ?? 1;
  const pages = Math.max(1, Math.ceil(total / AUDIT_PAGE_SIZE));
  const pageHref = (p: number) => `?${new URLSearchParams({ ...Object.fromEntries(query), page: String(p) })}`;
  const str = (k: string) => (typeof raw[k] === 'string' ? (raw[k] as string) : '');

  return (
    <>
      <PageHeader
        title="Audit log"
        subtitle="Every change to this workspace's data: who, when, what, and the fields that changed."
        action={<a className="btn" href={`/api/workspaces/${workspace}/audit/csv?${query}`} download>Download CSV</a>}
      />
      <form method="get" className="card mb-4 flex flex-wrap items-end gap-3 p-3" aria-label="Filter the audit log">
        <div>
          <label htmlFor="f-user" className="label">Person</label>
          <select id="f-user" name="user" className="field" defaultValue={str('user')}>
            <option value="">Everyone</option>
            {facets.people.map((p) => <option key={p.id} value={p.id}>{p.label}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="f-kind" className="label">Kind</label>
          <select id="f-kind" name="kind" className="field" defaultValue={str('kind')}>
            <option value="">All changes</option>
            {[...new Set(facets.kinds.map((x) => x.entity))].map((entity) => (
              <optgroup key={entity} label={entityLabel(entity)}>
                <option value={entity}>{kindLabel(entity)}</option>
                {facets.kinds.filter((x) => x.entity === entity).map((x) => <option key={x.action} value={`${entity}:${x.action}`}>{x.label}</option>)}
              </optgroup>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="f-from" className="label">From (UTC)</label>
          <input id="f-from" name="from" type="date" className="field" defaultValue={str('from')} aria-invalid={problems.some((p) => p.path === 'from')} />
        </div>
        <div>
          <label htmlFor="f-to" className="label">To (UTC)</label>
          <input id="f-to" name="to" type="date" className="field" defaultValue={str('to')} aria-invalid={problems.some((p) => p.path === 'to')} />
        </div>
        <button type="submit" className="btn btn-primary">Filter</button>
        <a className="btn" href="?">Clear</a>
        <div aria-live="polite" className="w-full text-sm text-loss" data-testid="audit-filter-error">
          {problems.map((p) => `${p.path}: ${p.message}`).join(' ')}
        </div>
      </form>
      {rows.length === 0 ? (
        <EmptyState title="No changes match">Every change to trucks, engines, offers, assumptions, cases and members is listed here; widen the filter to see more.</EmptyState>
      ) : (
        <div className="card overflow-x-auto">
          <table className="data-table" data-testid="audit-table">
            <thead>
              <tr><th>When (UTC)</th><th>Who</th><th>Change</th><th>What</th><th>Fields that changed</th></tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="align-top">
                  <td className="whitespace-nowrap">{r.at.slice(0, 19).replace('T', ' ')}</td>
                  <td className={view.showEmails ? 'font-mono text-xs' : ''}>{r.who}</td>
                  <td className="whitespace-nowrap">{r.kind}</td>
                  <td className="max-w-72">{r.what}</td>
                  <td className="min-w-96 py-1"><AuditDiff before={r.before} after={r.after} action={r.action} /></td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <p className="mt-3 text-xs text-muted" data-testid="audit-who-reads">
        Admins, approvers and analysts can read this log; viewers cannot. Members&apos; e-mail addresses are shown to
        admins only; everyone else sees names. Changes of record-keeping fields (ids, versions, time stamps) are left out.
      </p>
      <nav className="mt-3 flex items-center gap-3 text-sm" aria-label="Pages">
        <span className="text-muted">{total.toLocaleString('en-US')} change{total === 1 ? '' : 's'} · page {page} of {pages}</span>
        {page > 1 ? <a className="btn" href={pageHref(page - 1)}>Newer</a> : null}
        {page < pages ? <a className="btn" href={pageHref(page + 1)}>Older</a> : null}
      </nav>
    </>
  );
}
