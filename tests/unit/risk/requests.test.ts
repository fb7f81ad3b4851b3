/**
 * Request checks of the risk endpoints that need a case: a Monte Carlo run
 * too large for the server to hold, and driver values outside their range.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateCase } from '@/lib/engine';
import { HttpError } from '@/lib/http';
import { checkMonteCarlo, MAX_TRUCK_ITERATIONS, runTornado } from '@/lib/risk/requests';
import { syntheticFleet } from '@/bench/support/synthetic-fleet';

const demo = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/aldervane-north-pit.json'), 'utf8'));
const v = validateCase(syntheticFleet(demo, 100));
if (!v.ok) throw new Error('synthetic fleet invalid');
const fleet = v.value;

function problemsOf(fn: () => unknown) {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(HttpError);
    expect((err as HttpError).status).toBe(422);
    return (err as HttpError).problems ?? [];
  }
  throw new Error('expected a 422');
}

describe('risk request checks', () => {
  it('refuses a Monte Carlo run of more iterations × trucks than the server holds, saying the most it takes', () => {
    const problems = problemsOf(() => checkMonteCarlo(fleet, { iterations: 50_000, seed: 1, sampleFailures: true, distributions: [], measure: 'proposal' }));
    expect(problems).toEqual([{ path: 'iterations', message: expect.stringContaining(`at most ${(MAX_TRUCK_ITERATIONS / 100).toLocaleString('en-US')} for 100 trucks`) }]);
    expect(() => checkMonteCarlo(fleet, { iterations: 10_000, seed: 1, sampleFailures: true, distributions: [], measure: 'proposal' })).not.toThrow();
  });

  it('refuses tornado ranges outside a driver\'s valid range, with their paths', () => {
    const problems = problemsOf(() =>
      runTornado(fleet, null, { metric: { kind: 'fleet-best' }, relative: 0.2, ranges: { loadFactor: { low: 0.4, high: 1.2 }, 'lifeHours@ac-2600-legacy': { low: 10, high: 30000 } } }),
    );
    expect(problems.map((p) => p.path)).toEqual(['ranges.loadFactor', 'ranges.lifeHours@ac-2600-legacy.low']);
  });
});
