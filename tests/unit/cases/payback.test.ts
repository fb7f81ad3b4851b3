import { describe, expect, it } from 'vitest';
import { paybackBlankReason, paybackHold, paybackWarning } from '@/lib/cases/payback';

// Expected values worked by hand from the definition in lib/cases/payback.ts (common practice:
// payback is the first time the running sum of the flows comes back to zero, linear within the year).
describe('paybackHold', () => {
  it('flags a payback that falls below zero again (the worked example)', () => {
    // cum = −1000, −400, 200, −100, −400, 100; payback 1 + 400/600
    const h = paybackHold([-1000, 600, 600, -300, -300, 500]);
    expect(h.kind).toBe('falls-back');
    if (h.kind !== 'falls-back') return;
    expect(h.at).toBeCloseTo(1 + 400 / 600, 9);
    expect(h.below).toEqual([{ from: 3, to: 4 }]);
    expect(h.endsBelow).toBe(false);
    expect(paybackWarning(h)).toBe('Pays back in year 1.7 but falls below zero again in years 3–4');
  });

  it('counts from the spend year and names a single year and an end below zero', () => {
    // spend in year 2: cum from there −100, −50, 10, −5; payback (4 − 2 − 1) + 50/60 = 1.833 → year 3.8
    const h = paybackHold([0, 0, -100, 50, 60, -15]);
    expect(h).toEqual({ kind: 'falls-back', at: 1 + 50 / 60, start: 2, below: [{ from: 5, to: 5 }], endsBelow: true });
    expect(paybackWarning(h)).toBe('Pays back in year 3.8 but falls below zero again in year 5, and ends below zero');
  });

  it('lists several dips', () => {
    // cum = −10, 1, −1, 2, −3, 1; payback 0 + 10/11 = 0.9
    const h = paybackHold([-10, 11, -2, 3, -5, 4]);
    expect(h.kind === 'falls-back' && h.below).toEqual([{ from: 2, to: 2 }, { from: 4, to: 4 }]);
    expect(paybackWarning(h)).toBe('Pays back in year 0.9 but falls below zero again in years 2 and 4');
  });

  it('holds when the running sum stays at or above zero', () => {
    // the engine's own example: [−1000, 400, 400, 400] pays back in 2.5 years
    const h = paybackHold([-1000, 400, 400, 400]);
    expect(h).toEqual({ kind: 'holds', at: 2.5, start: 0 });
    expect(paybackWarning(h)).toBeNull();
    expect(paybackBlankReason(h)).toBeNull();
  });

  it('treats a tiny negative running sum (below 1e-6) as zero', () => {
    expect(paybackHold([-100, 100, -1e-7]).kind).toBe('holds');
  });

  it('says "no investment" when nothing is spent first', () => {
    expect(paybackHold([0, 0, 0]).kind).toBe('no-investment');
    expect(paybackHold([50, -10, 20]).kind).toBe('no-investment');
    expect(paybackBlankReason(paybackHold([50, -10]))).toMatch(/^no investment/);
  });

  it('says "never" when the sum never comes back', () => {
    const h = paybackHold([-100, 10, 10]);
    expect(h.kind).toBe('never');
    expect(paybackBlankReason(h)).toMatch(/does not pay back/);
  });
});
