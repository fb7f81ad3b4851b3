import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as trucksRoute from '@/app/api/workspaces/[workspace]/trucks/route';
import * as truckRoute from '@/app/api/workspaces/[workspace]/trucks/[id]/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { snapshotWorkspace, truckBody, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const del = (id: number, version = 1) =>
  call(truckRoute.DELETE, { workspace: WS, id: String(id) }, { method: 'DELETE', url: `http://127.0.0.1/api/test?version=${version}` });

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('deleting trucks that business cases name on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let engineId: number;
  let setId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    engineId = (await k('engine_types').where({ workspaceId: wsId }).orderBy('id').first('id')).id;
    setId = (await k('assumption_sets').where({ workspaceId: wsId }).orderBy('id').first('id')).id;
  });
  afterAll(async () => destroy());

  const newTruck = async (unit: string): Promise<number> => {
    signInAs(ids['analyst@aldervane.test']);
    const r = await call(trucksRoute.POST, { workspace: WS }, { body: truckBody(unit, engineId) });
    expect(r.status).toBe(201);
    return r.body.id;
  };
  const caseNaming = async (name: string, truckId: number, status: string, frozenCase: string | null = null) => {
    const now = new Date().toISOString();
    await k('business_cases').insert({ workspaceId: wsId, name, assumptionSetId: setId, selection: JSON.stringify([{ truckId, repowerOfferId: null }]), plan: '{}', status, frozenCase, createdAt: now, updatedAt: now });
  };

  it('refuses (409) while a draft, returned or submitted case names the truck, listing the cases, and deletes nothing', async () => {
    const truckId = await newTruck('DEL-1');
    await caseNaming('Draft naming DEL-1', truckId, 'draft');
    await caseNaming('Returned naming DEL-1', truckId, 'returned');
    await caseNaming('Submitted naming DEL-1', truckId, 'submitted');
    const before = await snapshotWorkspace(k, WS);
    const r = await del(truckId);
    expect(r.status).toBe(409);
    expect(r.body.error).toBe('This truck is still named by 3 business case(s) (“Draft naming DEL-1”, “Returned naming DEL-1”, “Submitted naming DEL-1”); take it out of them first. Nothing was deleted.');
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
    expect(await k('trucks').where({ id: truckId }).first('id')).toBeTruthy();
  });

  it('refuses a truck of the seeded demo case, and names the one case among many', async () => {
    const demo = await k('business_cases').where({ workspaceId: wsId, name: 'North Pit fleet — base assumptions' }).first('selection');
    const seeded = await k('trucks').where({ id: JSON.parse(demo.selection)[5].truckId }).first('id', 'version');
    signInAs(ids['admin@aldervane.test']);
    const before = await snapshotWorkspace(k, WS);
    const r = await del(seeded.id, seeded.version);
    expect(r.status).toBe(409);
    expect(r.body.error).toBe('This truck is still named by 1 business case(s) (“North Pit fleet — base assumptions”); take it out of them first. Nothing was deleted.');
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });

  it('allows the delete once only approved (frozen) or rejected cases name the truck, and audits it', async () => {
    const truckId = await newTruck('DEL-2');
    await caseNaming('Approved naming DEL-2', truckId, 'approved', '{}');
    await caseNaming('Rejected naming DEL-2', truckId, 'rejected');
    expect((await del(truckId)).status).toBe(204);
    expect(await k('trucks').where({ id: truckId }).first('id')).toBeUndefined();
    expect(await k('audit_log').where({ entity: 'truck', entityId: String(truckId), action: 'delete' })).toHaveLength(1);
  });
});
