import 'server-only';
/**
 * What a server does about Monte Carlo runs when it starts (instrumentation.ts).
 * In-process backend (SQLite): runs left `running` by the process before it are
 * failed, with the reason. Queue backend (PostgreSQL): other servers' runs are
 * in the same table and the queue's expiry ends a dead server's runs, so
 * nothing is marked; this server's workers start taking runs from the queue.
 */
import { env } from '@/lib/env';
import { queueBackendFromEnv } from './backends/queue';
import { failInterruptedRuns } from './runs';

export async function markInterruptedRuns(): Promise<void> {
  if (env().DATABASE_URL) return;
  try {
    const n = await failInterruptedRuns();
    if (n > 0) console.log(`[haulcase] ${n} Monte Carlo run${n === 1 ? '' : 's'} interrupted by the restart marked failed`);
  } catch (err) {
    console.error('[haulcase] could not mark interrupted Monte Carlo runs:', err);
  }
}

/** With PostgreSQL: take Monte Carlo runs from the job queue (HAULCASE_MC_MAX_RUNNING at once). */
export async function startRunWorkers(): Promise<void> {
  if (!env().DATABASE_URL) return;
  try {
    const q = queueBackendFromEnv();
    await q.startWorkers();
    console.log(`[haulcase] taking Monte Carlo runs from the job queue as ${q.server} (${env().HAULCASE_MC_MAX_RUNNING} at once)`);
  } catch (err) {
    console.error('[haulcase] the Monte Carlo job queue did not start (runs stay queued until a server takes them):', err);
  }
}
