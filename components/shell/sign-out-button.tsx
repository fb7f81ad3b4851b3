'use client';

import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button type="button" className="mt-2 text-xs text-muted underline hover:text-ink" onClick={() => signOut({ callbackUrl: '/sign-in' })}>
      Sign out
    </button>
  );
}
