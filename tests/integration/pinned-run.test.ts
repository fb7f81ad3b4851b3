/**
 * The pinned Monte Carlo run of a case on SQLite and PostgreSQL: migration
 * 0014 (the column, its foreign key, and that adding and dropping it keeps
 * every row that references the cases), and `fetchPinnedRun`.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { fetchPinnedRun } from '@/lib/risk/runs';
import { MEASURE_LABELS } from '@/lib/risk/measures';
import { createTestDb, userIds } from '../support/test-db';
import { insertDemoCase } from '../support/demo-case';

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

/** A summary whose figures are easy to recognise: every field the same number. */
function summary(x: number) {
  return { count: 10, mean: x, sd: 1, min: x - 5, max: x + 5, p5: x - 4, p10: x - 3, p50: x + 0.5, p90: x + 3, p95: x + 4, probNegative: 0.25, histogram: [], runningMean: [] };
}

async function insertRun(k: Knex, o: { id: string; workspaceId: number; caseId: number; userId: number | null; status?: string; spec?: object; withProposal?: boolean }) {
  const result = {
    iterations: 10,
    trucks: [],
    fleet: { deltaNpv: summary(100), bestNpv: summary(200), ...(o.withProposal === false ? {} : { proposalNpv: summary(300) }) },
  };
  await k('monte_carlo_runs').insert({
    id: o.id, workspaceId: o.workspaceId, caseId: o.caseId, status: o.status ?? 'done', iterations: 10, done: 10,
    spec: JSON.stringify(o.spec ?? { iterations: 10, seed: 7, sampleFailures: true, distributions: [], measure: 'proposal' }),
    result: (o.status ?? 'done') === 'done' ? JSON.stringify(result) : null,
    createdBy: o.userId, createdAt: '2026-12-01T10:00:00.000Z', finishedAt: '2026-12-01T10:00:05.000Z',
  });
}

describe.each(backends)('pinned Monte Carlo run on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  let caseId: number;
  let workspaceId: number;

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
    caseId = await insertDemoCase(k, WS);
    workspaceId = (await k('workspaces').where({ slug: WS }).first('id')).id;
  });
  afterAll(async () => destroy());

  it('keeps every run, event and revision when 0014 is rolled back and applied again', async () => {
    const analyst = ids['analyst@aldervane.test'];
    await insertRun(k, { id: 'keep-1', workspaceId, caseId, userId: analyst });
    const revision = await insertDemoCase(k, WS, 'A revision');
    await k('business_cases').where({ id: revision }).update({ revisionOf: caseId });
    await k('case_events').insert({ workspaceId, caseId, userId: analyst, action: 'comment', comment: 'kept', at: '2026-12-01T10:00:00.000Z' });
    const counts = async () => ({
      runs: Number((await k('monte_carlo_runs').count({ n: '*' }))[0].n),
      events: Number((await k('case_events').count({ n: '*' }))[0].n),
      revisionOf: (await k('business_cases').where({ id: revision }).first('revisionOf')).revisionOf,
    });
    const before = await counts();
    expect(before.runs).toBeGreaterThanOrEqual(1);
    await k.migrate.down({ name: '0014_pinned_run' }); // 0014 only (later migrations stay)
    expect(await k.schema.hasColumn('business_cases', 'pinnedRunId')).toBe(false);
    expect(await counts()).toEqual(before);
    await k.migrate.latest();
    expect(await k.schema.hasColumn('business_cases', 'pinnedRunId')).toBe(true);
    expect(await counts()).toEqual(before);
    // the column refers to a run: an unknown id is refused by the database
    await expect(k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'no-such-run' })).rejects.toThrow(/foreign key/i);
  });

  it('answers null with no pinned run, then the pinned finished run with its settings, author, times and summary', async () => {
    expect(await fetchPinnedRun(caseId, k)).toBeNull();
    const analyst = ids['analyst@aldervane.test'];
    const spec = { iterations: 10, seed: 4242, sampleFailures: false, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'uniform', min: 0.9, max: 1.3 } }], measure: 'proposal' };
    await insertRun(k, { id: 'pin-1', workspaceId, caseId, userId: analyst, spec });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'pin-1' });
    const user = await k('users').where({ id: analyst }).first('name', 'email');
    const p = await fetchPinnedRun(caseId, k);
    expect(p).toEqual({
      id: 'pin-1', caseId, spec, iterations: 10, seed: 4242, sampleFailures: false, distributions: spec.distributions,
      measure: { kind: 'proposal', label: MEASURE_LABELS.proposal },
      author: { id: analyst, name: user.name, email: user.email },
      startedAt: '2026-12-01T10:00:00.000Z', finishedAt: '2026-12-01T10:00:05.000Z',
      // the proposal's figure (300 in the stored result), not repower-everything's (100) or the best mix's (200)
      summary: { mean: 300, p10: 297, p50: 300.5, p90: 303, probLoss: 0.25 },
    });
  });

  it('reads an older run on the measure it was made for (repower every truck) and ignores an unfinished one', async () => {
    await insertRun(k, { id: 'old-1', workspaceId, caseId, userId: null, spec: { iterations: 10, seed: 1, sampleFailures: true, distributions: [] }, withProposal: false });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'old-1' });
    const p = await fetchPinnedRun(caseId, k);
    expect(p?.measure).toEqual({ kind: 'fleet-delta', label: MEASURE_LABELS['fleet-delta'] });
    expect(p?.summary.mean).toBe(100);
    expect(p?.author).toBeNull();
    await insertRun(k, { id: 'failed-1', workspaceId, caseId, userId: null, status: 'failed' });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'failed-1' });
    expect(await fetchPinnedRun(caseId, k)).toBeNull();
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: null });
  });
});
