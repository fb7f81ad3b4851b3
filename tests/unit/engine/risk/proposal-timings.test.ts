/**
 * The proposal metric with the fleet programme's timings (lib/engine/sensitivity/metric.ts):
 * a repowered truck with a timing is valued at that option's npv, at the base and as the
 * drivers move, and the touched-trucks evaluator still equals the whole case re-evaluated.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateCase } from '@/lib/engine';
import { makeEvaluator, makeFullEvaluator, type Metric } from '@/lib/engine/sensitivity';
import { timingOption, truckSetupOf, type TimingSpec } from '@/lib/engine/timing';
import { evaluateCase } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';

const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
const v = validateCase(raw);
if (!v.ok) throw new Error('demo invalid');
const demo = v.value;

describe('the proposal metric with timings', () => {
  const ids = demo.trucks.map((t) => t.id);
  const policies = Object.fromEntries(ids.map((id, i) => [id, i % 3 === 0 ? 'repower' : i % 3 === 1 ? 'keep' : 'rebuild'] as const));
  const timings: Record<string, TimingSpec> = { [ids[0]]: { kind: 'event', k: 1, delayMonths: 3 }, [ids[3]]: { kind: 'event', k: 2, delayMonths: 0 }, [ids[6]]: { kind: 'now', k: 0, delayMonths: 0 } };
  const metric: Metric = { kind: 'proposal', policies, timings };

  it('at the base: Σ npv(policy, the timed option for timed trucks) − npv(rebuild), summed by hand from the engine parts', () => {
    const r = evaluateCase(demo);
    let sum = 0;
    r.trucks.forEach((t) => {
      const p = policies[t.id];
      const npv = timings[t.id] ? timingOption(truckSetupOf(demo, t.id), timings[t.id]).npv : t.options[p].npv;
      sum += npv - t.options.rebuild.npv;
    });
    expect(makeEvaluator(demo, metric).baseValue).toBeCloseTo(sum, 4);
    // the timing matters: without it the figure differs
    expect(Math.abs(makeEvaluator(demo, { kind: 'proposal', policies }).baseValue - sum)).toBeGreaterThan(1);
  });

  it('moving drivers: the touched-trucks evaluator equals the whole case re-evaluated, timed trucks included', () => {
    const fast = makeEvaluator(demo, metric);
    const full = makeFullEvaluator(demo, metric);
    const offer = demo.trucks[0].repowerOfferId;
    const cases = [
      [[{ key: 'fuelPrice' }, demo.assumptions.fuelPrice * 1.2]],
      [[{ key: 'modulePrice', target: offer }, 2_000_000]],
      [[{ key: 'loadFactor', target: ids[3] }, 0.6]],
      [[{ key: 'loadFactor', target: ids[1] }, 0.6]],
    ] as const;
    for (const o of cases) expect(fast.at(o as never)).toBeCloseTo(full.at(o as never), 6);
  });
});
