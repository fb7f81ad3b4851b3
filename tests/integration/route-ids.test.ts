import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as assumptionSet from '@/app/api/workspaces/[workspace]/assumption-sets/[id]/route';
import * as actuals from '@/app/api/workspaces/[workspace]/cases/[id]/actuals/route';
import * as breakEven from '@/app/api/workspaces/[workspace]/cases/[id]/break-even/route';
import * as copy from '@/app/api/workspaces/[workspace]/cases/[id]/copy/route';
import * as decisionPack from '@/app/api/workspaces/[workspace]/cases/[id]/decision-pack/route';
import * as decisionSummary from '@/app/api/workspaces/[workspace]/cases/[id]/decision-summary/route';
import * as decisions from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import * as drivers from '@/app/api/workspaces/[workspace]/cases/[id]/drivers/route';
import * as exportCase from '@/app/api/workspaces/[workspace]/cases/[id]/export/route';
import * as frozenRecord from '@/app/api/workspaces/[workspace]/cases/[id]/frozen-record/route';
import * as reforecast from '@/app/api/workspaces/[workspace]/cases/[id]/reforecast/route';
import * as history from '@/app/api/workspaces/[workspace]/cases/[id]/history/route';
import * as monteCarloRun from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/[job]/route';
import * as monteCarlo from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/route';
import * as pinnedRun from '@/app/api/workspaces/[workspace]/cases/[id]/pinned-run/route';
import * as programme from '@/app/api/workspaces/[workspace]/cases/[id]/programme/route';
import * as result from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import * as revision from '@/app/api/workspaces/[workspace]/cases/[id]/revision/route';
import * as oneCase from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import * as spider from '@/app/api/workspaces/[workspace]/cases/[id]/spider/route';
import * as submit from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import * as tornado from '@/app/api/workspaces/[workspace]/cases/[id]/tornado/route';
import * as caseTruck from '@/app/api/workspaces/[workspace]/cases/[id]/trucks/[truckId]/route';
import * as twoWay from '@/app/api/workspaces/[workspace]/cases/[id]/two-way/route';
import * as engine from '@/app/api/workspaces/[workspace]/engines/[id]/route';
import * as member from '@/app/api/workspaces/[workspace]/members/[userId]/route';
import * as document from '@/app/api/workspaces/[workspace]/offers/[id]/documents/[docId]/route';
import * as documents from '@/app/api/workspaces/[workspace]/offers/[id]/documents/route';
import * as offer from '@/app/api/workspaces/[workspace]/offers/[id]/route';
import * as reading from '@/app/api/workspaces/[workspace]/readings/[id]/route';
import * as accept from '@/app/api/workspaces/[workspace]/readings/trucks/[truck]/accept/route';
import * as truck from '@/app/api/workspaces/[workspace]/trucks/[id]/route';
import * as caseFile from '@/app/api/workspaces/[workspace]/case-file/route';
import * as compare from '@/app/api/workspaces/[workspace]/cases/compare/route';
import * as readings from '@/app/api/workspaces/[workspace]/readings/route';
import * as audit from '@/app/api/workspaces/[workspace]/audit/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

const WS = 'aldervane-north-pit';
type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type Row = { route: string; module: Record<string, unknown>; params: Record<string, string>; ids: string[]; multipart?: boolean };

// The well-formed values of each segment; a row spoils one of its `ids` at a time, the others kept well-formed.
const ID = '1';
const RUN = 'c0ffee00-0000-4000-8000-0000000000ab';

/** Every route handler with an id segment (`git ls-files 'app/api/**\/[*]/**\/route.ts'`; a test below checks the list is complete). */
const ROUTES: Row[] = [
  { route: 'assumption-sets/[id]', module: assumptionSet, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]', module: oneCase, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/actuals', module: actuals, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/break-even', module: breakEven, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/copy', module: copy, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/decision-pack', module: decisionPack, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/decision-summary', module: decisionSummary, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/decisions', module: decisions, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/drivers', module: drivers, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/export', module: exportCase, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/frozen-record', module: frozenRecord, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/history', module: history, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/monte-carlo', module: monteCarlo, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/monte-carlo/[job]', module: monteCarloRun, params: { id: ID, job: RUN }, ids: ['id', 'job'] },
  { route: 'cases/[id]/pinned-run', module: pinnedRun, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/programme', module: programme, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/reforecast', module: reforecast, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/result', module: result, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/revision', module: revision, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/spider', module: spider, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/submit', module: submit, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/tornado', module: tornado, params: { id: ID }, ids: ['id'] },
  { route: 'cases/[id]/trucks/[truckId]', module: caseTruck, params: { id: ID, truckId: 'T3-01' }, ids: ['id', 'truckId'] },
  { route: 'cases/[id]/two-way', module: twoWay, params: { id: ID }, ids: ['id'] },
  { route: 'engines/[id]', module: engine, params: { id: ID }, ids: ['id'] },
  { route: 'members/[userId]', module: member, params: { userId: ID }, ids: ['userId'] },
  { route: 'offers/[id]', module: offer, params: { id: ID }, ids: ['id'] },
  { route: 'offers/[id]/documents', module: documents, params: { id: ID }, ids: ['id'], multipart: true },
  { route: 'offers/[id]/documents/[docId]', module: document, params: { id: ID, docId: ID }, ids: ['id', 'docId'] },
  { route: 'readings/[id]', module: reading, params: { id: ID }, ids: ['id'] },
  { route: 'readings/trucks/[truck]/accept', module: accept, params: { truck: ID }, ids: ['truck'] },
  { route: 'trucks/[id]', module: truck, params: { id: ID }, ids: ['id'] },
];

/** What no id can be: the brief's two, and the issue's (a space, an exponent, zero, a leading zero, 10 and 11 digits). */
const BAD_IDS = ['0x10', 'abc', ' 7', '1e1', '0', '01', '1000000000', '12345678901'];
/** A unit number is text, so "0x10" and "abc" are units; what no unit can be is a 404 there. */
const BAD_SEGMENT: Record<string, string[]> = { job: ['0x10', 'abc', 'no-such-run', RUN.toUpperCase()], truckId: ['', 'x'.repeat(81), 'T1\n'] };

const METHODS: Method[] = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];
const cases = ROUTES.flatMap((row) =>
  METHODS.filter((m) => typeof row.module[m] === 'function').flatMap((method) =>
    row.ids.flatMap((segment) => (BAD_SEGMENT[segment] ?? BAD_IDS).map((bad) => ({ ...row, method, segment, bad, label: `${method} ${row.route} with ${segment}=${JSON.stringify(bad)}` }))),
  ),
);

function request(row: Row, method: Method) {
  // a body that would pass the content checks, and a DELETE's version, so only the id can be refused
  const url = `http://127.0.0.1/api/workspaces/${WS}/${row.route}?version=1`;
  if (method === 'GET') return { method, url };
  if (method === 'DELETE') return { method, url };
  if (row.multipart) {
    const form = new FormData();
    form.set('file', new File([new Uint8Array([0x25, 0x50, 0x44, 0x46])], 'quote.pdf', { type: 'application/pdf' }));
    return { method, url, body: form };
  }
  return { method, url, body: {} };
}

describe('the id route list', () => {
  it('names every route handler with an id segment, with at least one method', () => {
    const root = path.resolve('app/api/workspaces/[workspace]');
    const onDisk = (fs.readdirSync(root, { recursive: true }) as string[])
      .map((f) => f.replace(/\\/g, '/'))
      .filter((f) => f.endsWith('/route.ts') && f.includes('['))
      .map((f) => f.replace(/\/route\.ts$/, ''))
      .sort();
    expect(onDisk.length).toBeGreaterThan(25);
    expect(ROUTES.map((r) => r.route).sort()).toEqual(onDisk);
    for (const r of ROUTES) expect(METHODS.some((m) => typeof r.module[m] === 'function'), r.route).toBe(true);
  });
});

describe.each(backends)('ids in route URLs on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
  });
  afterAll(async () => destroy());

  it('runs on the expected database client', () => {
    expect(k.client.config.client).toBe(pg ? 'pg' : 'better-sqlite3');
  });

  it.each(cases)('$label answers 404 { error: "Not found." }', async (c) => {
    signInAs(ids['admin@aldervane.test']);
    const handler = c.module[c.method] as Handler;
    const r = await call(handler, { workspace: WS, ...c.params, [c.segment]: c.bad }, request(c, c.method));
    expect(r.status).toBe(404);
    expect(r.body).toEqual({ error: 'Not found.' });
  });

  it('a well-formed id of no row keeps its own message (the approval routes too, no longer a 422)', async () => {
    signInAs(ids['admin@aldervane.test']);
    const missing = { workspace: WS, id: '999999999' };
    for (const [handler, init] of [[history.GET, {}], [submit.POST, { body: {} }], [decisions.POST, { body: { decision: 'approve' } }], [oneCase.GET, {}], [drivers.GET, {}]] as const) {
      const r = await call(handler as Handler, missing, init);
      expect(r.status).toBe(404);
      expect(typeof r.body.error).toBe('string');
    }
    expect((await call(oneCase.GET, missing)).body.error).toBe('No such business case in this workspace.');
  });

  it('still reads the access first: a bad id in another workspace is a 403, signed out a 401', async () => {
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(drivers.GET as Handler, { workspace: 'corrin-flats', id: '0x10' })).status).toBe(403);
    signInAs(null);
    expect((await call(history.GET as Handler, { workspace: WS, id: 'abc' })).status).toBe(401);
  });

  it('query-string ids follow the same rule and answer 422 naming the parameter (an 11-digit set id was a PostgreSQL 500)', async () => {
    signInAs(ids['admin@aldervane.test']);
    const q = (path: string) => ({ url: `http://127.0.0.1/api/x?${path}` });
    for (const bad of ['99999999999', '0x10', '1e1', '01']) {
      const set = await call(caseFile.GET, { workspace: WS }, q(`assumptionSetId=${encodeURIComponent(bad)}`));
      expect(set.status).toBe(422);
      expect(set.body.problems).toEqual([{ path: 'assumptionSetId', message: 'must be an assumption set id (a whole number from 1 to 999,999,999)' }]);
      const cmp = await call(compare.GET, { workspace: WS }, q(`a=1&b=${encodeURIComponent(bad)}`));
      expect(cmp.status).toBe(422);
      expect(cmp.body.problems).toEqual([{ path: 'b', message: 'must be a case id (a positive whole number)' }]);
      const list = await call(readings.GET, { workspace: WS }, q(`truck=${encodeURIComponent(bad)}`));
      expect(list.status).toBe(422);
      expect(list.body.problems).toEqual([{ path: 'truck', message: 'must be a truck id (a whole number from 1 to 999,999,999)' }]);
      const log = await call(audit.GET, { workspace: WS }, q(`user=${encodeURIComponent(bad)}`));
      expect(log.status).toBe(422);
      expect(log.body.problems.map((p: { path: string }) => p.path)).toEqual(['user']);
    }
    expect((await call(caseFile.GET, { workspace: WS }, q('assumptionSetId=999999999'))).status).toBe(404);
    expect((await call(caseFile.GET, { workspace: WS }, q(''))).body.problems).toEqual([{ path: 'assumptionSetId', message: 'Choose an assumption set (query parameter assumptionSetId).' }]);
    expect((await call(readings.GET, { workspace: WS }, q('truck=999999999'))).body).toEqual({ items: [] });
  });
});
