'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import type { ReactNode } from 'react';

export function NavLink({ href, exact, badge, children }: { href: string; exact?: boolean; badge?: number; children: ReactNode }) {
  const path = usePathname();
  const active = exact ? path === href : path === href || path.startsWith(`${href}/`);
  return (
    <Link
      href={href}
      aria-current={active ? 'page' : undefined}
      className={`flex items-center justify-between rounded px-2 py-1.5 text-sm ${active ? 'bg-paper font-medium text-ink' : 'text-muted hover:bg-paper hover:text-ink'}`}
    >
      <span>{children}</span>
      {badge ? (
        <span className="rounded-full bg-policy-repower px-1.5 text-xs font-medium text-white" aria-label={`${badge} waiting`}>
          {badge}
        </span>
      ) : null}
    </Link>
  );
}
