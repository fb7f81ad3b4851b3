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
 * otherwise to the local sink on loopback. Sent after the change is committed;
 * a failure is logged and reported but never undoes the change.
 */
export async function sendMail(m: OutgoingMail): Promise<{ ok: boolean; messageId?: string }> {
  if (m.to.length === 0) return { ok: true };
  const cfg = readMailConfig();
  const port = cfg.sink ? (await ensureMailSink()).port : cfg.port;
  const transport = nodemailer.createTransport({
    host: cfg.host,
    port,
    secure: !cfg.sink && port === 465,
    ignoreTLS: cfg.sink,
    auth: !cfg.sink && cfg.user ? { user: cfg.user, pass: cfg.pass ?? '' } : undefined,
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
    console.error('[haulcase] could not send mail:', err);
    return { ok: false };
  } finally {
    transport.close();
  }
}
