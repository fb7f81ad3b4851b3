import type { Metadata } from 'next';
import { SignInForm } from './sign-in-form';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const raw = await searchParams;
  // a repeated parameter arrives as an array: take the first
  const sp = Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  return (
    <main className="grid min-h-screen place-items-center px-4">
      <div className="w-full max-w-sm">
        <div className="mb-6">
          <p className="font-mono text-xs uppercase tracking-widest text-policy-repower">Haulcase</p>
          <h1 className="mt-1 text-xl font-semibold">Sign in</h1>
          <p className="mt-1 text-sm text-muted">Keep, rebuild or repower: the business case for every haul truck.</p>
        </div>
        <SignInForm callbackUrl={sp.callbackUrl} initialError={sp.error} />
      </div>
    </main>
  );
}
