import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { POST as createCase } from '@/app/api/workspaces/[workspace]/cases/route';
import { GET as getCase, PATCH as patchCase } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { OTHER, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

/** What the case page's settings form sends: every setting at once, with the version it loaded. */
describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('case settings saved from the case page on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let caseId: string;
  let trucks: number[];
  let offers: number[];
  let sets: Record<string, number>;
  const as = (role: string) => signInAs(ids[`${role}@aldervane.test`]);
  const patch = (body: unknown) => call(patchCase, { workspace: WS, id: caseId }, { method: 'PATCH', body });
  const read = async () => (await call(getCase, { workspace: WS, id: caseId })).body;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    const ws = (await k('workspaces').where({ slug: WS }).first('id')).id;
    trucks = (await k('trucks').where({ workspaceId: ws }).orderBy('unitNumber').select('id')).map((r) => r.id);
    offers = (await k('repower_offers').where({ workspaceId: ws }).orderBy('key').select('id')).map((r) => r.id);
    sets = Object.fromEntries((await k('assumption_sets').where({ workspaceId: ws }).select('id', 'name')).map((r) => [r.name, r.id]));
    as('analyst');
    const r = await call(createCase, { workspace: WS }, { body: { name: 'Settings', assumptionSetId: sets.Base, selection: trucks.map((truckId) => ({ truckId, repowerOfferId: null })) } });
    caseId = String(r.body.case.id);
  });
  afterAll(async () => destroy());

  it('changes name, assumption set, trucks and an offer in one audited update', async () => {
    as('analyst');
    const selection = [{ truckId: trucks[0], repowerOfferId: offers[1] }, { truckId: trucks[5], repowerOfferId: null }];
    const r = await patch({ version: 1, name: 'Settings, high fuel', assumptionSetId: sets['High fuel'], selection });
    expect(r.status).toBe(200);
    expect(r.body.case).toMatchObject({ name: 'Settings, high fuel', assumptionSetName: 'High fuel', truckCount: 2, version: 2 });
    expect((await read()).selection).toEqual(selection);
    const audit = await k('audit_log').where({ entity: 'business_case', entityId: caseId, action: 'update' });
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0].after)).toMatchObject({ name: 'Settings, high fuel', assumptionSetId: sets['High fuel'], selection });
  });

  it("refuses another workspace's offer and set with each problem's path, and an empty selection, changing nothing", async () => {
    const otherWs = (await k('workspaces').where({ slug: OTHER }).first('id')).id;
    const foreignSet = await k('assumption_sets').where({ workspaceId: otherWs }).first('id');
    const before = await read();
    as('analyst');
    const r = await patch({
      version: 2, name: 'x', ...(foreignSet ? { assumptionSetId: foreignSet.id } : {}),
      selection: [{ truckId: trucks[0], repowerOfferId: null }, { truckId: trucks[1], repowerOfferId: 999999 }],
    });
    expect(r.status).toBe(422);
    expect(r.body.problems).toContainEqual({ path: 'selection[1].repowerOfferId', message: 'is not a repower offer of this workspace' });
    if (foreignSet) expect(r.body.problems).toContainEqual({ path: 'assumptionSetId', message: 'is not an assumption set of this workspace' });
    const empty = await patch({ version: 2, selection: [] });
    expect(empty.status).toBe(422);
    expect(empty.body.problems).toEqual([{ path: 'selection', message: 'choose at least one truck' }]);
    expect(await read()).toEqual(before);
  });

  it('answers 409 to the version loaded before, and 403 to a viewer', async () => {
    as('analyst');
    const stale = await patch({ version: 1, name: 'late' });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toBe('Someone else changed this since you loaded it. Reload and try again.');
    as('viewer');
    expect((await patch({ version: 2, name: 'viewer' })).status).toBe(403);
    as('analyst');
    expect((await read()).case).toMatchObject({ name: 'Settings, high fuel', version: 2 });
  });
});
