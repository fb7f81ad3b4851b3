/**
 * The case/1 fields of MODEL.md sections 3, 5 and 11 through everything that
 * stores a case: migration 0013, the register's routes (offers, assumption
 * sets), the case built from the database, the case-file upload and download.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { validateCase } from '@/lib/validation/case';
import * as offersRoute from '@/app/api/workspaces/[workspace]/offers/route';
import * as offerRoute from '@/app/api/workspaces/[workspace]/offers/[id]/route';
import * as setsRoute from '@/app/api/workspaces/[workspace]/assumption-sets/route';
import * as setRoute from '@/app/api/workspaces/[workspace]/assumption-sets/[id]/route';
import * as caseFileRoute from '@/app/api/workspaces/[workspace]/case-file/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { assumptions, offerBody, setBody, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const scenario = JSON.parse(fs.readFileSync(path.resolve('scenarios/aldervane-north-pit.json'), 'utf8'));

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('valuation, lostMarginShare and failedCoreCredit on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let wsId = 0;
  let engineId = 0;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    const ids = await userIds(k);
    signInAs(ids['analyst@aldervane.test']);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    engineId = (await k('engine_types').where({ workspaceId: wsId }).orderBy('id').first('id')).id;
  });
  afterAll(async () => destroy());

  it('seeds the demo with the fields of the scenario files', async () => {
    const offers = await k('repower_offers').where({ workspaceId: wsId }).orderBy('key').select('key', 'coreCredit', 'failedCoreCredit');
    expect(offers.map((o) => [o.key, Number(o.failedCoreCredit)])).toEqual([['brannock-bd2000', 50000], ['kestrel-km2700', 70000]]);
    for (const o of offers) expect(Number(o.failedCoreCredit)).toBeLessThan(Number(o.coreCredit));
    const sets = await k('assumption_sets').where({ workspaceId: wsId }).select('valuation', 'lostMarginShare', 'assumptions');
    for (const s of sets) {
      expect([s.valuation, Number(s.lostMarginShare)]).toEqual(['expected', 1]);
      expect(JSON.parse(s.assumptions)).not.toHaveProperty('valuation');
    }
  });

  it('creates and updates an offer with a failed core credit, and clears it back to the core credit', async () => {
    const created = await call(offersRoute.POST, { workspace: WS }, { body: { ...offerBody('vf-offer', engineId), failedCoreCredit: 40000 } });
    expect(created.status).toBe(201);
    expect(created.body.failedCoreCredit).toBe(40000);
    const id = String(created.body.id);
    const updated = await call(offerRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...offerBody('vf-offer', engineId), failedCoreCredit: 55000, version: 1 } });
    expect(updated.status).toBe(200);
    expect(updated.body.failedCoreCredit).toBe(55000);
    const cleared = await call(offerRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...offerBody('vf-offer', engineId), failedCoreCredit: null, version: 2 } });
    expect(cleared.status).toBe(200);
    expect(cleared.body.failedCoreCredit).toBeNull();
    const omitted = await call(offerRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...offerBody('vf-offer', engineId), failedCoreCredit: 1000, version: 3 } });
    expect(omitted.status).toBe(200);
    const again = await call(offerRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...offerBody('vf-offer', engineId), version: 4 } });
    expect(again.body.failedCoreCredit).toBeNull(); // a form without the field means "the core credit"
  });

  it('refuses a failed core credit above module price + install cost (422 on the field, nothing saved)', async () => {
    const r = await call(offersRoute.POST, { workspace: WS }, { body: { ...offerBody('vf-bad', engineId), failedCoreCredit: 1_640_001 } });
    expect(r.status).toBe(422);
    expect(r.body.problems.map((p: { path: string }) => p.path)).toEqual(['failedCoreCredit']);
    expect(await k('repower_offers').where({ workspaceId: wsId, key: 'vf-bad' }).first()).toBeUndefined();
  });

  it('creates and updates an assumption set with a valuation and a lost-margin share, stored in their columns', async () => {
    const created = await call(setsRoute.POST, { workspace: WS }, { body: { ...setBody('VF set'), assumptions: { ...assumptions, valuation: 'median-path', lostMarginShare: 0.5 } } });
    expect(created.status).toBe(201);
    expect(created.body.assumptions).toMatchObject({ valuation: 'median-path', lostMarginShare: 0.5 });
    expect(created.body.valuation).toBeUndefined();
    const id = String(created.body.id);
    const row = await k('assumption_sets').where({ id: created.body.id }).first();
    expect([row.valuation, Number(row.lostMarginShare)]).toEqual(['median-path', 0.5]);
    expect(JSON.parse(row.assumptions)).not.toHaveProperty('lostMarginShare');
    const updated = await call(setRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...setBody('VF set'), assumptions: { ...assumptions, valuation: 'expected', lostMarginShare: 0 }, version: 1 } });
    expect(updated.status).toBe(200);
    expect(updated.body.assumptions).toMatchObject({ valuation: 'expected', lostMarginShare: 0 });
    const defaulted = await call(setRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...setBody('VF set'), version: 2 } });
    expect(defaulted.body.assumptions).toMatchObject({ valuation: 'expected', lostMarginShare: 1 });
    const bad = await call(setRoute.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...setBody('VF set'), assumptions: { ...assumptions, valuation: 'mean', lostMarginShare: 1.5 }, version: 3 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['assumptions.lostMarginShare', 'assumptions.valuation']);
  });

  it('builds a case from the database that carries the fields (an offer without a failed core credit leaves it out)', async () => {
    const set = await k('assumption_sets').where({ workspaceId: wsId, name: 'VF set' }).first('id');
    await k('assumption_sets').where({ id: set.id }).update({ valuation: 'median-path', lostMarginShare: 0.6 });
    const built = await buildCaseFile(wsId, { name: 'VF', assumptionSetId: set.id, includeAll: true }, k);
    expect(built.assumptions).toMatchObject({ valuation: 'median-path', lostMarginShare: 0.6 });
    const byId = Object.fromEntries(built.repowerOffers.map((o) => [o.id, o]));
    expect(byId['kestrel-km2700']).toMatchObject({ coreCredit: 120000, failedCoreCredit: 70000 });
    expect(byId['vf-offer']).not.toHaveProperty('failedCoreCredit');
    expect(validateCase(built).ok).toBe(true);
  });

  it('downloads the fields in the case file and stores them from an upload', async () => {
    const base = await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id');
    const down = await call(caseFileRoute.GET, { workspace: WS }, { url: `http://127.0.0.1/api/test?assumptionSetId=${base.id}` });
    expect(down.status).toBe(200);
    expect(down.body.assumptions).toMatchObject({ valuation: 'expected', lostMarginShare: 1 });
    expect(down.body.repowerOffers.find((o: { id: string }) => o.id === 'brannock-bd2000').failedCoreCredit).toBe(50000);

    const upload = structuredClone(scenario);
    upload.name = 'Uploaded VF';
    upload.assumptions = { ...upload.assumptions, valuation: 'median-path', lostMarginShare: 0.25 };
    upload.repowerOffers[0].failedCoreCredit = 33000; // kestrel-km2700
    delete upload.repowerOffers[1].failedCoreCredit; // brannock-bd2000: back to its core credit
    const up = await call(caseFileRoute.POST, { workspace: WS }, { body: upload });
    expect(up.status).toBe(200);
    const set = await k('assumption_sets').where({ workspaceId: wsId, name: 'Uploaded VF' }).first();
    expect([set.valuation, Number(set.lostMarginShare)]).toEqual(['median-path', 0.25]);
    const offers = Object.fromEntries((await k('repower_offers').where({ workspaceId: wsId }).select('key', 'failedCoreCredit')).map((o) => [o.key, o.failedCoreCredit]));
    expect(Number(offers['kestrel-km2700'])).toBe(33000);
    expect(offers['brannock-bd2000']).toBeNull();
    const again = await call(caseFileRoute.GET, { workspace: WS }, { url: `http://127.0.0.1/api/test?assumptionSetId=${set.id}` });
    expect(again.body.assumptions).toMatchObject({ valuation: 'median-path', lostMarginShare: 0.25 });
    expect(again.body.repowerOffers.find((o: { id: string }) => o.id === 'brannock-bd2000')).not.toHaveProperty('failedCoreCredit');
  });

  it('migration 0013 moves JSON-held values into the columns, and its down() puts them back', async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    try {
      // back to just before 0013 (later migrations first, one at a time)
      const done = async () => ((await t.k.migrate.list())[0] as Array<string | { name: string }>).map((m) => (typeof m === 'string' ? m : m.name));
      while ((await done()).includes('0013_valuation_fields')) await t.k.migrate.down();
      const ws = (await t.k('workspaces').where({ slug: WS }).first('id')).id;
      const set = await t.k('assumption_sets').where({ workspaceId: ws, name: 'Base' }).first();
      expect(JSON.parse(set.assumptions)).toMatchObject({ valuation: 'expected', lostMarginShare: 1 });
      expect(set).not.toHaveProperty('valuation');
      expect(await t.k('repower_offers').first()).not.toHaveProperty('failedCoreCredit');
      // a set saved by the code before 0013: the two assumptions inside the JSON
      await t.k('assumption_sets').where({ id: set.id }).update({ assumptions: JSON.stringify({ ...assumptions, valuation: 'median-path', lostMarginShare: 0.4 }) });
      await t.k.migrate.latest();
      const after = await t.k('assumption_sets').where({ id: set.id }).first();
      expect([after.valuation, Number(after.lostMarginShare)]).toEqual(['median-path', 0.4]);
      expect(JSON.parse(after.assumptions)).toEqual(assumptions);
      const other = await t.k('assumption_sets').where({ workspaceId: ws, name: 'High fuel' }).first();
      expect([other.valuation, Number(other.lostMarginShare)]).toEqual(['expected', 1]);
      expect((await t.k('repower_offers').first()).failedCoreCredit).toBeNull();
    } finally {
      await t.destroy();
    }
  });
});
