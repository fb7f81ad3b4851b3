import type { Role } from '@/lib/auth/roles';
import { ROLE_LABELS } from '@/lib/auth/roles';

/** Shown in place of a page whose role requirement the caller does not meet. */
export function AccessDenied({ need, have }: { need: readonly Role[]; have: Role }) {
  return (
    <div role="alert" className="card border-loss/40 p-6" data-testid="access-denied">
      <h1 className="text-base font-semibold">You don&rsquo;t have access to this page</h1>
      <p className="mt-1 text-sm text-muted">
        It needs the {need.map((r) => ROLE_LABELS[r]).join(' or ')} role in this workspace; your role is{' '}
        {ROLE_LABELS[have]}. Ask a workspace admin if you need it.
      </p>
    </div>
  );
}
