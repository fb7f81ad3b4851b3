import { env } from '../env';
import { mailBaseUrl } from './base-url';

/**
 * Mail settings from the validated environment (lib/env.ts). With no SMTP_HOST
 * mail goes to the local sink that starts with the app on loopback, so a fresh
 * clone needs no outside service and never delivers to a real mailbox; with
 * SMTP_HOST set no sink starts. With several servers and no SMTP each server
 * runs its own sink and all of them store into the shared `mail_sink` table.
 */
export type MailConfig = {
  sink: boolean;
  host: string;
  port: number;
  user?: string;
  pass?: string;
  from: string;
  /** the base of links in mail: APP_URL, else the request's origin, else a fallback (lib/mail/base-url.ts) */
  appUrl: string;
};

export function readMailConfig(raw: Record<string, string | undefined> = process.env): MailConfig {
  const e = env(raw);
  const sink = !e.SMTP_HOST;
  return {
    sink,
    host: e.SMTP_HOST ?? '127.0.0.1',
    port: e.SMTP_PORT ?? (sink ? 0 : 587),
    user: e.SMTP_USER,
    pass: e.SMTP_PASS,
    from: e.SMTP_FROM || 'Haulcase <no-reply@haulcase.test>',
    appUrl: mailBaseUrl(raw),
  };
}

/** The header that tags a message with its workspace, so the outbox shows each workspace only its own mail. */
export const WORKSPACE_HEADER = 'X-Haulcase-Workspace';
