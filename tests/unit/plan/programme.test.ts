import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BUDGET_STEP, budgetCuts, greedyStart, loadHighs, programmeLp, solveProgramme, type ProgrammeInput, type ProgrammeOption, type ProgrammeTruck } from '@/lib/plan/programme';

/** Every assignment (one option per truck) enumerated: the best Σ npv within every budget and month capacity; null if none fits. */
function bruteForce(input: ProgrammeInput): number | null {
  const { trucks, budgets, capacity } = input;
  let best: number | null = null;
  const pick = new Array<number>(trucks.length).fill(0);
  const walk = (t: number) => {
    if (t === trucks.length) {
      const spend = budgets.map(() => 0);
      const swaps = capacity.map(() => 0);
      let v = 0;
      trucks.forEach((tr, i) => {
        const o = tr.options[pick[i]];
        v += o.npv;
        o.capitalByYear.forEach((c, y) => { if (y < spend.length) spend[y] += c; });
        if (o.month !== null && o.month < swaps.length) swaps[o.month] += 1;
      });
      const fits = budgets.every((b, y) => b === null || spend[y] <= b + 1e-6) && capacity.every((c, m) => swaps[m] <= c);
      if (fits && (best === null || v > best)) best = v;
      return;
    }
    for (let o = 0; o < trucks[t].options.length; o++) {
      pick[t] = o;
      walk(t + 1);
    }
  };
  walk(0);
  return best;
}

const MONTHS = 4;
const YEARS = 2;
const option = (i: number) =>
  fc.record({
    month: fc.option(fc.integer({ min: 0, max: MONTHS - 1 }), { nil: null }),
    npv: fc.integer({ min: -40_000, max: 0 }).map((k) => k * 1000),
    capital: fc.integer({ min: 0, max: 3000 }).map((k) => k * 1000),
  }).map((o): ProgrammeOption => ({
    key: `o${i}`, label: `option ${i}`, month: o.month, delayMonths: 0, npv: o.npv,
    // the swap's capital falls in the fiscal year of its month (months 0–1: year 0, 2–3: year 1); no swap, no capital
    capitalByYear: [0, 1].map((y) => (o.month !== null && Math.floor(o.month / 2) === y ? o.capital : 0)),
  }));
const truck = (t: number) =>
  fc.integer({ min: 1, max: 3 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => option(i))))
    .map((options): ProgrammeTruck => ({ id: `T${t}`, options }));
const fleet = fc.integer({ min: 1, max: 6 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, t) => truck(t))));
const budgets = fc.tuple(...Array.from({ length: YEARS }, () => fc.option(fc.integer({ min: 0, max: 8000 }).map((k) => k * 1000), { nil: null })));
const capacity = fc.tuple(...Array.from({ length: MONTHS }, () => fc.integer({ min: 0, max: 3 })));

describe('fleet programme (MILP)', () => {
  it('finds the same optimum as enumerating every assignment, on random small fleets (up to 6 trucks × 3 options × 4 months)', async () => {
    const highs = await loadHighs();
    await fc.assert(
      fc.asyncProperty(fleet, budgets, capacity, async (trucks, b, c) => {
        const input: ProgrammeInput = { trucks, budgets: b, capacity: c, marginals: false };
        const exact = bruteForce(input);
        const r = await solveProgramme(input, highs);
        if (exact === null) {
          expect(r.ok).toBe(false);
          expect(r.message).toMatch(/No plan fits/);
          return;
        }
        expect(r.ok).toBe(true);
        expect(r.objective).toBeCloseTo(exact, 3);
        // the plan reported meets its limits
        r.capitalByYear.forEach((s, y) => { if (b[y] !== null) expect(s).toBeLessThanOrEqual((b[y] as number) + 1e-6); });
        c.forEach((cap, m) => expect(r.swapsByMonth[m] ?? 0).toBeLessThanOrEqual(cap));
      }),
      { numRuns: 150 },
    );
  }, 120_000); // 150 random fleets, each solved and enumerated: seconds on a shared machine

  it('answers the greedy-by-profitability-index counterexample exactly', async () => {
    // Budget 10 M in one year. A has the best PI (gain 7.2 M on 6 M: 2.2) but blocks B + C (5.5 M on 5 M each: 2.1),
    // together worth 11 M. Greedy by PI takes A alone (7.2 M); the optimum is B + C.
    const swap = (id: string, capital: number, gain: number): ProgrammeTruck => ({
      id,
      options: [
        { key: 'rebuild', label: 'rebuild', month: null, delayMonths: 0, npv: -20e6, capitalByYear: [0] },
        { key: 'now', label: 'repower now', month: 0, delayMonths: 0, npv: -20e6 + gain, capitalByYear: [capital] },
      ],
    });
    const r = await solveProgramme({ trucks: [swap('A', 6e6, 7.2e6), swap('B', 5e6, 5.5e6), swap('C', 5e6, 5.5e6)], budgets: [10e6], capacity: [] });
    expect(r.ok).toBe(true);
    expect(r.choices.map((c) => c.option.key)).toEqual(['rebuild', 'now', 'now']);
    expect(r.objective).toBeCloseTo(-60e6 + 11e6, 3);
    expect(r.status).toBe('optimal');
    expect(r.gap).toBeLessThanOrEqual(1e-9);
    // A gives up its 7.2 M gain for lack of budget
    expect(r.choices[0].cost).toBeCloseTo(7.2e6, 3);
  });

  it('relaxing a binding budget or month by the reported amount gives the reported gain', async () => {
    const highs = await loadHighs();
    await fc.assert(
      fc.asyncProperty(fleet, budgets, capacity, async (trucks, b, c) => {
        const input: ProgrammeInput = { trucks, budgets: b, capacity: c };
        const r = await solveProgramme(input, highs);
        if (!r.ok) return;
        for (const k of r.binding) {
          const relaxed: ProgrammeInput = k.kind === 'budget'
            ? { ...input, budgets: b.map((v, y) => (y === k.index ? (v as number) + k.relaxBy : v)) }
            : { ...input, capacity: c.map((v, m) => (m === k.index ? v + k.relaxBy : v)) };
          expect(k.relaxBy).toBe(k.kind === 'budget' ? BUDGET_STEP : 1);
          const exact = bruteForce(relaxed) as number;
          expect(exact - r.objective).toBeCloseTo(k.gain, 3);
        }
      }),
      { numRuns: 60 },
    );
  }, 120_000);

  it('puts no swap in a month whose capacity is 0, and values the month', async () => {
    const t = (id: string, gainNow: number): ProgrammeTruck => ({
      id,
      options: [
        { key: 'k1', label: 'repower at overhaul', month: 0, delayMonths: 0, npv: -10e6 + gainNow, capitalByYear: [1e6] },
        { key: 'k1+d1', label: 'repower at overhaul, 1 month late', month: 1, delayMonths: 1, npv: -10e6 + gainNow - 50_000, capitalByYear: [1e6] },
        { key: 'rebuild', label: 'rebuild', month: null, delayMonths: 0, npv: -10e6, capitalByYear: [0] },
      ],
    });
    const r = await solveProgramme({ trucks: [t('A', 400_000), t('B', 300_000)], budgets: [null], capacity: [0, 1] });
    expect(r.ok).toBe(true);
    expect(r.swapsByMonth[0]).toBe(0);
    // one truck takes the delayed slot (A: its gain is larger), the other rebuilds
    expect(r.choices.map((c) => c.option.key)).toEqual(['k1+d1', 'rebuild']);
    expect(r.choices[0].forcedDelay).toBe(true);
    expect(r.choices[0].cost).toBeCloseTo(50_000, 3);
    // reopening month 1 (shutdown) for one swap: A swaps on time (+50 k); month 2 +1: B swaps a month late (+250 k)
    const m0 = r.binding.find((k) => k.kind === 'capacity' && k.index === 0);
    const m1 = r.binding.find((k) => k.kind === 'capacity' && k.index === 1);
    expect(m0?.gain).toBeCloseTo(300_000, 3); // B on time in month 1, A keeps the delayed slot: 300 k
    expect(m1?.gain).toBeCloseTo(250_000, 3);
  });

  it('stops at its time limit with the best plan so far and its gap, or says it found none', async () => {
    // 40 trucks × 5 options over 6 months, tight budgets: a millisecond is seldom enough to prove the optimum
    const next = (() => { let a = 7; return () => ((a = (a * 16807) % 2147483647) / 2147483647); })();
    const trucks: ProgrammeTruck[] = Array.from({ length: 40 }, (_, t) => ({
      id: `T${t}`,
      options: [
        { key: 'rebuild', label: 'rebuild', month: null, delayMonths: 0, npv: -10e6, capitalByYear: [0, 0] },
        ...Array.from({ length: 4 }, (_, i) => {
          const month = Math.floor(next() * 6);
          return { key: `s${i}`, label: `swap ${i}`, month, delayMonths: i, npv: -10e6 + Math.round(next() * 2e6), capitalByYear: [0, 1].map((y) => (Math.floor(month / 3) === y ? 1e6 + Math.round(next() * 1e6) : 0)) };
        }),
      ],
    }));
    const budgets = [8e6, 8e6];
    const capacity = [3, 3, 0, 3, 3, 3];
    const r = await solveProgramme({ trucks, budgets, capacity, timeLimitSeconds: 1e-3, marginals: false });
    expect(['optimal', 'time limit']).toContain(r.status);
    if (r.ok) {
      expect(r.gap).toBeGreaterThanOrEqual(0);
      r.capitalByYear.forEach((sp, y) => expect(sp).toBeLessThanOrEqual(budgets[y] + 1e-6));
      capacity.forEach((cap, m) => expect(r.swapsByMonth[m] ?? 0).toBeLessThanOrEqual(cap));
    } else {
      expect(r.message).toMatch(/stopped without a plan \(time limit\)/);
    }
  }, 120_000);

  it('adds budget rows that keep every plan within the budget and cut fractional ones (one, two or three swap prices)', () => {
    // two prices 2.49 M and 1.89 M, budget 12 M: whole plans (n1, n2) with 2.49·n1 + 1.89·n2 ≤ 12 are enumerated
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 5, max: 40 }).map((k) => k * 100_000), { minLength: 1, maxLength: 3 }),
        fc.integer({ min: 0, max: 200 }).map((k) => k * 100_000),
        (prices, budget) => {
          // 8 options of each price (more than any budget here allows)
          const amounts = prices.flatMap((p) => new Array<number>(8).fill(p));
          const cuts = budgetCuts(amounts, budget);
          expect(cuts.length).toBeGreaterThan(0);
          const counts = (pick: number[]) => pick.reduce((s, n, i) => s + n * prices[i], 0);
          const lhs = (cut: ReturnType<typeof budgetCuts>[number], pick: number[]) => pick.reduce((s, n, i) => s + n * cut.coef(prices[i]), 0);
          const walk = (i: number, pick: number[]) => {
            if (i === prices.length) {
              if (counts(pick) <= budget) for (const cut of cuts) expect(lhs(cut, pick)).toBeLessThanOrEqual(cut.rhs);
              return;
            }
            for (let n = 0; n <= 8; n++) walk(i + 1, [...pick, n]);
          };
          walk(0, []);
        },
      ),
      { numRuns: 60 },
    );
    // the hull of 2.49 M / 1.89 M within 12 M (six options of each): n1 ≤ 4, n2 ≤ 6, and the fractional point (4.82, 0) of the budget row alone is cut
    const six = (p: number) => new Array<number>(6).fill(p);
    const cuts = budgetCuts([...six(2.49e6), ...six(1.89e6)], 12e6);
    expect(cuts.some((c) => c.coef(2.49e6) * 4.82 > c.rhs)).toBe(true);
    expect(cuts.find((c) => c.coef(2.49e6) === 1 && c.coef(1.89e6) === 0)?.rhs).toBe(4);
    expect(cuts.find((c) => c.coef(2.49e6) === 0 && c.coef(1.89e6) === 1)?.rhs).toBe(6);
    // a budget far above the prices: the rows stop at the options there are (and are built at once)
    const wide = budgetCuts([3, 3, 2], 1e12);
    expect(wide.find((c) => c.coef(3) === 1 && c.coef(2) === 0)?.rhs).toBe(2);
    expect(wide.find((c) => c.coef(3) === 0 && c.coef(2) === 1)?.rhs).toBe(1);
  });

  it('finds the same optimum as enumerating every assignment when swaps cost one of two prices (the tightened budget rows)', async () => {
    const highs = await loadHighs();
    const priced = (i: number) =>
      fc.record({ month: fc.option(fc.integer({ min: 0, max: MONTHS - 1 }), { nil: null }), npv: fc.integer({ min: -40_000, max: 0 }), cheap: fc.boolean() })
        .map((o): ProgrammeOption => ({
          key: `o${i}`, label: `option ${i}`, month: o.month, delayMonths: 0, npv: o.npv * 1000,
          capitalByYear: [0, 1].map((y) => (o.month !== null && Math.floor(o.month / 2) === y ? (o.cheap ? 1.89e6 : 2.49e6) : 0)),
        }));
    const pricedTruck = (t: number) =>
      fc.integer({ min: 1, max: 3 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => priced(i))))
        .map((options): ProgrammeTruck => ({ id: `T${t}`, options }));
    const pricedFleet = fc.integer({ min: 1, max: 6 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, t) => pricedTruck(t))));
    const tight = fc.tuple(...Array.from({ length: YEARS }, () => fc.option(fc.integer({ min: 0, max: 80 }).map((k) => k * 100_000), { nil: null })));
    await fc.assert(
      fc.asyncProperty(pricedFleet, tight, capacity, async (trucks, b, c) => {
        const input: ProgrammeInput = { trucks, budgets: b, capacity: c, marginals: false };
        const exact = bruteForce(input);
        const r = await solveProgramme(input, highs);
        if (exact === null) {
          expect(r.ok).toBe(false);
          return;
        }
        expect(r.ok).toBe(true);
        expect(r.objective).toBeCloseTo(exact, 3);
      }),
      { numRuns: 150 },
    );
  }, 120_000);

  it('starts the solver from a greedy plan that takes one option per truck and fits every budget and month, never better than the optimum', async () => {
    const highs = await loadHighs();
    let started = 0;
    await fc.assert(
      fc.asyncProperty(fleet, budgets, capacity, async (trucks, b, c) => {
        const input: ProgrammeInput = { trucks, budgets: b, capacity: c, marginals: false };
        const built = programmeLp(input);
        const x = greedyStart(input, built);
        if (x === null) return;
        started++;
        const spend = b.map(() => 0);
        const swaps = c.map(() => 0);
        const per = trucks.map(() => 0);
        let value = 0;
        x.forEach((v, col) => {
          expect(v === 0 || v === 1).toBe(true);
          if (v === 0) return;
          const o = trucks[built.truckOf[col]].options[built.optionOf[col]];
          per[built.truckOf[col]] += 1;
          value += o.npv;
          o.capitalByYear.forEach((a, y) => { if (y < spend.length) spend[y] += a; });
          if (o.month !== null && o.month < swaps.length) swaps[o.month] += 1;
        });
        expect(per.every((n) => n === 1)).toBe(true);
        b.forEach((v, y) => { if (v !== null) expect(spend[y]).toBeLessThanOrEqual(v); });
        c.forEach((v, m) => expect(swaps[m]).toBeLessThanOrEqual(v));
        const r = await solveProgramme(input, highs);
        expect(r.ok).toBe(true);
        expect(value).toBeLessThanOrEqual(r.objective + 1e-6);
      }),
      { numRuns: 100 },
    );
    expect(started).toBeGreaterThan(10);
  }, 120_000);

  it('says why in plain words when the input is empty or cannot be met', async () => {
    expect((await solveProgramme({ trucks: [], budgets: [], capacity: [] })).message).toMatch(/no trucks/i);
    const only = (month: number): ProgrammeTruck => ({ id: 'T1', options: [{ key: 'now', label: 'now', month, delayMonths: 0, npv: -1, capitalByYear: [0] }] });
    const r = await solveProgramme({ trucks: [only(0)], budgets: [], capacity: [0] });
    expect(r.ok).toBe(false);
    expect(r.message).toMatch(/truck 1 \(T1\) has no option that fits/);
    const bad = await solveProgramme({ trucks: [only(0)], budgets: [], capacity: [1.5] });
    expect(bad.message).toMatch(/capacity of month 1 must be a whole number/);
  });

  it('writes indices, never truck ids or labels, into the LP text', () => {
    const lp = programmeLp({
      trucks: [{ id: 'T1\nEnd\nx0 >= 2', options: [{ key: 'a', label: 'Subject To: evil', month: 0, delayMonths: 0, npv: -1, capitalByYear: [5] }] }],
      budgets: [10], capacity: [1],
    }).text;
    expect(lp).not.toMatch(/evil|T1/);
    expect(lp.split('\n').filter((l) => l === 'End')).toHaveLength(1);
  });
});
