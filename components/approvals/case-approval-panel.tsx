'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import type { CaseApprovalView } from '@/lib/approvals/queries';
import { ApiError, fetcher, sendJson } from '@/lib/fetcher';
import { StatusBadge } from './status-badge';

const ACTION_LABELS: Record<string, string> = {
  submit: 'Submitted', approve: 'Approved', reject: 'Rejected', return: 'Sent back for changes', revision: 'Revision started', comment: 'Commented',
};

const when = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

/**
 * The approval side of a business case: status, history with comments, the
 * actions the caller's role allows, and for an approved case the frozen hash
 * with whether it still verifies. Mounted on the case page and the review page.
 */
export function CaseApprovalPanel({ workspace, caseId }: { workspace: string; caseId: number }) {
  const base = `/api/workspaces/${workspace}/cases/${caseId}`;
  const { data, error, isLoading, mutate } = useSWR<CaseApprovalView>(`${base}/history`, fetcher);
  const [comment, setComment] = useState('');
  const [message, setMessage] = useState<{ kind: 'error' | 'ok'; text: string } | null>(null);
  const [pending, setPending] = useState(false);
  const router = useRouter();
  const { mutate: mutateKey } = useSWRConfig();

  if (isLoading) return <section className="card p-4 text-sm text-muted" aria-busy="true">Loading approval status…</section>;
  if (error || !data) return <section className="card p-4 text-sm text-loss" role="alert">Could not load the approval status: {(error as Error)?.message}</section>;

  async function act(path: string, body: unknown, done: string) {
    setPending(true);
    setMessage(null);
    try {
      const r = await sendJson<{ id?: number }>(`${base}/${path}`, 'POST', body);
      setComment('');
      // Reload the status first, so the confirmation never shows beside the old status.
      await mutate();
      // the case's settings form reads the status and version from this key
      void mutateKey(base);
      setMessage({ kind: 'ok', text: done });
      if (path === 'revision' && r.id) router.push(`/${workspace}/approvals/${r.id}`);
      else router.refresh();
    } catch (e) {
      const err = e as ApiError;
      setMessage({ kind: 'error', text: [err.message, ...(err.problems ?? []).map((p) => `${p.path}: ${p.message}`)].filter((x, i, a) => a.indexOf(x) === i).join(' ') });
    } finally {
      setPending(false);
    }
  }

  const { can } = data;
  const decide = (decision: 'approve' | 'reject' | 'return', done: string) => act('decisions', { decision, comment, version: data.case.version }, done);
  const anyAction = can.submit || can.approve || can.reject;

  return (
    <section className="card p-4" aria-labelledby="approval-heading" data-testid="approval-panel">
      <div className="flex items-center justify-between gap-3">
        <h2 id="approval-heading" className="text-base font-semibold">Approval</h2>
        <StatusBadge status={data.case.status} />
      </div>
      <p className="mt-1 text-sm text-muted" data-testid="approval-count">
        {data.case.status === 'submitted'
          ? `${data.approvedBy.length} of ${data.approvalsRequired} approval${data.approvalsRequired === 1 ? '' : 's'} so far; submitted by ${data.case.submittedBy ?? 'someone'}.`
          : data.case.status === 'draft'
            ? 'Not yet submitted for approval.'
            : data.case.status === 'returned'
              ? 'Sent back for changes: edit the case and submit it again.'
              : `Decided ${data.case.decidedAt ? when(data.case.decidedAt) : ''}.`}
      </p>

      {data.frozen ? (
        <div className={`mt-3 rounded border px-3 py-2 text-xs ${data.frozen.verifies ? 'border-gain/40 bg-[#eef6f1]' : 'border-loss/40 bg-[#fbeceb]'}`} data-testid="frozen-hash">
          <div className="font-medium" data-testid="frozen-verdict">{data.frozen.verifies ? '✓ Frozen record verifies' : '✗ Frozen record does not verify: the stored record was altered'}</div>
          <div className="mt-0.5 text-muted">What was approved — the case file, its results, the proposal (budgets, chosen trucks, swap schedule) with its decision summary, and the pinned Monte Carlo run — SHA-256:</div>
          <code className="block break-all font-mono text-[11px]" data-testid="frozen-hash-value">{data.frozen.hash}</code>
          <a className="btn mt-2 inline-block" href={`${base}/frozen-record`} download data-testid="download-frozen-record">Download frozen record</a>
          <p className="mt-1 text-muted">
            The file holds exactly the bytes hashed. To check it elsewhere, compute its SHA-256 and compare it with the hash above:{' '}
            <code className="font-mono">sha256sum case-{caseId}-frozen-record.json</code> (Linux),{' '}
            <code className="font-mono">shasum -a 256 case-{caseId}-frozen-record.json</code> (macOS) or{' '}
            <code className="font-mono">certutil -hashfile case-{caseId}-frozen-record.json SHA256</code> (Windows).
          </p>
        </div>
      ) : null}

      <ol className="mt-3 space-y-2 border-l border-rule pl-3" aria-label="Approval history" data-testid="approval-history">
        {data.events.length === 0 ? <li className="text-sm text-muted">No steps yet.</li> : null}
        {data.events.map((e) => (
          <li key={e.id} className="text-sm">
            <span className="font-medium">{ACTION_LABELS[e.action] ?? e.action}</span> <span className="text-muted">by {e.who}, {when(e.at)}</span>
            {e.comment ? <p className="mt-0.5 whitespace-pre-wrap rounded bg-paper px-2 py-1">{e.comment}</p> : null}
          </li>
        ))}
      </ol>

      {anyAction ? (
        <div className="mt-4 space-y-2">
          <label htmlFor={`approval-comment-${caseId}`} className="label">
            Comment {can.reject ? '(required to reject or send back)' : '(optional)'}
          </label>
          <textarea id={`approval-comment-${caseId}`} className="field min-h-16" value={comment} onChange={(e) => setComment(e.target.value)} maxLength={4000} />
          <div className="flex flex-wrap gap-2">
            {can.submit ? <button className="btn btn-primary" disabled={pending} onClick={() => act('submit', { comment, version: data.case.version }, 'Submitted; the approvers have been e-mailed.')}>Submit for approval</button> : null}
            {can.approve ? <button className="btn btn-primary" disabled={pending} onClick={() => decide('approve', 'Approval recorded.')}>Approve</button> : null}
            {can.return ? <button className="btn" disabled={pending} onClick={() => decide('return', 'Sent back to the analyst.')}>Send back</button> : null}
            {can.reject ? <button className="btn btn-danger" disabled={pending} onClick={() => decide('reject', 'Rejected.')}>Reject</button> : null}
          </div>
        </div>
      ) : null}
      {can.revise ? (
        <div className="mt-4">
          <button className="btn" disabled={pending} onClick={() => act('revision', undefined, 'New draft created.')}>New revision</button>
          <p className="mt-1 text-xs text-muted">Copies this case into a new draft; this one stays as it was decided.</p>
        </div>
      ) : null}
      {can.reason ? <p className="mt-3 text-xs text-muted" data-testid="approval-reason">{can.reason}</p> : null}
      <div aria-live="polite" className={`mt-2 min-h-5 text-sm ${message?.kind === 'error' ? 'text-loss' : 'text-gain'}`} data-testid="approval-message">
        {message?.text}
      </div>
    </section>
  );
}
