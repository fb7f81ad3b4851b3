import Link from 'next/link';
import type { Role } from '@/lib/auth/roles';
import { ROLE_LABELS } from '@/lib/auth/roles';
import { NAV } from './nav';
import { NavLink } from './nav-link';
import { SignOutButton } from './sign-out-button';
import { WorkspaceSwitcher } from './workspace-switcher';

type Props = {
  slug: string;
  role: Role;
  email: string;
  workspaces: Array<{ slug: string; name: string; role: Role }>;
  badges?: Record<string, number>;
  /** Section hrefs not to list (e.g. the outbox when real SMTP is configured). */
  hidden?: string[];
};

/** The narrow left rail: workspace switcher, sections, who is signed in. */
export function Rail({ slug, role, email, workspaces, badges = {}, hidden = [] }: Props) {
  return (
    <nav aria-label="Workspace" className="flex h-screen w-56 shrink-0 flex-col border-r border-rule bg-panel print:hidden">
      <div className="border-b border-rule px-3 py-3">
        <Link href="/" className="font-mono text-xs uppercase tracking-widest text-policy-repower">Haulcase</Link>
        <WorkspaceSwitcher current={slug} workspaces={workspaces} />
      </div>
      <ul className="flex-1 space-y-0.5 overflow-y-auto px-2 py-3">
        {NAV.filter((n) => (!n.roles || n.roles.includes(role)) && !hidden.includes(n.href)).map((n) => (
          <li key={n.href}>
            <NavLink href={`/${slug}${n.href}`} exact={n.href === ''} badge={badges[n.href]}>
              {n.label}
            </NavLink>
          </li>
        ))}
      </ul>
      <div className="border-t border-rule px-3 py-3 text-xs">
        <div className="truncate font-medium" title={email}>{email}</div>
        <div className="text-muted" data-testid="current-role">{ROLE_LABELS[role]}</div>
        <SignOutButton />
      </div>
    </nav>
  );
}
