import 'server-only';
/**
 * What a server does about Monte Carlo runs when it starts (instrumentation.ts):
 * runs left `running` by the process before it are failed, with the reason.
 */
import { failInterruptedRuns } from './runs';

export async function markInterruptedRuns(): Promise<void> {
  try {
    const n = await failInterruptedRuns();
    if (n > 0) console.log(`[haulcase] ${n} Monte Carlo run${n === 1 ? '' : 's'} interrupted by the restart marked failed`);
  } catch (err) {
    console.error('[haulcase] could not mark interrupted Monte Carlo runs:', err);
  }
}
