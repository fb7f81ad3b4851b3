import type { ReactNode } from 'react';

/** What belongs in an empty section, and the action that fills it. */
export function EmptyState({ title, children, action }: { title: string; children: ReactNode; action?: ReactNode }) {
  return (
    <div className="card flex flex-col items-start gap-2 p-6" data-testid="empty-state">
      <h2 className="text-base font-semibold">{title}</h2>
      <div className="max-w-2xl text-sm text-muted">{children}</div>
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
