/**
 * Issue 15, recommended overhaul life: a case adopts a planned life for an
 * engine type; the built case file carries it, so the case's evaluation, its
 * submission snapshot and its frozen record all read it, and rebuild's npv
 * moves exactly as the engine predicts for that life.
 */
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { startMailSink, useMailSinkForTests, type MailSink } from '@/lib/mail/sink';
import { POST as createCase } from '@/app/api/workspaces/[workspace]/cases/route';
import { GET as getCase, PATCH as patchCase } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { POST as copyCase } from '@/app/api/workspaces/[workspace]/cases/[id]/copy/route';
import { GET as getResult } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { evaluateCase } from '@/lib/engine';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('a case adopts an engine type’s planned life on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let sink: MailSink;
  let users: Record<string, number>;
  let wsId: number;
  let setId: number;
  let engine: { id: number; key: string; lifeHours: number };
  let truckIds: number[];
  let caseId: string;
  const ADOPTED = 27626;
  const as = (role: string) => signInAs(users[`${role}@aldervane.test`]);
  const p = () => ({ workspace: WS, id: caseId });
  const patch = (body: unknown) => call(patchCase, p(), { method: 'PATCH', body });
  const rebuildNpvs = (result: { trucks: { id: string; options: { rebuild: { npv: number } } }[] }) => Object.fromEntries(result.trucks.map((t) => [t.id, t.options.rebuild.npv]));

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    sink = await startMailSink({ k: () => k });
    useMailSinkForTests(sink);
    users = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    setId = (await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id')).id;
    engine = await k('engine_types').where({ workspaceId: wsId, key: 'ac-2600-legacy' }).first('id', 'key', 'lifeHours');
    // three trucks with that engine and one with another, so the other's figures must not move
    const fitted = await k('trucks').where({ workspaceId: wsId, engineTypeId: engine.id }).orderBy('unitNumber').limit(3).pluck('id');
    const other = await k('trucks').where({ workspaceId: wsId }).whereNot({ engineTypeId: engine.id }).orderBy('unitNumber').first('id');
    truckIds = [...fitted, other.id];
    as('analyst');
    const r = await call(createCase, { workspace: WS }, { body: { name: 'Adopted life', assumptionSetId: setId, selection: truckIds.map((truckId) => ({ truckId, repowerOfferId: null })) } });
    expect(r.status).toBe(201);
    caseId = String(r.body.case.id);
  });
  afterAll(async () => {
    useMailSinkForTests(undefined);
    await sink.stop();
    await destroy();
  });

  it('stores the override in one audited update and shows it with the case', async () => {
    expect(engine.lifeHours).toBe(20000);
    as('analyst');
    const r = await patch({ version: 1, engineLives: { [engine.id]: ADOPTED } });
    expect(r.status).toBe(200);
    expect(r.body.case).toMatchObject({ version: 2, engineLives: { [engine.id]: ADOPTED } });
    expect((await call(getCase, p())).body.case.engineLives).toEqual({ [engine.id]: ADOPTED });
    const audit = await k('audit_log').where({ entity: 'business_case', entityId: caseId, action: 'update-engine-lives' });
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0].before).engineLives).toEqual({});
    expect(JSON.parse(audit[0].after).engineLives).toEqual({ [engine.id]: ADOPTED });
    // the library is untouched
    expect((await k('engine_types').where({ id: engine.id }).first('lifeHours')).lifeHours).toBe(20000);
  });

  it('refuses a life outside the range or not whole, and another workspace’s engine type, naming the field and changing nothing', async () => {
    as('analyst');
    const bad = await patch({ version: 2, engineLives: { [engine.id]: 120 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems).toEqual([{ path: `engineLives.${engine.id}`, message: 'must be at least 500 hours' }]);
    const half = await patch({ version: 2, engineLives: { [engine.id]: 20000.5 } });
    expect(half.body.problems).toEqual([{ path: `engineLives.${engine.id}`, message: 'must be a whole number of hours' }]);
    const foreign = await k('engine_types').whereNot({ workspaceId: wsId }).first('id');
    const stranger = await patch({ version: 2, engineLives: { [foreign.id]: 20000 } });
    expect(stranger.status).toBe(422);
    expect(stranger.body.problems).toEqual([{ path: `engineLives.${foreign.id}`, message: 'is not an engine type of this workspace' }]);
    as('viewer');
    expect((await patch({ version: 2, engineLives: {} })).status).toBe(403);
    expect((await k('business_cases').where({ id: caseId }).first('version', 'engineLives'))).toEqual({ version: 2, engineLives: JSON.stringify({ [engine.id]: ADOPTED }) });
  });

  it('reaches the built case file and moves rebuild’s npv exactly as the engine predicts for the adopted life', async () => {
    as('viewer');
    const shown = await call(getResult, p());
    expect(shown.status).toBe(200);
    // the register's case file, with the engine's life changed in memory, evaluated by the engine itself
    const register = await buildCaseFile(wsId, { name: 'Adopted life', assumptionSetId: setId, truckIds }, k);
    const adopted = structuredClone(register);
    adopted.engines.find((e) => e.id === engine.key)!.lifeHours = ADOPTED;
    const expected = rebuildNpvs(evaluateCase(adopted as never));
    const before = rebuildNpvs(evaluateCase(register as never));
    const got = rebuildNpvs(shown.body.result);
    const fitted = (await k('trucks').whereIn('id', truckIds).where({ engineTypeId: engine.id }).pluck('unitNumber')) as string[];
    expect(fitted).toHaveLength(3);
    for (const [unit, npv] of Object.entries(expected)) expect(got[unit]).toBeCloseTo(npv, 6);
    for (const unit of Object.keys(expected)) {
      if (fitted.includes(unit)) expect(Math.abs(got[unit] - before[unit])).toBeGreaterThan(1000);
      else expect(got[unit]).toBeCloseTo(before[unit], 6);
    }
  });

  it('is copied with the case, frozen in the submission snapshot, and refused on a submitted case', async () => {
    as('analyst');
    const copied = await call(copyCase, p(), { body: {} });
    expect(copied.body.case.engineLives).toEqual({ [engine.id]: ADOPTED });
    expect((await call(submit, p(), { body: { comment: 'With the recommended life.' } })).status).toBe(200);
    const row = await k('business_cases').where({ id: caseId }).first('submittedCase', 'version');
    expect(JSON.parse(row.submittedCase).engines.find((e: { id: string }) => e.id === engine.key).lifeHours).toBe(ADOPTED);
    const locked = await patch({ version: row.version, engineLives: {} });
    expect(locked.status).toBe(409);
    expect(locked.body.error).toMatch(/This case is submitted/);
  });

  it('removes an override with the rest of the map, back to the library’s life', async () => {
    as('analyst');
    const copyId = String((await k('business_cases').where({ workspaceId: wsId, name: 'Adopted life (copy)' }).first('id')).id);
    const r = await call(patchCase, { workspace: WS, id: copyId }, { method: 'PATCH', body: { version: 1, engineLives: {} } });
    expect(r.status).toBe(200);
    expect(r.body.case.engineLives).toEqual({});
    expect((await k('business_cases').where({ id: copyId }).first('engineLives')).engineLives).toBeNull();
  });
});
