'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { ROLE_LABELS, ROLES, type Role } from '@/lib/auth/roles';
import { ApiError, sendJson } from '@/lib/fetcher';

export type MemberView = { userId: number; email: string; name: string; role: Role; since: string; version: number };

/**
 * One member: a role selector (saved with Save role) and Remove, which asks
 * first. The server refuses to demote or remove the last admin (409), and its
 * message is shown on the row.
 */
export function MemberRow({ workspace, member, isSelf }: { workspace: string; member: MemberView; isSelf: boolean }) {
  const router = useRouter();
  const [role, setRole] = useState<Role>(member.role);
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const who = member.name || member.email;
  const url = `/api/workspaces/${workspace}/members/${member.userId}`;

  async function act(run: () => Promise<unknown>, done: string) {
    setBusy(true);
    setMessage(null);
    try {
      await run();
      setMessage({ kind: 'ok', text: done });
      setConfirming(false);
      router.refresh();
    } catch (e) {
      const err = e as ApiError;
      setMessage({ kind: 'error', text: err.problems?.[0]?.message ?? err.message });
    } finally {
      setBusy(false);
    }
  }

  const saveRole = () => act(() => sendJson(url, 'PATCH', { role, version: member.version }), `${who} is now ${ROLE_LABELS[role].toLowerCase()}.`);
  const remove = () => act(async () => {
    await sendJson(`${url}?version=${member.version}`, 'DELETE');
    // you removed yourself: this workspace is no longer yours to see
    if (isSelf) window.location.assign('/');
  }, `${who} was removed.`);

  return (
    <tr data-testid={`member-${member.email}`} className="align-top">
      <td className="font-mono text-xs">{member.email}{isSelf ? <span className="ml-1 font-sans text-muted">(you)</span> : null}</td>
      <td>{member.name}</td>
      <td>
        <div className="flex items-center gap-2">
          <label className="sr-only" htmlFor={`role-${member.userId}`}>Access for {member.email}</label>
          <select id={`role-${member.userId}`} className="field w-36 py-1" value={role} onChange={(e) => setRole(e.target.value as Role)} disabled={busy}>
            {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
          </select>
          {role !== member.role ? (
            <button type="button" className="btn btn-primary whitespace-nowrap" onClick={saveRole} disabled={busy}>Save role</button>
          ) : null}
        </div>
      </td>
      <td>{member.since.slice(0, 10)}</td>
      <td className="whitespace-nowrap">
        {confirming ? (
          <span className="flex items-center gap-2">
            <span className="text-xs">Remove {who}{isSelf ? ' (yourself)' : ''}?</span>
            <button type="button" className="btn btn-danger" onClick={remove} disabled={busy}>Yes, remove</button>
            <button type="button" className="btn" onClick={() => setConfirming(false)} disabled={busy}>Cancel</button>
          </span>
        ) : (
          <button type="button" className="btn" onClick={() => { setMessage(null); setConfirming(true); }} aria-label={`Remove ${member.email}`}>Remove</button>
        )}
        <p className={`mt-1 max-w-72 whitespace-normal text-xs ${message?.kind === 'error' ? 'text-loss' : 'text-gain'}`} aria-live="polite" data-testid="member-message">{message?.text}</p>
      </td>
    </tr>
  );
}
