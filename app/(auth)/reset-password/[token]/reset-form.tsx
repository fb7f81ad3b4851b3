'use client';

import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';

export function ResetForm({ token }: { token: string }) {
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const password = String(f.get('password') ?? '');
    if (password.length < 10) return setError('Use at least 10 characters.');
    if (password !== String(f.get('confirm') ?? '')) return setError('The two passwords differ.');
    setPending(true);
    setError(null);
    try {
      await sendJson('/api/password/reset', 'POST', { token, password });
      setDone(true);
    } catch (err) {
      const e2 = err as ApiError;
      setError(e2.problems.find((p) => p.path === 'password')?.message ?? e2.message);
    } finally {
      setPending(false);
    }
  }

  if (done) return <p className="card p-4 text-sm" role="status">Your password is changed. <a className="underline" href="/sign-in">Sign in</a> with it.</p>;
  return (
    <form onSubmit={onSubmit} className="card space-y-4 p-5" noValidate>
      <div>
        <label htmlFor="password" className="label">New password</label>
        <input id="password" name="password" type="password" autoComplete="new-password" className="field" />
      </div>
      <div>
        <label htmlFor="confirm" className="label">Repeat the new password</label>
        <input id="confirm" name="confirm" type="password" autoComplete="new-password" className="field" />
      </div>
      <div aria-live="polite" className="min-h-5 text-sm text-loss" data-testid="reset-error">{error}</div>
      <button type="submit" className="btn btn-primary w-full justify-center" disabled={pending}>{pending ? 'Saving…' : 'Set the new password'}</button>
    </form>
  );
}
