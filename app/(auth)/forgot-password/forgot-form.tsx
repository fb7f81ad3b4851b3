'use client';

import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';

export function ForgotForm() {
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const email = String(new FormData(e.currentTarget).get('email') ?? '').trim();
    if (!email) return setError('Enter your email address.');
    setPending(true);
    setError(null);
    try {
      const r = await sendJson<{ message: string }>('/api/password/forgot', 'POST', { email });
      setDone(r.message);
    } catch (err) {
      const e2 = err instanceof ApiError ? err : new ApiError(0, 'Could not reach the server. Try again.');
      setError(e2.problems[0]?.message ?? e2.message);
    } finally {
      setPending(false);
    }
  }

  if (done) return <p className="card p-4 text-sm" role="status" data-testid="forgot-done">{done} <a className="underline" href="/sign-in">Back to sign-in</a></p>;
  return (
    <form onSubmit={onSubmit} className="card space-y-4 p-5" noValidate>
      <div>
        <label htmlFor="email" className="label">Email</label>
        <input id="email" name="email" type="email" autoComplete="username" className="field" aria-invalid={Boolean(error)} />
      </div>
      {/* a 429 (too many requests) reads the same whether or not the address has an account */}
      <div role="alert" aria-live="polite" className="min-h-5 text-sm text-loss" data-testid="forgot-error">{error}</div>
      <button type="submit" className="btn btn-primary w-full justify-center" disabled={pending}>{pending ? 'Sending…' : 'Mail me a reset link'}</button>
      <p className="text-xs text-muted"><a className="underline" href="/sign-in">Back to sign-in</a></p>
    </form>
  );
}
