'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ROLE_LABELS, ROLES } from '@/lib/auth/roles';
import { ApiError, sendJson } from '@/lib/fetcher';
import { invitationSchema } from '@/lib/validation/approval';

type Values = z.input<typeof invitationSchema>;

/** Invite an address with a role; the server mails a single-use link valid for 7 days. */
export function InviteForm({ workspace }: { workspace: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const { register, handleSubmit, reset, setError, formState: { errors, isSubmitting } } = useForm<Values>({
    resolver: zodResolver(invitationSchema),
    defaultValues: { email: '', role: 'viewer' },
  });

  async function onSubmit(values: Values) {
    setMessage(null);
    try {
      // the mail is in the outbox with the invitation; the sender delivers (and retries) it after the commit
      const r = await sendJson<{ email: string; mailQueued: boolean }>(`/api/workspaces/${workspace}/invitations`, 'POST', values);
      setMessage({ kind: 'ok', text: `Invitation sent to ${r.email}.` });
      reset({ email: '', role: values.role });
      router.refresh();
    } catch (e) {
      const err = e as ApiError;
      for (const p of err.problems ?? []) if (p.path === 'email' || p.path === 'role') setError(p.path, { message: p.message });
      setMessage({ kind: 'error', text: err.message });
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} className="card flex flex-wrap items-start gap-3 p-4" noValidate aria-label="Invite someone">
      <div className="min-w-64 flex-1">
        <label htmlFor="invite-email" className="label">Email</label>
        <input id="invite-email" type="email" className="field" aria-invalid={Boolean(errors.email)} aria-describedby="invite-email-error" {...register('email')} />
        <p id="invite-email-error" className="mt-1 min-h-4 text-xs text-loss" aria-live="polite">{errors.email?.message}</p>
      </div>
      <div>
        <label htmlFor="invite-role" className="label">Role</label>
        <select id="invite-role" className="field" aria-invalid={Boolean(errors.role)} {...register('role')}>
          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
        <p className="mt-1 min-h-4 text-xs text-loss" aria-live="polite">{errors.role?.message}</p>
      </div>
      <div className="pt-5">
        <button type="submit" className="btn btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Sending…' : 'Send invitation'}</button>
      </div>
      <p className={`w-full text-sm ${message?.kind === 'error' ? 'text-loss' : 'text-gain'}`} aria-live="polite" data-testid="invite-message">{message?.text}</p>
    </form>
  );
}
