import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import Papa from 'papaparse';
import { useDbForTests } from '@/lib/db';
import { GET as compare } from '@/app/api/workspaces/[workspace]/cases/compare/route';
import { GET as result } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { userIds } from './support/cases';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('comparing two cases through the API on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let a: number;
  let b: number;
  const get = (query: string) => call(compare, { workspace: WS }, { url: `http://127.0.0.1/api/workspaces/${WS}/cases/compare?${query}` });

  const draft = async (name: string, truckIds: number[], setName: string): Promise<number> => {
    const set = await k('assumption_sets').where({ workspaceId: wsId, name: setName }).first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases')
      .insert({ workspaceId: wsId, name, assumptionSetId: set.id, selection: JSON.stringify(truckIds.map((truckId) => ({ truckId, repowerOfferId: null }))), plan: '{}', status: 'draft', createdAt: now, updatedAt: now })
      .returning('id');
    return typeof row === 'object' ? row.id : row;
  };

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const trucks = await k('trucks').where({ workspaceId: wsId }).orderBy('id').limit(3).pluck('id');
    a = await draft('Compare base', trucks.slice(0, 2), 'Base');
    b = await draft('Compare high fuel', trucks, 'High fuel');
  });
  afterAll(async () => destroy());

  it('lets a viewer read what changed: the fuel price, the added truck, and each result as the case page shows it', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const res = await get(`a=${a}&b=${b}`);
    expect(res.status).toBe(200);
    expect(res.body.a).toMatchObject({ id: a, name: 'Compare base' });
    const fuel = res.body.inputs.find((c: { field: string }) => c.field === 'fuelPrice');
    // the demo sets: Base 1.05, High fuel 1.35 per litre (scenarios/aldervane-assumption-sets.json)
    expect(fuel).toMatchObject({ label: 'Fuel price', a: 1.05, b: 1.35 });
    expect(res.body.inputs.filter((c: { field: string }) => c.field === 'present')).toMatchObject([{ section: 'Truck', a: null, b: 'yes' }]);
    // figures are those of each case's own results page
    const ra = (await call(result, { workspace: WS, id: String(a) })).body;
    const rb = (await call(result, { workspace: WS, id: String(b) })).body;
    const fleetRepower = res.body.results.find((r: { scope: string; measure: string }) => r.scope === 'Fleet' && r.measure === 'NPV repower');
    expect(fleetRepower).toMatchObject({ a: ra.result.fleet.npv.repower, b: rb.result.fleet.npv.repower });
  });

  it('downloads the same as CSV', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const res = await get(`a=${a}&b=${b}&format=csv`);
    expect(res.status).toBe(200);
    expect(res.response.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.response.headers.get('content-disposition')).toMatch(/^attachment; filename="compare-Compare-base-Compare-high-fuel\.csv"$/);
    const rows = Papa.parse<string[]>((res.body as string).trim()).data;
    expect(rows.some((r) => r[3] === 'Fuel price' && r[5] === '1.05' && r[6] === '1.35')).toBe(true);
  });

  it('answers 422 naming a or b for missing, malformed or equal ids, and for an unknown format', async () => {
    signInAs(ids['viewer@aldervane.test']);
    expect((await get(`b=${b}`)).body.problems).toEqual([{ path: 'a', message: 'choose case A' }]);
    expect((await get(`a=${a}&b=x1`)).body.problems).toEqual([{ path: 'b', message: 'must be a case id (a positive whole number)' }]);
    const same = await get(`a=${a}&b=${a}`);
    expect(same.status).toBe(422);
    expect(same.body.problems).toEqual([{ path: 'b', message: 'choose a different case from case A' }]);
    expect((await get(`a=${a}&b=${b}&format=pdf`)).body.problems).toEqual([{ path: 'format', message: 'must be json or csv' }]);
  });

  it('answers 404 for a case of another workspace, and 422 with b. paths for a case that cannot be evaluated', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const other = await k('workspaces').whereNot({ id: wsId }).first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases').insert({ workspaceId: other.id, name: 'Elsewhere', assumptionSetId: null, selection: '[]', plan: '{}', status: 'draft', createdAt: now, updatedAt: now }).returning('id');
    const foreign = typeof row === 'object' ? row.id : row;
    const notHere = await get(`a=${a}&b=${foreign}`);
    expect(notHere.status).toBe(404);
    expect(notHere.body.error ?? notHere.body.message).toMatch(/^Case B: /);
    const broken = await draft('Broken', [999_999], 'Base');
    const res = await get(`a=${a}&b=${broken}`);
    expect(res.status).toBe(422);
    expect(res.body.problems).toEqual([{ path: 'b.selection[0]', message: 'this truck has been removed from the fleet register' }]);
  });

  it('refuses a signed-out caller', async () => {
    signInAs(null);
    expect((await get(`a=${a}&b=${b}`)).status).toBe(401);
  });
});
