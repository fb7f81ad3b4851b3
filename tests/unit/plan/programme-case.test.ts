import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { planProgramme } from '@/lib/plan/programme-case';
import type { CaseFileInput } from '@/lib/validation/case';

const demo = JSON.parse(readFileSync(path.join(process.cwd(), 'scenarios', 'aldervane-north-pit.json'), 'utf8')) as CaseFileInput;

describe('the programme of a case', () => {
  it('values every truck’s timing options and plans the demo case within its budgets and shop months', async () => {
    const budgets = [6e6, 6e6, null];
    const capacity = [1, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1];
    const p = await planProgramme(demo, { budgets, capacity, maxK: 2, maxDelayMonths: 2 });
    expect(p.result.ok).toBe(true);
    expect(p.result.status).toBe('optimal');
    expect(p.result.choices).toHaveLength(demo.trucks.length);
    // the shutdown month gets no swap; no month more than its capacity
    expect(p.result.swapsByMonth[1] ?? 0).toBe(0);
    capacity.forEach((c, m) => expect(p.result.swapsByMonth[m] ?? 0).toBeLessThanOrEqual(c));
    p.byFiscalYear.forEach((y, i) => { if (budgets[i] !== null) expect(y.plannedCapital).toBeLessThanOrEqual(budgets[i] as number + 1e-6); });
    // every chosen option is one of its truck's options, and no choice beats the truck's best
    p.result.choices.forEach((c, i) => {
      expect(p.options[i].options.map((o) => o.key)).toContain(c.option.key);
      expect(c.cost).toBeGreaterThanOrEqual(0);
    });
    // with no limits at all each truck takes its own best option
    const free = await planProgramme(demo, { budgets: [null], capacity: [], maxK: 2, maxDelayMonths: 2 });
    free.result.choices.forEach((c) => expect(c.cost).toBe(0));
    expect(free.result.objective).toBeGreaterThanOrEqual(p.result.objective);
  }, 120_000); // valuing ~20 options for each of 24 trucks and solving: a few seconds on a shared machine
});
