/**
 * Validates the environment (lib/env.ts: a bad setting stops the server, naming the variable); stamps each request with its socket address (lib/auth/peer-address.ts); starts the local SMTP sink with the server when no SMTP_HOST is configured
 * (development, demo, tests), so mail has somewhere real to go on a fresh clone;
 * starts the mail outbox sender (lib/mail/queue.ts: what is due now, then on an
 * unreferenced timer); marks Monte Carlo runs that the previous process left
 * running as failed (SQLite) or starts taking runs from the job queue (PostgreSQL); and warms the Monte Carlo worker threads in the background.
 */
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { checkEnvAtStart } = await import('./lib/env');
  checkEnvAtStart();
  const { warnMailBaseOnce } = await import('./lib/mail/base-url');
  warnMailBaseOnce();
  // the caller's socket address for the sign-in and reset throttles (Next gives route handlers no socket)
  const { installPeerAddressStamp } = await import('./lib/auth/peer-address');
  installPeerAddressStamp();
  const { markInterruptedRuns, startRunWorkers } = await import('./lib/risk/startup');
  void markInterruptedRuns();
  void startRunWorkers();
  const { warmMonteCarloWorkers } = await import('./lib/risk/warm');
  void warmMonteCarloWorkers();
  const { readMailConfig } = await import('./lib/mail/config');
  if (readMailConfig().sink) {
    const { ensureMailSink } = await import('./lib/mail/sink');
    try {
      const sink = await ensureMailSink();
      console.log(`[haulcase] local mail sink listening on 127.0.0.1:${sink.port}; messages appear on the Outbox page`);
    } catch (err) {
      console.error('[haulcase] local mail sink did not start:', err);
    }
  }
  // sends what the outbox holds now (mail a previous process committed but did not send), then on a timer
  const { startOutboxSender } = await import('./lib/mail/queue');
  startOutboxSender();
}
