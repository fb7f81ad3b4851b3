import type { Metadata } from 'next';
import { AccessDenied } from '@/components/ui/access-denied';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { mailBaseWarning } from '@/lib/mail/base-url';
import { fetchOutbox, fetchOutboxQueue, outboxEnabled, type QueuedMessage } from '@/lib/mail/outbox';

export const metadata: Metadata = { title: 'Outbox' };

/** Mail the local SMTP sink received: how people in development and the demo read what Haulcase sent. */
export default async function OutboxPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  if (!hasRole(access, CAN.administer)) return <AccessDenied need={CAN.administer} have={access.role} />;
  const queued = await fetchOutboxQueue(access.workspace.slug);
  const baseWarning = mailBaseWarning();
  const warning = baseWarning ? <p role="note" className="card mb-4 border-loss/40 bg-loss/5 p-3 text-sm" data-testid="outbox-base-warning">{baseWarning}</p> : null;
  if (!outboxEnabled()) {
    return (
      <>
        <PageHeader title="Outbox" />
        {warning}
        <QueuedMail messages={queued} />
        <EmptyState title="Mail goes to a real SMTP server">SMTP_HOST is configured, so messages are delivered to real mailboxes and there is no local outbox to show.</EmptyState>
      </>
    );
  }
  const messages = await fetchOutbox(access.workspace.id, access.workspace.slug);
  return (
    <>
      <PageHeader title="Outbox" subtitle="Mail received by the local SMTP sink (no SMTP_HOST is configured, so nothing leaves this machine)." />
      {warning}
      <QueuedMail messages={queued} />
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

const QUEUE_STATUS: Record<QueuedMessage['status'], string> = { pending: 'Waiting', sending: 'Sending', failed: 'Not sent' };

/** This workspace's mail not sent yet (waiting for its next attempt) or given up after the last one. */
function QueuedMail({ messages }: { messages: QueuedMessage[] }) {
  if (messages.length === 0) return null;
  return (
    <section className="card mb-4" data-testid="outbox-queue">
      <h2 className="border-b border-rule px-3 py-2 text-sm font-semibold">Not sent yet</h2>
      <table className="data-table">
        <thead>
          <tr><th>Subject</th><th>To</th><th>Status</th><th className="text-right">Attempts</th><th>Next attempt (UTC)</th><th>Last error</th></tr>
        </thead>
        <tbody>
          {messages.map((m) => (
            <tr key={m.id}>
              <td>{m.subject}</td>
              <td className="font-mono text-xs">{m.to.join(', ')}</td>
              <td>{QUEUE_STATUS[m.status]}</td>
              <td className="text-right tabular-nums">{m.attempts}</td>
              <td className="tabular-nums">{m.status === 'failed' ? '—' : m.nextAttemptAt.slice(0, 19).replace('T', ' ')}</td>
              <td className="text-xs text-muted">{m.lastError ?? ''}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
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
