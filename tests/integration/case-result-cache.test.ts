import { afterAll, beforeAll, beforeEach, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { POST as createCase } from '@/app/api/workspaces/[workspace]/cases/route';
import { PATCH as patchCase } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { GET as getResult } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { evaluateStoredCase } from '@/lib/cases/evaluate';
import { clearResultCache, resultCacheStats } from '@/lib/cases/result-cache';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('the case result cache on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let users: Record<string, number> = {};
  let wsId: number;
  let caseId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    users = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const set = await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id');
    const trucks = await k('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').select('id');
    signInAs(users['analyst@aldervane.test']);
    const r = await call(createCase, { workspace: WS }, { body: { name: 'Cache check', assumptionSetId: set.id, selection: trucks.map((t) => ({ truckId: t.id, repowerOfferId: null })) } });
    expect(r.status).toBe(201);
    caseId = r.body.case.id;
  });
  afterAll(async () => destroy());
  beforeEach(() => {
    clearResultCache();
    signInAs(users['viewer@aldervane.test']);
  });

  const get = (headers: Record<string, string> = {}) => call(getResult, { workspace: WS, id: String(caseId) }, { headers });

  it('answers with an ETag, evaluates once, and 304 when the client already has the answer', async () => {
    const first = await get();
    expect(first.status).toBe(200);
    const etag = first.response.headers.get('etag')!;
    expect(etag).toMatch(/^"[0-9a-f]{64}"$/);
    expect(first.response.headers.get('cache-control')).toBe('private, no-cache');
    expect(resultCacheStats()).toMatchObject({ hits: 0, misses: 1, entries: 1 });
    const again = await get();
    expect(again.status).toBe(200);
    expect(again.response.headers.get('etag')).toBe(etag);
    expect(again.body).toEqual(first.body);
    expect(resultCacheStats()).toMatchObject({ hits: 1, misses: 1 });
    const revalidated = await get({ 'if-none-match': etag });
    expect(revalidated.status).toBe(304);
    expect(revalidated.body).toBe('');
    expect(revalidated.response.headers.get('etag')).toBe(etag);
    // a weak form of the tag and a list of tags match too; another tag does not
    expect((await get({ 'if-none-match': `"nope", W/${etag}` })).status).toBe(304);
    expect((await get({ 'if-none-match': '"0000"' })).status).toBe(200);
  });

  it('leaves each policy\'s by-year breakdown out of the route, and keeps it for the server\'s own readers', async () => {
    const r = await get();
    for (const t of r.body.result.trucks) for (const p of ['keep', 'rebuild', 'repower']) {
      expect(t.options[p]).not.toHaveProperty('breakdown');
      expect(t.options[p].cashFlows).toHaveLength(t.horizonYears + 1);
    }
    const access = await requireMember(WS, CAN.read);
    const full = await evaluateStoredCase(access, caseId);
    expect(full.result.trucks[0].options.repower.breakdown).toHaveLength(full.result.trucks[0].horizonYears + 1);
    expect(full.result.trucks.map((t) => t.options.repower.npv)).toEqual(r.body.result.trucks.map((t: { options: { repower: { npv: number } } }) => t.options.repower.npv));
    // the route's answer and the full evaluation came from one cached evaluation
    expect(resultCacheStats()).toMatchObject({ misses: 1, hits: 1 });
    expect(JSON.stringify(r.body).length).toBeLessThan(JSON.stringify(full).length * 0.7);
  });

  it('misses, and answers the new figures, after a write to the case, a truck, the assumptions or the workspace settings', async () => {
    const base = await get();
    const etags = new Set([base.response.headers.get('etag')]);
    const unit = base.body.result.trucks[0].id as string;
    const npvOf = (b: typeof base.body) => b.result.trucks.find((t: { id: string }) => t.id === unit).options.rebuild.npv as number;

    // the case itself (a rename moves its version)
    signInAs(users['analyst@aldervane.test']);
    const renamed = await call(patchCase, { workspace: WS, id: String(caseId) }, { method: 'PATCH', body: { version: base.body.case.version, name: 'Cache check, renamed' } });
    expect(renamed.status).toBe(200);
    signInAs(users['viewer@aldervane.test']);
    const afterRename = await get();
    expect(afterRename.body.case.name).toBe('Cache check, renamed');
    etags.add(afterRename.response.headers.get('etag'));

    // a truck in the register
    const truck = await k('trucks').where({ workspaceId: wsId, unitNumber: unit }).first('id', 'engineHours', 'version');
    await k('trucks').where({ id: truck.id }).update({ engineHours: Number(truck.engineHours) + 5000, version: truck.version + 1 });
    const afterTruck = await get();
    expect(npvOf(afterTruck.body)).not.toBeCloseTo(npvOf(afterRename.body), 0);
    expect((await get({ 'if-none-match': afterRename.response.headers.get('etag')! })).status).toBe(200);
    etags.add(afterTruck.response.headers.get('etag'));

    // the assumption set
    const set = await k('assumption_sets').where({ id: base.body.case.assumptionSetId }).first('id', 'assumptions', 'version');
    const values = JSON.parse(set.assumptions);
    await k('assumption_sets').where({ id: set.id }).update({ assumptions: JSON.stringify({ ...values, fuelPrice: values.fuelPrice * 1.2 }), version: set.version + 1 });
    const afterSet = await get();
    expect(npvOf(afterSet.body)).toBeLessThan(npvOf(afterTruck.body));
    etags.add(afterSet.response.headers.get('etag'));

    // the workspace's negative-number style
    const ws = await k('workspaces').where({ id: wsId }).first('settings');
    const settings = typeof ws.settings === 'string' ? JSON.parse(ws.settings) : ws.settings;
    const other = settings.negativeStyle === 'minus' ? 'parentheses' : 'minus';
    await k('workspaces').where({ id: wsId }).update({ settings: JSON.stringify({ ...settings, negativeStyle: other }) });
    const afterSettings = await get();
    expect(afterSettings.body.negativeStyle).toBe(other);
    etags.add(afterSettings.response.headers.get('etag'));

    expect(etags.size).toBe(5);
    // five evaluations; the stale-tag request after the truck write was answered from the new entry
    expect(resultCacheStats()).toMatchObject({ hits: 1, misses: 5 });
  });

  it('keeps at most 16 evaluations, the least recently used going first', async () => {
    // 17 distinct answers: each name is a different key
    for (let i = 0; i < 17; i++) {
      await k('business_cases').where({ id: caseId }).update({ name: `Cache check ${i}` });
      expect((await get()).status).toBe(200);
    }
    expect(resultCacheStats()).toMatchObject({ misses: 17, entries: 16 });
  });

  it('does not cache a case that cannot be evaluated', async () => {
    const row = await k('business_cases').where({ id: caseId }).first('assumptionSetId');
    await k('business_cases').where({ id: caseId }).update({ assumptionSetId: null });
    try {
      const r = await get();
      expect(r.status).toBe(422);
      expect(r.response.headers.get('etag')).toBeNull();
      expect(resultCacheStats()).toMatchObject({ entries: 0 });
    } finally {
      await k('business_cases').where({ id: caseId }).update({ assumptionSetId: row.assumptionSetId });
    }
  });
});
