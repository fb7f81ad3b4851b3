'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';

/** The admin's one approval setting: how many distinct people must approve a case. */
export function ApprovalsSettingForm({ workspace, current, canEdit }: { workspace: string; current: number; canEdit: boolean }) {
  const router = useRouter();
  const [value, setValue] = useState(String(current));
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);

  async function onSubmit(e: React.FormEvent) {
    e.preventDefault();
    const n = Number(value);
    try {
      await sendJson(`/api/workspaces/${workspace}/settings/approvals`, 'PUT', { approvalsRequired: value.trim() === '' ? null : n });
      setMessage({ kind: 'ok', text: `Saved: a case now needs ${n} approval${n === 1 ? '' : 's'}.` });
      router.refresh();
    } catch (err) {
      const e2 = err as ApiError;
      setMessage({ kind: 'error', text: e2.problems[0]?.message ?? e2.message });
    }
  }

  return (
    <form onSubmit={onSubmit} className="card flex flex-wrap items-end gap-3 p-4" aria-label="Approval rule" noValidate>
      <div>
        <label htmlFor="approvals-required" className="label">Distinct approvers a case needs</label>
        <input id="approvals-required" type="number" min={1} max={10} step={1} className="field w-28 text-right" value={value} onChange={(e) => setValue(e.target.value)} disabled={!canEdit} aria-invalid={message?.kind === 'error'} />
      </div>
      {canEdit ? <button type="submit" className="btn btn-primary">Save</button> : <p className="text-xs text-muted">Only admins change this.</p>}
      <p className="w-full text-xs text-muted">The person who submitted a case never counts; a second approval by the same person does not count twice.</p>
      <p aria-live="polite" className={`w-full text-sm ${message?.kind === 'error' ? 'text-loss' : 'text-gain'}`}>{message?.text}</p>
    </form>
  );
}
