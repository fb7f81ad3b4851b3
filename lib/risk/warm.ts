import 'server-only';
/**
 * Warms the Monte Carlo workers when the server starts (instrumentation.ts):
 * two threads run a short Monte Carlo of the demo scenario and stay in the
 * pool, so the first run a user starts does not pay for starting threads and
 * compiling the engine (about half a second on a 2-core machine). Off with
 * HAULCASE_MC_PREWARM=0; a missing worker bundle or scenario only means the
 * first run starts cold.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { validateCase } from '@/lib/validation/case';
import { workerBundlePath } from './jobs';
import { prewarm } from './pool';
import { env } from '@/lib/env';

export async function warmMonteCarloWorkers(): Promise<void> {
  if (env().HAULCASE_MC_PREWARM === '0') return;
  try {
    // read and checked synchronously, so the warm-up is registered before this returns to the event loop:
    // a run that starts right after start-up then finds it, stops it and takes its workers
    const raw = JSON.parse(readFileSync(path.join(process.cwd(), 'scenarios', 'aldervane-north-pit.json'), 'utf8'));
    const v = validateCase(raw);
    if (!v.ok) throw new Error('the warm-up scenario is not a valid case');
    const t0 = performance.now();
    await prewarm(workerBundlePath(), v.value, { workers: env().HAULCASE_MC_WORKERS });
    console.log(`[haulcase] Monte Carlo workers warmed in ${Math.round(performance.now() - t0)} ms`);
  } catch (err) {
    console.error('[haulcase] Monte Carlo warm-up skipped:', err instanceof Error ? err.message : err);
  }
}
