'use client';

import { signIn } from 'next-auth/react';
import { useState } from 'react';
import { safeCallback } from '@/lib/auth/callback';

const MESSAGES: Record<string, string> = {
  CredentialsSignin: 'Wrong email or password. Check both and try again.',
  Throttled: 'Too many failed sign-ins for this account or from your address. Wait a little and try again: each further failure makes the wait longer (at most 15 minutes).',
  NoWorkspace: 'Your account is not a member of any workspace yet. Ask an admin to invite you.',
  SessionRequired: 'Sign in to continue.',
};

export function SignInForm({ callbackUrl, initialError }: { callbackUrl?: string; initialError?: string }) {
  const [error, setError] = useState<string | null>(initialError ? (MESSAGES[initialError] ?? 'Sign-in failed. Try again.') : null);
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const email = String(form.get('email') ?? '').trim();
    const password = String(form.get('password') ?? '');
    if (!email || !password) {
      setError('Enter your email and password.');
      return;
    }
    setPending(true);
    setError(null);
    const target = safeCallback(callbackUrl, window.location.origin);
    const res = await signIn('credentials', { email, password, redirect: false, callbackUrl: target });
    setPending(false);
    if (!res || res.error || !res.ok) {
      const key = res?.status === 429 ? 'Throttled' : (res?.error ?? 'CredentialsSignin');
      setError(MESSAGES[key] ?? MESSAGES.CredentialsSignin);
      return;
    }
    window.location.assign(target);
  }

  return (
    <form onSubmit={onSubmit} className="card space-y-4 p-5" noValidate>
      <div>
        <label htmlFor="email" className="label">Email</label>
        <input id="email" name="email" type="email" autoComplete="username" className="field" required />
      </div>
      <div>
        <label htmlFor="password" className="label">Password</label>
        <input id="password" name="password" type="password" autoComplete="current-password" className="field" required />
      </div>
      <div aria-live="polite" className="min-h-5 text-sm text-loss" data-testid="sign-in-error">
        {error}
      </div>
      <button type="submit" className="btn btn-primary w-full justify-center" disabled={pending}>
        {pending ? 'Signing in…' : 'Sign in'}
      </button>
      <p className="text-xs text-muted">
        <a className="underline" href="/forgot-password">Forgot your password?</a>
      </p>
    </form>
  );
}
