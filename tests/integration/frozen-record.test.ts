/**
 * Issue 14: the frozen record. Approval freezes the case file, its result, the
 * proposal (budgets, chosen trucks, schedule) with its decision summary and
 * the pinned Monte Carlo run as one canonical text; the SHA-256 covers all of
 * it; the download gives exactly the hashed bytes; one changed byte and it no
 * longer verifies. Also the fiscal-year setting and the decision summary route,
 * on SQLite and PostgreSQL.
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { frozenHashOf, readFrozenRecord, verifyFrozen } from '@/lib/approvals/canonical';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import { GET as history } from '@/app/api/workspaces/[workspace]/cases/[id]/history/route';
import { GET as frozenRecord } from '@/app/api/workspaces/[workspace]/cases/[id]/frozen-record/route';
import { GET as decisionSummary } from '@/app/api/workspaces/[workspace]/cases/[id]/decision-summary/route';
import { PATCH as patchSettings } from '@/app/api/workspaces/[workspace]/settings/route';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { insertDraftCase } from './support/cases';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

function runSummary(x: number) {
  return { count: 10, mean: x, sd: 1, min: x - 5, max: x + 5, p5: x - 4, p10: x - 3, p50: x + 0.5, p90: x + 3, p95: x + 4, probNegative: 0.125, histogram: [], runningMean: [] };
}

describe.each(backends)('the frozen record on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  let workspaceId: number;
  const p = (id: number) => ({ workspace: WS, id: String(id) });

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(pg));
    workspaceId = (await k('workspaces').where({ slug: WS }).first('id')).id;
  });
  afterAll(async () => {
    await close();
  });

  it('fiscal year start: admins only, validated with its path, audited, default January', async () => {
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { fiscalYearStartMonth: 7 } })).status).toBe(403);
    signInAs(ids['admin@aldervane.test']);
    for (const bad of [0, 13, 6.5, '7']) {
      const r = await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { fiscalYearStartMonth: bad } });
      expect(r.status).toBe(422);
      expect(r.body.problems[0].path).toBe('fiscalYearStartMonth');
    }
    const auditBefore = Number((await k('audit_log').where({ entity: 'workspace_settings' }).count({ n: '*' }))[0].n);
    const ok = await call(patchSettings, { workspace: WS }, { method: 'PATCH', body: { fiscalYearStartMonth: 7 } });
    expect(ok.status).toBe(200);
    expect(ok.body.settings.fiscalYearStartMonth).toBe(7);
    const audits = await k('audit_log').where({ entity: 'workspace_settings' }).orderBy('id');
    expect(audits).toHaveLength(auditBefore + 1);
    expect(JSON.parse(audits.at(-1).before).fiscalYearStartMonth).toBe(1); // the default
    expect(JSON.parse(audits.at(-1).after).fiscalYearStartMonth).toBe(7);
  });

  it('freezes the proposal and the pinned run under one hash; the download is exactly the hashed bytes', async () => {
    const id = await insertDraftCase(k, WS, 'Frozen proposal');
    // a plan starting in January 2027 with a budget for period 1; a July fiscal year makes period 1 FY2027
    await k('business_cases').where({ id }).update({ plan: JSON.stringify({ budgets: { '0': 5_000_000, '1': 6_000_000 }, swapsPerMonth: 1, startMonth: '2027-01' }) });
    const analyst = ids['analyst@aldervane.test'];
    await k('monte_carlo_runs').insert({
      id: 'frozen-pin', workspaceId, caseId: id, status: 'done', iterations: 10, done: 10,
      spec: JSON.stringify({ iterations: 10, seed: 99, sampleFailures: true, distributions: [], measure: 'proposal' }),
      result: JSON.stringify({ iterations: 10, trucks: [], fleet: { deltaNpv: runSummary(1), bestNpv: runSummary(2), proposalNpv: runSummary(3) } }),
      createdBy: analyst, createdAt: '2026-12-01T10:00:00.000Z', finishedAt: '2026-12-01T10:00:05.000Z',
    });
    await k('business_cases').where({ id }).update({ pinnedRunId: 'frozen-pin' });

    signInAs(analyst);
    expect((await call(submit, p(id), { body: {} })).status).toBe(200);
    // while submitted the summary is the snapshot's, with the pinned run
    const submitted = await call(decisionSummary, p(id));
    expect(submitted.status).toBe(200);
    expect(submitted.body.source).toBe('submitted');
    expect(submitted.body.risk).toMatchObject({ runId: 'frozen-pin', seed: 99, iterations: 10, p10: 0, p50: 3.5, p90: 6, probabilityOfLoss: 0.125 });

    signInAs(ids['approver@aldervane.test']);
    expect((await call(decide, p(id), { body: { decision: 'approve', comment: 'ok' } })).status).toBe(200);
    const row = await k('business_cases').where({ id }).first();
    const record = readFrozenRecord(row.frozenRecord)!;
    expect(record.format).toBe('frozen-record/1');
    // the hash covers the whole record: case, result, proposal, summary and run
    expect(row.frozenHash).toBe(createHash('sha256').update(Buffer.from(row.frozenRecord, 'utf8')).digest('hex'));
    expect(record.case.trucks).toHaveLength(24);
    expect(record.result.format).toBe('case-result/1');
    expect(record.proposal.settings).toEqual({ budgets: { '0': 5_000_000, '1': 6_000_000 }, swapsPerMonth: 1, startMonth: '2027-01', capacityByMonth: {}, maxDelayMonths: 6 });
    expect(record.proposal.chosenTrucks.length).toBeGreaterThan(0);
    expect(record.proposal.schedule).toHaveLength(record.proposal.chosenTrucks.length);
    expect(record.summary.chosenTrucks).toEqual(record.proposal.chosenTrucks);
    expect(record.summary.fiscalYearStartMonth).toBe(7);
    // periods 0 and 1 both start in January 2027, in July 2026 – June 2027: FY2027 holds the two budgets;
    // repowers due in later periods (their capital is planned when the swap is due) have no budget and later years
    const fy2027 = record.summary.capitalByFiscalYear.find((fy) => fy.fiscalYear === 'FY2027');
    expect(fy2027).toBeDefined();
    expect(fy2027!.capital).toBeLessThanOrEqual(11_000_000);
    for (const fy of record.summary.capitalByFiscalYear.filter((f) => f.fiscalYear !== 'FY2027')) {
      expect(fy.fiscalYear > 'FY2027').toBe(true);
      expect(fy.budget).toBeNull();
    }
    expect(record.summary.topDrivers).toHaveLength(3);
    expect((record.pinnedRun as { id: string }).id).toBe('frozen-pin');
    expect(verifyFrozen(row)).toBe(true);
    expect((await call(history, p(id))).body.frozen).toEqual({ hash: row.frozenHash, verifies: true });

    // the approved summary is read from the record
    const frozenSummary = await call(decisionSummary, p(id));
    expect(frozenSummary.body.source).toBe('frozen');
    expect(frozenSummary.body.recordVerifies).toBe(true);
    expect(frozenSummary.body.gainVsRebuildAll).toBe(record.summary.gainVsRebuildAll);

    // the download: the exact bytes, as an attachment, hashing to the stored hash
    signInAs(ids['viewer@aldervane.test']);
    const dl = await call(frozenRecord, p(id));
    expect(dl.status).toBe(200);
    expect(dl.response.headers.get('content-type')).toBe('application/json');
    expect(dl.response.headers.get('content-disposition')).toBe(`attachment; filename="case-${id}-frozen-record.json"`);
    const bytes = Buffer.from(await dl.response.arrayBuffer());
    expect(bytes.equals(Buffer.from(row.frozenRecord, 'utf8'))).toBe(true);
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(row.frozenHash);

    // one changed byte anywhere (the run's seed inside the record) and it does not verify
    const tampered = row.frozenRecord.replace('"seed":99', '"seed":98');
    expect(tampered).not.toBe(row.frozenRecord);
    await k('business_cases').where({ id }).update({ frozenRecord: tampered });
    expect((await call(history, p(id))).body.frozen).toEqual({ hash: row.frozenHash, verifies: false });
    expect((await call(decisionSummary, p(id))).body.recordVerifies).toBe(false);
    const dl2 = await call(frozenRecord, p(id));
    expect(createHash('sha256').update(Buffer.from(await dl2.response.arrayBuffer())).digest('hex')).not.toBe(row.frozenHash);
    // the separate case and result texts must be the record's own
    await k('business_cases').where({ id }).update({ frozenRecord: row.frozenRecord });
    expect(verifyFrozen({ ...row, frozenResult: row.frozenResult.replace(/\d/, (d: string) => String((Number(d) + 1) % 10)) })).toBe(false);
    expect(verifyFrozen(await k('business_cases').where({ id }).first())).toBe(true);
  });

  it('keeps a case approved before records verifying, and downloads its case and result texts as hashed', async () => {
    const id = await insertDraftCase(k, WS, 'Approved long ago');
    const frozenCase = '{"format":"case/1"}';
    const frozenResult = '{"format":"case-result/1"}';
    await k('business_cases').where({ id }).update({ status: 'approved', frozenCase, frozenResult, frozenHash: frozenHashOf(frozenCase, frozenResult) });
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(history, p(id))).body.frozen.verifies).toBe(true);
    const dl = await call(frozenRecord, p(id));
    expect(dl.status).toBe(200);
    const bytes = Buffer.from(await dl.response.arrayBuffer());
    expect(bytes.toString('utf8')).toBe(`${frozenCase}\n${frozenResult}`);
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(frozenHashOf(frozenCase, frozenResult));
  });

  it('answers 404 for a case not yet approved and for another workspace', async () => {
    const id = await insertDraftCase(k, WS, 'Draft only');
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(frozenRecord, p(id))).status).toBe(404);
    const other = await insertDraftCase(k, 'corrin-flats', 'Other site');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(frozenRecord, p(other))).status).toBe(404);
    signInAs(null);
    expect((await call(frozenRecord, p(id))).status).toBe(401);
  });
});
