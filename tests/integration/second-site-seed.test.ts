import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { GET as getWorkspace } from '@/app/api/workspaces/[workspace]/route';
import { GET as listCases } from '@/app/api/workspaces/[workspace]/cases/route';
import { GET as getResult } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { GET as listTrucks } from '@/app/api/workspaces/[workspace]/trucks/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

// SQLite only: the seed is portable Knex (it runs on PostgreSQL in every other integration file's set-up).
describe('the second demo site has a fleet of its own', () => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb());
    useDbForTests(k);
    ids = await userIds(k);
  });
  afterAll(async () => destroy());

  it('holds 7 trucks, 2 engine types, 1 offer, 1 assumption set and 1 draft case; the first site is as before', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const corrin = await call(getWorkspace, { workspace: 'corrin-flats' });
    expect(corrin.status).toBe(200);
    expect(corrin.body.workspace.currency).toBe('AUD');
    expect(corrin.body.counts).toEqual({ trucks: 7, engines: 2, offers: 1, assumptionSets: 1, cases: 1 });
    const first = await call(getWorkspace, { workspace: 'aldervane-north-pit' });
    // the first site: the draft demo case and the approved case its readings are held against
    expect(first.body.counts).toEqual({ trucks: 24, engines: 4, offers: 2, assumptionSets: 4, cases: 2 });

    const trucks = (await call(listTrucks, { workspace: 'corrin-flats' })).body.items as Array<{ unitNumber: string }>;
    expect(trucks.map((t) => t.unitNumber)).toEqual(['CF-101', 'CF-102', 'CF-103', 'CF-104', 'CF-105', 'CF-106', 'CF-107']);
    // nothing of the second site shows in the first
    const firstTrucks = (await call(listTrucks, { workspace: 'aldervane-north-pit' })).body.items as Array<{ unitNumber: string }>;
    expect(firstTrucks.some((t) => t.unitNumber.startsWith('CF-'))).toBe(false);
  });

  it('its draft case evaluates: every truck gets a best policy', async () => {
    signInAs(ids['admin@corrin.test']);
    const cases = await call(listCases, { workspace: 'corrin-flats' });
    expect(cases.status).toBe(200);
    const [c] = cases.body.cases;
    expect(c).toMatchObject({ name: 'Corrin Flats haul fleet — base', status: 'draft' });
    const r = await call(getResult, { workspace: 'corrin-flats', id: String(c.id) });
    expect(r.status).toBe(200);
    const trucks = r.body.result.trucks as Array<{ truckId: string; best: string }>;
    expect(trucks).toHaveLength(7);
    for (const t of trucks) expect(['keep', 'rebuild', 'repower']).toContain(t.best);
  });
});
