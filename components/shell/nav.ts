import { CAN, type Role } from '@/lib/auth/roles';

export type NavItem = { href: string; label: string; roles?: readonly Role[] };

/** The sections of a workspace, in the order of the job. */
export const NAV: NavItem[] = [
  { href: '', label: 'Overview' },
  { href: '/fleet', label: 'Fleet register' },
  { href: '/engines', label: 'Engine library' },
  { href: '/offers', label: 'Repower offers' },
  { href: '/assumptions', label: 'Assumptions' },
  { href: '/cases', label: 'Business cases' },
  { href: '/approvals', label: 'Approvals' },
  { href: '/audit', label: 'Audit log', roles: CAN.audit },
  { href: '/settings', label: 'Settings' },
  { href: '/members', label: 'Members', roles: ['admin'] },
  // Only listed while mail goes to the local sink (the layout hides it otherwise).
  { href: '/outbox', label: 'Outbox', roles: ['admin'] },
];
