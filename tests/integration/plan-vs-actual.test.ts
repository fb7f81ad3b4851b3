import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { GET as getActuals } from '@/app/api/workspaces/[workspace]/cases/[id]/actuals/route';
import { PATCH as patchSettings } from '@/app/api/workspaces/[workspace]/settings/route';
import { verifyFrozen } from '@/lib/approvals/canonical';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { OTHER, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('plan against actual on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let approvedId: number;
  let draftId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    const wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    approvedId = (await k('business_cases').where({ workspaceId: wsId, status: 'approved' }).first('id')).id;
    draftId = (await k('business_cases').where({ workspaceId: wsId, status: 'draft' }).first('id')).id;
  });
  afterAll(async () => destroy());

  it('the demo has an approved case whose frozen record verifies, and 24 months of readings after its approval', async () => {
    const row = await k('business_cases').where({ id: approvedId }).first();
    expect(verifyFrozen(row)).toBe(true);
    expect(row.decidedAt.slice(0, 7)).toBe('2024-11');
    signInAs(ids['viewer@aldervane.test']);
    const r = await call(getActuals, { workspace: WS, id: String(approvedId) });
    expect(r.status).toBe(200);
    expect(r.body.figures.fleetMonths).toHaveLength(24);
    expect(r.body.figures.fleetMonths[0].month).toBe('2024-12');
    expect(r.body.latestMonth).toBe('2026-11');
    expect(r.body.tolerancePercent).toBe(5);
    // T3-05 burns about 8 % over the case and is the only truck flagged for burn; T3-14's repower came seven months late
    const t5 = r.body.figures.trucks.find((t: { unit: string }) => t.unit === 'T3-05');
    expect(t5.burnVariance).toBeGreaterThan(0.07);
    expect(t5.burnVariance).toBeLessThan(0.09);
    expect(t5.flags).toContain('burn');
    const burnFlagged = r.body.figures.trucks.filter((t: { flags: string[] }) => t.flags.includes('burn')).map((t: { unit: string }) => t.unit);
    expect(burnFlagged).toEqual(['T3-05']);
    const t14 = r.body.figures.trucks.find((t: { unit: string }) => t.unit === 'T3-14');
    const spent = t14.months.filter((m: { capital: number }) => m.capital > 0).map((m: { month: string }) => m.month);
    expect(spent).toEqual(['2025-07']);
  });

  it('the tolerance is the workspace setting (0.1 to 100 %), and a wider one clears the flag', async () => {
    signInAs(ids['admin@aldervane.test']);
    const bad = await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { actualsTolerancePercent: 0 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0]).toMatchObject({ path: 'actualsTolerancePercent', message: 'must be at least 0.1 %' });
    expect((await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { actualsTolerancePercent: 10 } })).status).toBe(200);
    const r = await call(getActuals, { workspace: WS, id: String(approvedId) });
    expect(r.body.tolerancePercent).toBe(10);
    expect(r.body.figures.trucks.find((t: { unit: string }) => t.unit === 'T3-05').flags).not.toContain('burn');
    expect((await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { actualsTolerancePercent: 5 } })).status).toBe(200);
  });

  it('404 with a plain message for an unknown or unapproved case; other workspaces are closed; signed out is 401', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const unknown = await call(getActuals, { workspace: WS, id: '999999' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error).toBe('No such business case in this workspace.');
    const junk = await call(getActuals, { workspace: WS, id: 'abc' });
    expect(junk.status).toBe(404);
    const draft = await call(getActuals, { workspace: WS, id: String(draftId) });
    expect(draft.status).toBe(404);
    expect(draft.body.error).toMatch(/^This case is not approved/);
    expect((await call(getActuals, { workspace: OTHER, id: String(approvedId) })).status).toBe(403);
    signInAs(null);
    expect((await call(getActuals, { workspace: WS, id: String(approvedId) })).status).toBe(401);
  });
});
