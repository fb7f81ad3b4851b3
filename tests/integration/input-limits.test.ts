/**
 * Issue 12 through the route handlers: an engine the server could not
 * evaluate (weibullShape 0.01, a life of 0.001 h) is refused by the engines
 * API with 422; the case-file upload and business-case names follow the
 * register's text rule (no leading =, +, - or @); nothing is saved on refusal.
 */
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as enginesRoute from '@/app/api/workspaces/[workspace]/engines/route';
import * as engineRoute from '@/app/api/workspaces/[workspace]/engines/[id]/route';
import * as caseFile from '@/app/api/workspaces/[workspace]/case-file/route';
import * as casesRoute from '@/app/api/workspaces/[workspace]/cases/route';
import * as caseRoute from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import * as copyRoute from '@/app/api/workspaces/[workspace]/cases/[id]/copy/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { engineBody, snapshotWorkspace, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const FORMULA = 'must not start with =, +, - or @ (a spreadsheet would read it as a formula)';

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('input limits through the API on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let setId: number;
  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    setId = (await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id')).id;
  });
  afterAll(async () => destroy());
  const analyst = () => signInAs(ids['analyst@aldervane.test']);

  it.each([
    ['weibullShape', 0.01, 'must be at least 0.5'],
    ['lifeHours', 0.001, 'must be at least 500 hours'],
    ['weibullScaleHours', 5e-324, 'must be at least 500 hours'],
  ])('refuses an engine with %s = %s (422, nothing saved), on create and on update', async (field, value, message) => {
    analyst();
    const before = await snapshotWorkspace(k, WS);
    const created = await call(enginesRoute.POST, { workspace: WS }, { body: { ...engineBody('runaway'), [field]: value } });
    expect(created.status).toBe(422);
    expect(created.body.problems).toContainEqual({ path: field, message });
    const row = await k('engine_types').where({ workspaceId: wsId }).orderBy('id').first('id', 'version');
    const updated = await call(engineRoute.PUT, { workspace: WS, id: String(row.id) }, { method: 'PUT', body: { ...engineBody('runaway'), [field]: value, version: row.version } });
    expect(updated.status).toBe(422);
    expect(updated.body.problems).toContainEqual({ path: field, message });
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });

  it('refuses a case file whose name or ids start like a formula, naming each, and saves nothing', async () => {
    analyst();
    const dl = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    const before = await snapshotWorkspace(k, WS);
    const bad = structuredClone(dl.body);
    bad.name = '=HYPERLINK("http://x")';
    const oldEngine = bad.engines[0].id;
    bad.engines[0].id = '+cmd';
    for (const o of bad.repowerOffers) if (o.engineId === oldEngine) o.engineId = '+cmd';
    for (const t of bad.trucks) if (t.engineId === oldEngine) t.engineId = '+cmd';
    const oldOffer = bad.repowerOffers[0].id;
    bad.repowerOffers[0].id = '-1';
    for (const t of bad.trucks) if (t.repowerOfferId === oldOffer) t.repowerOfferId = '-1';
    bad.trucks[0].id = '@T1';
    bad.trucks[1].id = ' T2';
    const r = await call(caseFile.POST, { workspace: WS }, { body: bad });
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([
      { path: 'name', message: FORMULA },
      { path: 'engines[0].id', message: FORMULA },
      { path: 'repowerOffers[0].id', message: FORMULA },
      { path: 'trucks[0].id', message: FORMULA },
      { path: 'trucks[1].id', message: 'must not start or end with spaces' },
    ]);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });

  it('accepts a case file with a UTF-8 BOM, as the command line does', async () => {
    analyst();
    const dl = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    const r = await call(caseFile.POST, { workspace: WS }, { body: `\uFEFF${JSON.stringify(dl.body)}` });
    expect(r.status).toBe(200);
  });

  it('refuses a business-case name that starts like a formula on create, rename and copy', async () => {
    analyst();
    const trucks = await k('trucks').where({ workspaceId: wsId }).orderBy('id').limit(2).select('id');
    const selection = trucks.map((t) => ({ truckId: t.id, repowerOfferId: null }));
    const bad = await call(casesRoute.POST, { workspace: WS }, { body: { name: '@SUM(A1)', assumptionSetId: setId, selection } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems).toEqual([{ path: 'name', message: FORMULA }]);
    const ok = await call(casesRoute.POST, { workspace: WS }, { body: { name: 'Limits case', assumptionSetId: setId, selection } });
    expect(ok.status).toBe(201);
    const id = String(ok.body.case.id);
    const rename = await call(caseRoute.PATCH, { workspace: WS, id }, { method: 'PATCH', body: { version: ok.body.case.version, name: '-1+1' } });
    expect(rename.status).toBe(422);
    expect(rename.body.problems).toEqual([{ path: 'name', message: FORMULA }]);
    const copy = await call(copyRoute.POST, { workspace: WS, id }, { body: { name: '=1+1' } });
    expect(copy.status).toBe(422);
    const stored = await k('business_cases').where({ workspaceId: wsId }).whereIn('name', ['@SUM(A1)', '-1+1', '=1+1']).select('id');
    expect(stored).toEqual([]);
  });
});
