import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { startMailSink, useMailSinkForTests, type MailSink } from '@/lib/mail/sink';
import { canonicalJson, verifyFrozen } from '@/lib/approvals/canonical';
import { buildCaseForRow } from '@/lib/approvals/freeze';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
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
])('a submitted case is frozen exactly as submitted on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let sink: MailSink;
  let ids: Record<string, number>;
  let wsId: number;
  const p = (id: number) => ({ workspace: WS, id: String(id) });
  const as = (email: string) => signInAs(ids[email]);
  const setApprovals = (n: number) =>
    k('workspaces').where({ id: wsId }).update({ settings: JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: n }) });

  /** A draft naming these trucks by id (the case form always names them), each with its own offer. */
  const draftOver = async (name: string, truckIds: number[]): Promise<number> => {
    const set = await k('assumption_sets').where({ workspaceId: wsId }).orderBy('id').first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases')
      .insert({ workspaceId: wsId, name, assumptionSetId: set.id, selection: JSON.stringify(truckIds.map((truckId) => ({ truckId, repowerOfferId: null }))), plan: '{}', status: 'draft', createdAt: now, updatedAt: now })
      .returning('id');
    return typeof row === 'object' ? row.id : row;
  };
  const firstTrucks = async (n: number) => (await k('trucks').where({ workspaceId: wsId }).orderBy('id').limit(n).select('id', 'unitNumber'));

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    sink = await startMailSink({ k: () => k });
    useMailSinkForTests(sink);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
  });
  afterAll(async () => {
    useMailSinkForTests(undefined);
    await sink.stop();
    await destroy();
  });

  it('stores the validated case at submission, shows it while submitted, and freezes exactly it after the fleet is edited between two approvals', async () => {
    await setApprovals(2);
    const trucks = await firstTrucks(3);
    const id = await draftOver('Snapshot case', trucks.map((t) => t.id));
    as('analyst@aldervane.test');
    expect((await call(submit, p(id), { body: { comment: 'For March.' } })).status).toBe(200);
    const { submittedCase } = await k('business_cases').where({ id }).first('submittedCase');
    const submitted = JSON.parse(submittedCase);
    expect(submitted.format).toBe('case/1');
    expect(submitted.trucks.map((t: { id: string }) => t.id)).toEqual(trucks.map((t) => t.unitNumber));
    expect(canonicalJson(submitted)).toBe(submittedCase);
    const hoursAtSubmit = submitted.trucks[0].engineHours as number;

    // the fleet changes while the case waits
    await k('trucks').whereIn('id', trucks.map((t) => t.id)).update({ engineHours: 1, annualHours: 4000 });
    await k('repower_offers').where({ workspaceId: wsId }).update({ modulePrice: 10 });

    // the case page shows what was submitted, not the edited register
    const shown = await call(result, p(id));
    expect(shown.status).toBe(200);
    expect(shown.body.trucks[trucks[0].unitNumber].engineHours).toBe(hoursAtSubmit);
    expect(hoursAtSubmit).not.toBe(1);

    as('approver@aldervane.test');
    expect((await call(decide, p(id), { body: { decision: 'approve', comment: 'First.' } })).body.status).toBe('submitted');
    await k('trucks').where({ id: trucks[1].id }).update({ engineHours: 2 });
    as('admin@aldervane.test');
    const final = await call(decide, p(id), { body: { decision: 'approve', comment: 'Second.' } });
    expect(final.body.status).toBe('approved');

    const row = await k('business_cases').where({ id }).first();
    expect(row.frozenCase).toBe(submittedCase);
    expect(verifyFrozen(row)).toBe(true);
    // and it is not what the edited register would give today
    const live = canonicalJson(await buildCaseForRow(row, k));
    expect(live).not.toBe(row.frozenCase);
    expect(JSON.parse(live).trucks[0].engineHours).toBe(1);
    await setApprovals(1);
  });

  it('clears the snapshot when the case is sent back, and takes a new one from the edited data at resubmission', async () => {
    const trucks = await firstTrucks(2);
    const id = await draftOver('Sent back snapshot', trucks.map((t) => t.id));
    as('analyst@aldervane.test');
    await call(submit, p(id), { body: {} });
    expect((await k('business_cases').where({ id }).first('submittedCase')).submittedCase).toBeTruthy();
    as('approver@aldervane.test');
    expect((await call(decide, p(id), { body: { decision: 'return', comment: 'Update the hours.' } })).body.status).toBe('returned');
    expect((await k('business_cases').where({ id }).first('submittedCase')).submittedCase).toBeNull();
    await k('trucks').where({ id: trucks[0].id }).update({ engineHours: 3333 });
    as('analyst@aldervane.test');
    expect((await call(submit, p(id), { body: {} })).status).toBe(200);
    const again = JSON.parse((await k('business_cases').where({ id }).first('submittedCase')).submittedCase);
    expect(again.trucks[0].engineHours).toBe(3333);
  });

  it('refuses (422) to submit a case whose selected truck was removed, naming its place in the selection, and changes nothing', async () => {
    const engine = await k('engine_types').where({ workspaceId: wsId }).orderBy('id').first('id');
    const now = new Date().toISOString();
    const [ins] = await k('trucks')
      .insert({ workspaceId: wsId, unitNumber: 'GONE-1', payloadClass: '300 t', engineTypeId: engine.id, repowerOfferId: (await k('repower_offers').where({ workspaceId: wsId }).first('id')).id, engineHours: 100, remainingLifeHours: 40000, annualHours: 6000, loadFactor: 0.5, tonnesPerHour: 800, notes: '', version: 1, createdAt: now, updatedAt: now })
      .returning('id');
    const goneId = typeof ins === 'object' ? ins.id : ins;
    const [keep] = await firstTrucks(1);
    const id = await draftOver('Lost a truck', [keep.id, goneId]);
    // removed behind the register's back (the register itself now refuses while a case names it)
    await k('trucks').where({ id: goneId }).del();
    const before = await k('business_cases').where({ id }).first();
    const audit = (await k('audit_log').where({ entity: 'business_case', entityId: String(id) })).length;

    as('analyst@aldervane.test');
    const r = await call(submit, p(id), { body: { comment: 'Go.' } });
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([{ path: 'selection[1]', message: 'this truck has been removed from the fleet register' }]);
    expect(await k('business_cases').where({ id }).first()).toEqual(before);
    expect(await k('case_events').where({ caseId: id })).toHaveLength(0);
    expect(await k('audit_log').where({ entity: 'business_case', entityId: String(id) })).toHaveLength(audit);
  });
});
