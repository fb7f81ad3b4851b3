import type { ReactNode } from 'react';

/** The narrow centred card of the signed-out pages. */
export function AuthCard({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  return (
    <main className="grid min-h-screen place-items-center px-4">
      <div className="w-full max-w-sm">
        <div className="mb-6">
          <p className="font-mono text-xs uppercase tracking-widest text-policy-repower">Haulcase</p>
          <h1 className="mt-1 text-xl font-semibold">{title}</h1>
          {intro ? <p className="mt-1 text-sm text-muted">{intro}</p> : null}
        </div>
        {children}
      </div>
    </main>
  );
}
