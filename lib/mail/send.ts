import 'server-only';
import nodemailer from 'nodemailer';
import { readMailConfig, WORKSPACE_HEADER } from './config';
import { ensureMailSink } from './sink';

export type OutgoingMail = {
  to: string[];
  subject: string;
  text: string;
  html: string;
  /** Workspace slug, for the outbox; omitted for account mail. */
  workspace?: string;
};

/**
 * Sends one message over SMTP with nodemailer: to SMTP_HOST when configured,
 * otherwise to the local sink on loopback. Only the outbox sender
 * (lib/mail/queue.ts) calls this; the product writes mail with `enqueueMail`
 * in the transaction of its change. The timeouts keep one attempt well inside
 * the sender's claim on the row (OUTBOX.claimMs).
 */
export async function sendMail(m: OutgoingMail): Promise<{ ok: boolean; messageId?: string; error?: string }> {
  if (m.to.length === 0) return { ok: true };
  const cfg = readMailConfig();
  const port = cfg.sink ? (await ensureMailSink()).port : cfg.port;
  const transport = nodemailer.createTransport({
    host: cfg.host,
    port,
    secure: !cfg.sink && port === 465,
    ignoreTLS: cfg.sink,
    auth: !cfg.sink && cfg.user ? { user: cfg.user, pass: cfg.pass ?? '' } : undefined,
    connectionTimeout: 30_000,
    greetingTimeout: 30_000,
    socketTimeout: 60_000,
  });
  try {
    const info = await transport.sendMail({
      from: cfg.from,
      to: m.to,
      subject: m.subject,
      text: m.text,
      html: m.html,
      headers: m.workspace ? { [WORKSPACE_HEADER]: m.workspace } : undefined,
    });
    return { ok: true, messageId: info.messageId };
  } catch (err) {
    return { ok: false, error: err instanceof Error ? err.message : String(err) };
  } finally {
    transport.close();
  }
}
