import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { findMembership, type Access } from '@/lib/auth/access';
import { fetchOverview } from '@/lib/db/queries/overview';
import { createTestDb, userIds } from '../support/test-db';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('the overview by role on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  const as = async (email: string) => (await findMembership(ids[email], WS)) as Access;

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
    const ws = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const set = (await k('assumption_sets').where({ workspaceId: ws, name: 'Base' }).first('id')).id;
    const now = '2027-02-01T09:00:00.000Z';
    const row = (name: string, status: string, by: string, extra: Record<string, unknown> = {}) => ({
      workspaceId: ws, name, assumptionSetId: set, selection: '[]', plan: '{}', status, version: 1, createdBy: ids[by], updatedBy: ids[by], createdAt: now, updatedAt: now, ...extra,
    });
    const [sub] = await k('business_cases').insert(row('Waiting one', 'submitted', 'analyst@aldervane.test', { submittedBy: ids['analyst@aldervane.test'], submittedAt: now })).returning('id');
    await k('case_events').insert({ workspaceId: ws, caseId: typeof sub === 'object' ? sub.id : sub, userId: ids['analyst@aldervane.test'], action: 'submit', comment: '', at: now });
    await k('business_cases').insert([
      row('Sent back one', 'returned', 'analyst@aldervane.test', { decidedAt: now }),
      row('Approved one', 'approved', 'analyst@aldervane.test', { decidedAt: now }),
      row('Admin draft', 'draft', 'admin@aldervane.test'),
    ]);
  });
  afterAll(async () => destroy());

  it('an approver sees the one case waiting for their decision and nothing to edit', async () => {
    const o = await fetchOverview(await as('approver@aldervane.test'));
    expect(o.waiting.map((c) => c.name)).toEqual(['Waiting one']);
    expect(o.waiting[0].who).toBe('Demo analyst');
    expect(o.drafts).toEqual([]);
    expect(o.approved).toEqual([]);
    expect(o.admin).toBeNull();
  });

  it('an analyst sees their own drafts and their cases sent back, not the admin\'s draft, and no decisions', async () => {
    const o = await fetchOverview(await as('analyst@aldervane.test'));
    expect(o.drafts.map((c) => c.name)).toEqual(['North Pit fleet — base assumptions']);
    expect(o.returned.map((c) => c.name)).toEqual(['Sent back one']);
    expect(o.waiting).toEqual([]);
  });

  it('an admin sees the waiting case, every draft and sent-back case, and members', async () => {
    const o = await fetchOverview(await as('admin@aldervane.test'));
    expect(o.waiting.map((c) => c.name)).toEqual(['Waiting one']);
    expect(o.drafts.map((c) => c.name).sort()).toEqual(['Admin draft', 'North Pit fleet — base assumptions']);
    expect(o.returned.map((c) => c.name)).toEqual(['Sent back one']);
    expect(o.admin).toMatchObject({ members: 4, admins: 1, invitations: 0, mailFailed: 0 });
  });

  it('a viewer sees the approved cases only', async () => {
    const o = await fetchOverview(await as('viewer@aldervane.test'));
    // the demo's own approved case (db/seeds/demo.ts) and this file's
    expect(o.approved.map((c) => c.name).sort()).toEqual(['Approved one', 'North Pit 300 t repower programme (approved 2024-11)']);
    expect([o.waiting, o.drafts, o.returned]).toEqual([[], [], []]);
    expect(o.admin).toBeNull();
  });
});
