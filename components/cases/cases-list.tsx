'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR from 'swr';
import { EmptyState } from '@/components/ui/empty-state';
import type { CaseSummaryDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import { CreateCaseForm } from './create-case-form';

export function CasesList({ slug, canEdit }: { slug: string; canEdit: boolean }) {
  const key = `/api/workspaces/${slug}/cases`;
  const { data, error, isLoading, mutate } = useSWR<{ cases: CaseSummaryDto[] }>(key);
  const [creating, setCreating] = useState(false);
  const [message, setMessage] = useState('');
  const router = useRouter();

  async function act(fn: () => Promise<unknown>) {
    setMessage('');
    try {
      await fn();
      await mutate();
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : 'Could not reach the server.');
    }
  }

  const newButton = canEdit && !creating ? <button type="button" className="btn btn-primary" onClick={() => setCreating(true)}>New case</button> : null;
  return (
    <div className="space-y-4">
      {newButton ? <div className="flex justify-end">{newButton}</div> : null}
      {creating ? <CreateCaseForm slug={slug} onCancel={() => setCreating(false)} onCreated={(id) => router.push(`/${slug}/cases/${id}`)} /> : null}
      <p role="status" className="text-sm text-loss">{message}</p>
      {error ? <p role="alert" className="text-sm text-loss">Could not load the cases: {error.message}</p> : null}
      {isLoading ? <div aria-busy="true" className="h-24 animate-pulse rounded bg-rule/60"><span className="sr-only">Loading cases…</span></div> : null}
      {data && data.cases.length === 0 && !creating ? (
        <EmptyState title="No business cases yet" action={newButton}>
          A business case takes a selection of trucks and an assumption set and computes, for every truck, the NPV of keeping, rebuilding and repowering, the best policy, IRR and payback; then ranks the trucks and plans the swaps under a capital budget.
        </EmptyState>
      ) : null}
      {data && data.cases.length > 0 ? (
        <div className="card overflow-x-auto">
          <table className="data-table" data-testid="cases-table">
            <thead>
              <tr><th>Case</th><th>Assumption set</th><th className="n">Trucks</th><th>Status</th><th>Updated</th>{canEdit ? <th>Actions</th> : null}</tr>
            </thead>
            <tbody>
              {data.cases.map((c) => (
                <tr key={c.id}>
                  <td><Link className="font-medium text-accent hover:underline" href={`/${slug}/cases/${c.id}`}>{c.name}</Link></td>
                  <td>{c.assumptionSetName ?? <span className="text-loss">deleted</span>}</td>
                  <td className="n">{c.truckCount}</td>
                  <td className="capitalize">{c.status}</td>
                  <td>{c.updatedAt.slice(0, 16).replace('T', ' ')}</td>
                  {canEdit ? (
                    <td className="space-x-1 whitespace-nowrap">
                      <button type="button" className="btn py-0.5" onClick={() => act(() => sendJson(`${key}/${c.id}/copy`, 'POST'))}>Copy</button>
                      {c.status === 'draft' || c.status === 'returned' ? (
                        <>
                          <Link className="btn py-0.5" href={`/${slug}/cases/${c.id}?edit=1`} aria-label={`Edit settings of ${c.name}`}>Edit</Link>
                          <button type="button" className="btn btn-danger py-0.5" onClick={() => { if (window.confirm(`Delete “${c.name}”?`)) act(() => sendJson(`${key}/${c.id}?version=${c.version}`, 'DELETE')); }}>Delete</button>
                        </>
                      ) : null}
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </div>
  );
}
