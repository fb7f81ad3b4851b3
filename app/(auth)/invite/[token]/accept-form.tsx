'use client';

import { signIn } from 'next-auth/react';
import { useState } from 'react';
import { ApiError, sendJson } from '@/lib/fetcher';

type Errors = Partial<Record<'name' | 'password' | 'confirm', string>>;

/** New address: name and password, then signed in. Existing account (signed in): one button. */
export function AcceptForm({ token, email, slug, newAccount }: { token: string; email: string; slug: string; newAccount: boolean }) {
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const name = String(form.get('name') ?? '').trim();
    const password = String(form.get('password') ?? '');
    const confirm = String(form.get('confirm') ?? '');
    if (newAccount) {
      const found: Errors = {};
      if (!name) found.name = 'Enter your name.';
      if (password.length < 10) found.password = 'Use at least 10 characters.';
      if (confirm !== password) found.confirm = 'The two passwords differ.';
      setErrors(found);
      if (Object.keys(found).length) return;
    }
    setPending(true);
    setMessage(null);
    try {
      await sendJson('/api/invitations/accept', 'POST', newAccount ? { token, name, password } : { token });
      if (newAccount) {
        const r = await signIn('credentials', { email, password, redirect: false });
        if (!r?.ok) {
          window.location.assign(`/sign-in?callbackUrl=/${slug}`);
          return;
        }
      }
      window.location.assign(`/${slug}`);
    } catch (err) {
      const e2 = err as ApiError;
      const byField: Errors = {};
      for (const p of e2.problems) if (p.path === 'name' || p.path === 'password') byField[p.path] = p.message;
      setErrors(byField);
      setMessage(e2.message);
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} className="card space-y-4 p-5" noValidate>
      {newAccount ? (
        <>
          <Field id="name" label="Your name" type="text" autoComplete="name" error={errors.name} />
          <Field id="password" label="Choose a password" type="password" autoComplete="new-password" error={errors.password} />
          <Field id="confirm" label="Repeat the password" type="password" autoComplete="new-password" error={errors.confirm} />
        </>
      ) : (
        <p className="text-sm">You are signed in as {email}.</p>
      )}
      <div aria-live="polite" className="min-h-5 text-sm text-loss" data-testid="accept-error">{message}</div>
      <button type="submit" className="btn btn-primary w-full justify-center" disabled={pending}>
        {pending ? 'Joining…' : newAccount ? 'Create my account and join' : 'Join the workspace'}
      </button>
    </form>
  );
}

function Field({ id, label, type, autoComplete, error }: { id: string; label: string; type: string; autoComplete: string; error?: string }) {
  return (
    <div>
      <label htmlFor={id} className="label">{label}</label>
      <input id={id} name={id} type={type} autoComplete={autoComplete} className="field" aria-invalid={Boolean(error)} aria-describedby={`${id}-error`} />
      <p id={`${id}-error`} className="mt-1 min-h-4 text-xs text-loss" aria-live="polite">{error}</p>
    </div>
  );
}
