/**
 * Mail settings from the environment. With no SMTP_HOST (or HAULCASE_MAIL_SINK=1)
 * mail goes to the local sink that starts with the app on loopback, so a fresh
 * clone needs no outside service and never delivers to a real mailbox.
 */
export type MailConfig = {
  sink: boolean;
  host: string;
  port: number;
  user?: string;
  pass?: string;
  from: string;
  appUrl: string;
};

export function readMailConfig(env: Record<string, string | undefined> = process.env): MailConfig {
  const sink = !env.SMTP_HOST || env.HAULCASE_MAIL_SINK === '1';
  return {
    sink,
    host: sink ? '127.0.0.1' : (env.SMTP_HOST as string),
    port: Number(env.SMTP_PORT || (sink ? 0 : 587)),
    user: env.SMTP_USER || undefined,
    pass: env.SMTP_PASS || undefined,
    from: env.SMTP_FROM || 'Haulcase <no-reply@haulcase.test>',
    appUrl: (env.APP_URL || env.NEXTAUTH_URL || 'http://127.0.0.1:3000').replace(/\/+$/, ''),
  };
}

/** The header that tags a message with its workspace, so the outbox shows each workspace only its own mail. */
export const WORKSPACE_HEADER = 'X-Haulcase-Workspace';
