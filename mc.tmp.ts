import { readFileSync } from 'node:fs';
import { validateCase } from '@/lib/engine';
import { runIterations } from '@/lib/engine/monte-carlo';
import { syntheticFleet } from '@/bench/support/synthetic-fleet';
const v = validateCase(syntheticFleet(JSON.parse(readFileSync('scenarios/aldervane-north-pit.json', 'utf8')), 100)); if (!v.ok) throw 1;
const spec = { iterations: 300, seed: 1, sampleFailures: true, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'triangular' as const, min: 0.85, mode: 1.05, max: 1.4 } }] };
runIterations(v.value, spec, 0, 50);
const t0 = performance.now(); runIterations(v.value, spec, 0, 300); const ms = (performance.now() - t0) / 300;
console.log(ms.toFixed(3), 'ms/iteration →', (ms * 10000 / 1000).toFixed(1), 's for 10k single thread');
