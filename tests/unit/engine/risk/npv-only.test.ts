/**
 * The lean NPV-only path gives exactly the npvs of evaluateCase (same code,
 * same order of arithmetic), on the demo mine and a synthetic fleet, on the
 * median path and with a failure-age provider.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, evaluateNpvs, fleetBestNpv, POLICIES, sampleWeibullAge } from '@/lib/engine';
import type { FailureAgeContext } from '@/lib/engine';
import { syntheticFleet } from '@/bench/support/synthetic-fleet';

const demo = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8'));
const oneTruck = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/one-truck.json'), 'utf8'));

function expectSame(c: typeof demo, failureAge?: (ctx: FailureAgeContext) => number) {
  const full = evaluateCase(c, { failureAge });
  const lean = evaluateNpvs(c, { failureAge });
  expect(lean.truckIds).toEqual(full.trucks.map((t) => t.id));
  full.trucks.forEach((t, i) => {
    for (const p of POLICIES) expect(lean[p][i]).toBe(t.options[p].npv);
    expect(lean.best[i]).toBe(t.best);
  });
  expect(fleetBestNpv(lean)).toBe(full.fleet.npv.best);
}

describe('evaluateNpvs (the NPV-only path)', () => {
  it('equals evaluateCase npv for npv on the one-truck scenario and the demo mine', () => {
    expectSame(oneTruck);
    expectSame(demo);
  });

  it('equals evaluateCase on a synthetic fleet of 100 trucks', () => {
    expectSame(syntheticFleet(demo, 100));
  });

  it('equals evaluateCase with sampled failure ages (same provider)', () => {
    // a deterministic provider: a fixed quantile per life, so both paths see the same ages
    const provider = (ctx: FailureAgeContext) => {
      const e = demo.engines.find((x: { id: string }) => x.id === ctx.engineId);
      return sampleWeibullAge(((ctx.lifeIndex * 0.37 + 0.11) % 1) || 0.5, e.weibullShape, e.weibullScaleHours, ctx.startAge);
    };
    expectSame(demo, provider);
  });

  it('refuses an invalid case with its problems, like evaluateCase', () => {
    const bad = { ...demo, assumptions: { ...demo.assumptions, taxRate: 1.5 } };
    expect(() => evaluateNpvs(bad)).toThrow(/taxRate/);
  });
});
