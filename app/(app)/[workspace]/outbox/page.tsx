import type { Metadata } from 'next';
import { AccessDenied } from '@/components/ui/access-denied';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { fetchOutbox, outboxEnabled } from '@/lib/mail/outbox';

export const metadata: Metadata = { title: 'Outbox' };

/** Mail the local SMTP sink received: how people in development and the demo read what Haulcase sent. */
export default async function OutboxPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  if (!hasRole(access, CAN.administer)) return <AccessDenied need={CAN.administer} have={access.role} />;
  if (!outboxEnabled()) {
    return (
      <>
        <PageHeader title="Outbox" />
        <EmptyState title="Mail goes to a real SMTP server">SMTP_HOST is configured, so messages are delivered to real mailboxes and there is no local outbox to show.</EmptyState>
      </>
    );
  }
  const messages = await fetchOutbox(access.workspace.id, access.workspace.slug);
  return (
    <>
      <PageHeader title="Outbox" subtitle="Mail received by the local SMTP sink (no SMTP_HOST is configured, so nothing leaves this machine)." />
      {messages.length === 0 ? (
        <EmptyState title="No mail yet">Submitting a case, deciding on one, inviting someone or asking for a password reset sends mail; it lands here.</EmptyState>
      ) : (
        <ul className="space-y-2" data-testid="outbox">
          {messages.map((m) => (
            <li key={m.id} className="card">
              <details>
                <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-4 px-3 py-2 text-sm">
                  <span className="font-medium" data-testid="outbox-subject">{m.subject}</span>
                  <span className="font-mono text-xs text-muted">to {m.to.join(', ')}</span>
                  <span className="ml-auto text-xs text-muted">{m.receivedAt.slice(0, 19).replace('T', ' ')} UTC</span>
                </summary>
                <div className="border-t border-rule px-3 py-2">
                  <p className="mb-1 font-mono text-xs text-muted">from {m.fromAddress}</p>
                  <pre className="whitespace-pre-wrap break-words font-sans text-sm" data-testid="outbox-text">
                    {linkify(m.text)}
                  </pre>
                </div>
              </details>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

/** Links in the plain-text part become clickable; the HTML part is never rendered here (no injected markup). */
function linkify(text: string) {
  return text.split(/(https?:\/\/[^\s]+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} className="underline" href={part}>{part}</a>
    ) : (
      part
    ),
  );
}
