import { AsyncLocalStorage } from 'node:async_hooks';
import { env } from '../env';

/**
 * The base of every link in a mail (invitations, password resets, approval
 * mails): the configured `APP_URL`, else the origin of the
 * request being handled (`route(…)` in lib/http.ts runs each API handler inside
 * `withRequestOrigin`, so a mail built while answering a request links back to
 * the host and port the person used), else — a mail built on a background path
 * with no request — `NEXTAUTH_URL`, else http://127.0.0.1:3000, which is a guess:
 * `mailBaseWarning()` says so at start-up (server log) and on the Outbox page.
 */
const requestOrigin = new AsyncLocalStorage<string>();

export const FALLBACK_BASE = 'http://127.0.0.1:3000';

const trim = (u: string | undefined) => (u ? u.replace(/\/+$/, '') : null);

/** APP_URL, the app's public address, when set. */
export function configuredBaseUrl(raw: Record<string, string | undefined> = process.env): string | null {
  return trim(env(raw).APP_URL);
}

export function withRequestOrigin<T>(origin: string, run: () => T): T {
  return requestOrigin.run(origin.replace(/\/+$/, ''), run);
}

export function mailBaseUrl(raw: Record<string, string | undefined> = process.env): string {
  return configuredBaseUrl(raw) ?? requestOrigin.getStore() ?? trim(env(raw).NEXTAUTH_URL) ?? FALLBACK_BASE;
}

/** The warning to show when no base URL is configured, or null. */
export function mailBaseWarning(raw: Record<string, string | undefined> = process.env): string | null {
  if (configuredBaseUrl(raw)) return null;
  const background = trim(env(raw).NEXTAUTH_URL) ?? FALLBACK_BASE;
  return `APP_URL is not set: links in mail use the address of the request that sent them, and mail sent from a background task links to ${background}, which may not be where people reach the app. Set APP_URL to the app's public address.`;
}

let warned = false;
/** Logs the warning once per process (called at start-up from instrumentation.ts). */
export function warnMailBaseOnce(log: (m: string) => void = console.warn): void {
  const w = mailBaseWarning();
  if (w && !warned) {
    warned = true;
    log(`[haulcase] ${w}`);
  }
}
