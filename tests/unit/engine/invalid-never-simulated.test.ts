/**
 * A case that fails validation never reaches the simulation: the simulation
 * module is wrapped in a spy and must not be called.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it, vi } from 'vitest';

vi.mock('@/lib/engine/simulate', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/engine/simulate')>();
  return { ...actual, simulatePolicy: vi.fn(actual.simulatePolicy) };
});

const { evaluateCase, evaluateCaseDetailed } = await import('@/lib/engine');
const { simulatePolicy } = await import('@/lib/engine/simulate');
const spy = vi.mocked(simulatePolicy);

const base = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));

/** one way to break a valid case */
const breakers: ((c: typeof base) => void)[] = [
  (c) => (c.assumptions.discountRate = -0.995),
  (c) => (c.assumptions.taxRate = 1.2),
  (c) => (c.engines[0].weibullScaleHours = 0),
  (c) => (c.engines[1].serviceIntervalHours = -250),
  (c) => (c.trucks[0].annualHours = 0),
  (c) => (c.trucks[0].engineId = 'missing'),
  (c) => (c.repowerOffers[0].modulePrice = -1),
  (c) => c.engines.push(structuredClone(c.engines[0])),
  (c) => delete c.assumptions.fuelPrice,
  (c) => (c.assumptions.lubePrice = Number.NaN),
];

describe('validation gate', () => {
  it('the spy sees the simulation of a valid case', () => {
    spy.mockClear();
    evaluateCase(base);
    expect(spy).toHaveBeenCalledTimes(3);
  });

  it('no invalid case reaches the simulation', () => {
    fc.assert(
      fc.property(fc.subarray(breakers, { minLength: 1 }), (chosen) => {
        spy.mockClear();
        const c = structuredClone(base);
        for (const b of chosen) b(c);
        expect(() => evaluateCase(c)).toThrow(/invalid case/);
        expect(() => evaluateCaseDetailed(c)).toThrow(/invalid case/);
        expect(spy).not.toHaveBeenCalled();
      }),
      { numRuns: 100 },
    );
  });
});
