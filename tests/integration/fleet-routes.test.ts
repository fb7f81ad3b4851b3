import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as trucksRoute from '@/app/api/workspaces/[workspace]/trucks/route';
import * as truckRoute from '@/app/api/workspaces/[workspace]/trucks/[id]/route';
import * as enginesRoute from '@/app/api/workspaces/[workspace]/engines/route';
import * as engineRoute from '@/app/api/workspaces/[workspace]/engines/[id]/route';
import * as offersRoute from '@/app/api/workspaces/[workspace]/offers/route';
import * as offerRoute from '@/app/api/workspaces/[workspace]/offers/[id]/route';
import * as setsRoute from '@/app/api/workspaces/[workspace]/assumption-sets/route';
import * as setRoute from '@/app/api/workspaces/[workspace]/assumption-sets/[id]/route';
import * as settingsRoute from '@/app/api/workspaces/[workspace]/settings/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { assumptions, engineBody, offerBody, OTHER, setBody, snapshotWorkspace, truckBody, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

type Ctx = { engineId: number; offerId: number };
type Entity = {
  name: string;
  table: string;
  list: typeof trucksRoute;
  item: typeof truckRoute;
  body: (c: Ctx, n: number) => Record<string, unknown>;
  /** A body with a bad value and the path the 422 must name. */
  bad: (c: Ctx) => [Record<string, unknown>, string];
  change: Record<string, unknown>;
  /** A row of the other workspace, inserted directly. */
  foreign: (k: Knex, wsId: number) => Promise<number>;
};

const stamp = { version: 1, createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-01T00:00:00Z' };
const insert = async (k: Knex, table: string, row: Record<string, unknown>) => {
  const [r] = await k(table).insert({ ...row, ...stamp }).returning('id');
  return typeof r === 'object' ? r.id : r;
};
const foreignEngine = async (k: Knex, ws: number) => {
  const { key, ...rest } = engineBody('corrin-engine');
  const found = await k('engine_types').where({ workspaceId: ws, key }).first('id');
  return found ? found.id : insert(k, 'engine_types', { workspaceId: ws, key, ...rest });
};

const ENTITIES: Entity[] = [
  {
    name: 'trucks', table: 'trucks', list: trucksRoute, item: truckRoute,
    body: (c, n) => truckBody(`TEST-${n}`, c.engineId, c.offerId),
    bad: (c) => [{ ...truckBody('TEST-BAD', c.engineId), loadFactor: 1.4 }, 'loadFactor'],
    change: { engineHours: 13500 },
    foreign: async (k, ws) => insert(k, 'trucks', { workspaceId: ws, ...truckBody('C-01', await foreignEngine(k, ws)) }),
  },
  {
    name: 'engines', table: 'engine_types', list: enginesRoute, item: engineRoute,
    body: (_c, n) => engineBody(`test-engine-${n}`),
    bad: () => [{ ...engineBody('bad-engine'), weibullShape: 0 }, 'weibullShape'],
    change: { bsfcGPerKwh: 199 },
    foreign: foreignEngine,
  },
  {
    name: 'offers', table: 'repower_offers', list: offersRoute, item: offerRoute,
    body: (c, n) => offerBody(`test-offer-${n}`, c.engineId),
    bad: (c) => [{ ...offerBody('bad-offer', c.engineId), coreCredit: 5_000_000 }, 'coreCredit'],
    change: { modulePrice: 1_450_000 },
    foreign: async (k, ws) => insert(k, 'repower_offers', { workspaceId: ws, ...offerBody('corrin-offer', await foreignEngine(k, ws)) }),
  },
  {
    name: 'assumption sets', table: 'assumption_sets', list: setsRoute, item: setRoute,
    body: (_c, n) => setBody(`Test set ${n}`),
    bad: () => [{ ...setBody('Bad set'), assumptions: { ...assumptions, taxRate: 1.2 } }, 'assumptions.taxRate'],
    change: { notes: 'revised' },
    foreign: async (k, ws) => insert(k, 'assumption_sets', { workspaceId: ws, name: 'Corrin base', assumptions: JSON.stringify(assumptions) }),
  },
];

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('register routes on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  const c: Ctx = { engineId: 0, offerId: 0 };
  let otherWsId = 0;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    c.engineId = (await k('engine_types').where({ workspaceId: ws.id }).orderBy('id').first('id')).id;
    c.offerId = (await k('repower_offers').where({ workspaceId: ws.id }).orderBy('id').first('id')).id;
    otherWsId = (await k('workspaces').where({ slug: OTHER }).first('id')).id;
  });
  afterAll(async () => destroy());

  const as = (role: string | null) => signInAs(role ? ids[`${role}@aldervane.test`] : null);

  describe.each(ENTITIES)('$name', (e) => {
    it('lets every role list and read; signed out is 401', async () => {
      for (const role of ['admin', 'analyst', 'approver', 'viewer']) {
        as(role);
        const r = await call(e.list.GET, { workspace: WS });
        expect(r.status).toBe(200);
        expect(r.body.items.length).toBeGreaterThan(0);
        const one = await call(e.item.GET, { workspace: WS, id: String(r.body.items[0].id) });
        expect(one.status).toBe(200);
        expect(one.body.workspaceId).toBeUndefined();
      }
      as(null);
      expect((await call(e.list.GET, { workspace: WS })).status).toBe(401);
    });

    it('refuses writes by viewers, approvers and the signed out, and changes nothing', async () => {
      const before = await snapshotWorkspace(k, WS);
      const someId = String((await k(e.table).orderBy('id').first('id')).id);
      for (const role of ['viewer', 'approver', null]) {
        as(role);
        const want = role ? 403 : 401;
        expect((await call(e.list.POST, { workspace: WS }, { body: e.body(c, 900) })).status).toBe(want);
        expect((await call(e.item.PUT, { workspace: WS, id: someId }, { method: 'PUT', body: { ...e.body(c, 901), version: 1 } })).status).toBe(want);
        expect((await call(e.item.DELETE, { workspace: WS, id: someId }, { method: 'DELETE' })).status).toBe(want);
      }
      expect(await snapshotWorkspace(k, WS)).toEqual(before);
    });

    it('creates, updates with the version, and deletes, writing the audit log each time', async () => {
      as('analyst');
      const created = await call(e.list.POST, { workspace: WS }, { body: e.body(c, 1) });
      expect(created.status).toBe(201);
      expect(created.body.version).toBe(1);
      const id = String(created.body.id);
      const updated = await call(e.item.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...e.body(c, 1), ...e.change, version: 1 } });
      expect(updated.status).toBe(200);
      expect(updated.body.version).toBe(2);
      for (const [f, v] of Object.entries(e.change)) expect(updated.body[f]).toBe(v);
      as('admin');
      expect((await call(e.item.DELETE, { workspace: WS, id }, { method: 'DELETE', url: 'http://x/?version=2' })).status).toBe(204);
      expect((await call(e.item.GET, { workspace: WS, id })).status).toBe(404);
      const audit = await k('audit_log').where({ entityId: id }).whereIn('action', ['create', 'update', 'delete']).orderBy('id').pluck('action');
      expect(audit.slice(-3)).toEqual(['create', 'update', 'delete']);
    });

    it('answers 422 with every problem for an invalid body, a duplicate key, or non-JSON, and saves nothing', async () => {
      as('analyst');
      const before = await snapshotWorkspace(k, WS);
      const [bad, path] = e.bad(c);
      const r = await call(e.list.POST, { workspace: WS }, { body: bad });
      expect(r.status).toBe(422);
      expect(r.body.problems.map((p: { path: string }) => p.path)).toContain(path);
      const empty = await call(e.list.POST, { workspace: WS }, { body: {} });
      expect(empty.status).toBe(422);
      expect(empty.body.problems.length).toBeGreaterThanOrEqual(2);
      expect((await call(e.list.POST, { workspace: WS }, { body: '{not json' })).status).toBe(422);
      const existing = (await call(e.list.GET, { workspace: WS })).body.items[0];
      const dup = { ...e.body(c, 2) };
      for (const f of ['unitNumber', 'key', 'name']) if (f in dup && !(e.name === 'engines' && f === 'name')) dup[f] = existing[f];
      const d = await call(e.list.POST, { workspace: WS }, { body: dup });
      expect(d.status).toBe(422);
      expect(d.body.problems[0].message).toMatch(/already used/);
      const formula = { ...e.body(c, 3), notes: '=HYPERLINK("http://example.invalid")' };
      const f = await call(e.list.POST, { workspace: WS }, { body: formula });
      expect(f.status).toBe(422);
      expect(f.body.problems).toContainEqual({ path: 'notes', message: expect.stringMatching(/formula/) });
      expect(await snapshotWorkspace(k, WS)).toEqual(before);
    });

    it('answers 409 to a stale version and keeps the row as it was', async () => {
      as('analyst');
      const created = await call(e.list.POST, { workspace: WS }, { body: e.body(c, 4) });
      const id = String(created.body.id);
      expect((await call(e.item.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...e.body(c, 4), ...e.change, version: 1 } })).status).toBe(200);
      const before = await snapshotWorkspace(k, WS);
      const stale = await call(e.item.PUT, { workspace: WS, id }, { method: 'PUT', body: { ...e.body(c, 4), version: 1 } });
      expect(stale.status).toBe(409);
      expect(stale.body.error).toMatch(/changed this since you loaded it/);
      expect((await call(e.item.DELETE, { workspace: WS, id }, { method: 'DELETE', url: 'http://x/?version=1' })).status).toBe(409);
      expect(await snapshotWorkspace(k, WS)).toEqual(before);
    });

    it('refuses a delete without the version it was loaded at (422 with the path version), deleting nothing', async () => {
      as('analyst');
      const created = await call(e.list.POST, { workspace: WS }, { body: e.body(c, 6) });
      const id = String(created.body.id);
      const before = await snapshotWorkspace(k, WS);
      for (const url of ['http://x/', 'http://x/?version=', 'http://x/?version=abc', 'http://x/?version=1.5', 'http://x/?version=-1', 'http://x/?version=0']) {
        const r = await call(e.item.DELETE, { workspace: WS, id }, { method: 'DELETE', url });
        expect(r.status, url).toBe(422);
        expect(r.body.problems.map((p: { path: string }) => p.path)).toEqual(['version']);
      }
      expect(await snapshotWorkspace(k, WS)).toEqual(before);
      expect((await call(e.item.DELETE, { workspace: WS, id }, { method: 'DELETE', url: 'http://x/?version=1' })).status).toBe(204);
    });

    it("answers 404 for another workspace's id and for a malformed id, changing nothing there", async () => {
      const foreignId = String(await e.foreign(k, otherWsId));
      const theirs = await snapshotWorkspace(k, OTHER);
      const ours = await snapshotWorkspace(k, WS);
      as('analyst'); // a member of both sites: the id still does not belong to the one in the URL
      expect((await call(e.item.GET, { workspace: WS, id: foreignId })).status).toBe(404);
      expect((await call(e.item.PUT, { workspace: WS, id: foreignId }, { method: 'PUT', body: { ...e.body(c, 5), version: 1 } })).status).toBe(404);
      expect((await call(e.item.DELETE, { workspace: WS, id: foreignId }, { method: 'DELETE', url: 'http://x/?version=1' })).status).toBe(404);
      expect((await call(e.item.GET, { workspace: WS, id: 'abc' })).status).toBe(404);
      expect((await call(e.item.GET, { workspace: OTHER, id: foreignId })).status).toBe(200);
      as('viewer'); // not a member of the other site at all
      expect((await call(e.item.GET, { workspace: OTHER, id: foreignId })).status).toBe(403);
      expect(await snapshotWorkspace(k, OTHER)).toEqual(theirs);
      expect(await snapshotWorkspace(k, WS)).toEqual(ours);
    });
  });

  it('refuses a truck that names an engine type of another workspace (422)', async () => {
    as('analyst');
    const foreign = await foreignEngine(k, otherWsId);
    const r = await call(trucksRoute.POST, { workspace: WS }, { body: truckBody('TEST-X', foreign) });
    expect(r.status).toBe(422);
    expect(r.body.problems[0].path).toBe('engineTypeId');
  });

  it('refuses to delete an engine type that trucks use (409), and keeps it', async () => {
    as('admin');
    const version = (await k('engine_types').where({ id: c.engineId }).first('version')).version;
    const r = await call(engineRoute.DELETE, { workspace: WS, id: String(c.engineId) }, { method: 'DELETE', url: `http://x/?version=${version}` });
    expect(r.status).toBe(409);
    expect(r.body.error).toMatch(/used by \d+ truck/);
    expect(await k('engine_types').where({ id: c.engineId }).first('id')).toBeTruthy();
  });

  it('lets only admins change display units, and audits the change', async () => {
    const before = await snapshotWorkspace(k, WS);
    as('analyst');
    expect((await call(settingsRoute.PATCH, { workspace: WS }, { method: 'PATCH', body: { units: 'us' } })).status).toBe(403);
    as('admin');
    expect((await call(settingsRoute.PATCH, { workspace: WS }, { method: 'PATCH', body: { units: 'imperial' } })).status).toBe(422);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
    const ok = await call(settingsRoute.PATCH, { workspace: WS }, { method: 'PATCH', body: { units: 'us' } });
    expect(ok.status).toBe(200);
    expect(ok.body.settings).toMatchObject({ units: 'us', negativeStyle: 'parentheses', approvalsRequired: 1 });
    expect(await k('audit_log').where({ entity: 'workspace_settings' }).count({ n: '*' })).toEqual([{ n: expect.anything() }]);
    await call(settingsRoute.PATCH, { workspace: WS }, { method: 'PATCH', body: { units: 'metric' } });
  });
});
