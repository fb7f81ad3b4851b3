import type { Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { GET as decisionPack } from '@/app/api/workspaces/[workspace]/cases/[id]/decision-pack/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import { GET as getSummary } from '@/app/api/workspaces/[workspace]/cases/[id]/decision-summary/route';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import type { DecisionSummary } from '@/lib/cases/decision-summary';
import { formatMoney, formatPercent } from '@/lib/format';
import { firstPageInkShare, pdfPageCount, pdfToText } from '../support/pdf-text';
import { call } from './support/call';
import { openMailDb } from './support/mail-db';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const p = (id: number) => ({ workspace: WS, id: String(id) });
// the case pages' money format: thousands, negatives in the workspace's style (the demo: parentheses)
const k = (x: number) => formatMoney(x, { scale: 'k', negative: 'parentheses' });
const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

describe.each([{ name: 'SQLite', pg: false }, { name: 'PostgreSQL', pg: true }])('decision pack on $name', ({ pg }) => {
  let kx: Knex;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  let demoId: number;

  /** a copy of the demo case (its 28 trucks, budgets and start month) under another name */
  async function copyDemo(name: string): Promise<number> {
    const demo = await kx('business_cases').where({ id: demoId }).first();
    const now = new Date().toISOString();
    const [row] = await kx('business_cases')
      .insert({ workspaceId: demo.workspaceId, name, assumptionSetId: demo.assumptionSetId, selection: demo.selection, plan: demo.plan, status: 'draft', version: 1, createdAt: now, updatedAt: now })
      .returning('id');
    return typeof row === 'object' ? row.id : row;
  }

  beforeAll(async () => {
    ({ k: kx, close, ids } = await openMailDb(pg));
    const ws = await kx('workspaces').where({ slug: WS }).first('id');
    demoId = (await kx('business_cases').where({ workspaceId: ws.id }).orderBy('id').first('id')).id;
  });
  afterAll(async () => close());

  it('answers 401 signed out, 403 to a non-member and 404 for an unknown case', async () => {
    signInAs(null);
    expect((await call(decisionPack, p(demoId))).status).toBe(401);
    signInAs(ids['admin@corrin.test']);
    expect((await call(decisionPack, p(demoId))).status).toBe(403);
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(decisionPack, p(999_999))).status).toBe(404);
    expect((await call(decisionPack, { workspace: WS, id: 'x' })).status).toBe(404);
  });

  it('gives a viewer the PDF of the demo case with the figures the case pages show', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const r = await call(decisionPack, p(demoId));
    expect(r.status).toBe(200);
    expect(r.response.headers.get('content-type')).toBe('application/pdf');
    const disposition = r.response.headers.get('content-disposition') as string;
    expect(disposition).toContain(`filename*=UTF-8''${encodeURIComponent('North Pit fleet — base assumptions decision pack.pdf')}`);
    expect(disposition).toContain('filename="North Pit fleet _ base assumptions decision pack.pdf"');
    const pdf = Buffer.from(await r.response.arrayBuffer());
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');

    // the decision summary the case and approval pages show
    const ds = (await call(getSummary, p(demoId))).body as DecisionSummary;
    const text = pdfToText(pdf);
    expect(text).toContain('North Pit fleet — base assumptions');
    expect(text).toMatch(new RegExp(`Capital asked \\(${ds.currency} k\\)\\s+${esc(k(ds.totalCapital))}`));
    expect(text).toMatch(new RegExp(`Gain vs rebuilding every engine\\s+${esc(k(ds.gainVsRebuildAll))}`));
    expect(text).toMatch(new RegExp(`Trucks repowered\\s+${ds.chosenTrucks.length}`));
    expect(text).toMatch(new RegExp(`IRR\\s+${esc(formatPercent(ds.irr, 1))}`));
    // capital by fiscal year with its budget (the demo plan starts January 2027; fiscal years are calendar years)
    expect(ds.capitalByFiscalYear.map((y) => y.fiscalYear)).toContain('FY2027');
    for (const y of ds.capitalByFiscalYear) expect(text).toMatch(new RegExp(`${y.fiscalYear}\\s+${y.budget === null ? 'no limit' : esc(k(y.budget))}\\s+${esc(k(y.capital))}`));
    // the three drivers that swing it most
    for (const d of ds.topDrivers) expect(text).toContain(d.label);
    // every truck of the ranking, the proposal's marked "yes"
    for (const [truck, policy] of Object.entries(ds.policies)) expect(text).toMatch(new RegExp(`\\b${esc(truck)}\\s+${ds.chosenTrucks.includes(truck) ? 'yes\\s+repower' : esc(policy)}`));
    expect(text).toContain('No pinned Monte Carlo run');
    expect(text).toContain('Not submitted yet.');
    expect(text).toMatch(/Engine swaps, electrical work and\s+load testing/);
    expect(pdfPageCount(pdf)).toBeGreaterThan(1);
    expect(firstPageInkShare(pdf)).toBeGreaterThan(0.01);
  });

  it('carries the approval trail and the frozen hash once approved', async () => {
    const id = await copyDemo('Pack approval check');
    await kx('mail_sink').del();
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: { comment: 'For the committee' } })).status).toBe(200);
    // the submission mail quotes the figures the approval page shows and links to the pack
    const submitted = (await call(getSummary, p(id))).body as DecisionSummary;
    expect(submitted.source).toBe('submitted');
    const [ask] = await kx('mail_sink').orderBy('id');
    const packPath = `/api/workspaces/${WS}/cases/${id}/decision-pack`;
    const fyPart = submitted.capitalByFiscalYear.map((y) => `${y.fiscalYear} ${k(y.capital)}`).join('; ');
    expect(ask.subject).toBe('Approval requested: Pack approval check');
    expect(ask.text).toContain(`Capital asked: ${k(submitted.totalCapital)} ${submitted.currency} k to repower ${submitted.chosenTrucks.length} trucks (${fyPart}).`);
    expect(ask.text).toContain(`Expected NPV gain against rebuilding every engine: ${k(submitted.gainVsRebuildAll)} ${submitted.currency} k.`);
    expect(ask.text).toContain(`/${WS}/approvals/${id}`);
    expect(ask.text).toContain(`Decision pack (PDF): http://127.0.0.1${packPath}`);
    expect(ask.html).toContain(`href="http://127.0.0.1${packPath}"`);
    expect(ask.html).toContain('Download the decision pack (PDF)');
    await kx('mail_sink').del();
    signInAs(ids['approver@aldervane.test']);
    expect((await call(decide, p(id), { body: { decision: 'approve', comment: 'Agreed in committee' } })).status).toBe(200);
    const { frozenHash } = await kx('business_cases').where({ id }).first('frozenHash');
    expect(frozenHash).toMatch(/^[0-9a-f]{64}$/);
    // the decision mail to the submitter: the frozen figures and the pack
    const [told] = await kx('mail_sink').orderBy('id');
    expect(told.subject).toBe('Approved: Pack approval check');
    expect(JSON.parse(told.toAddresses)).toEqual(['analyst@aldervane.test']);
    expect(told.text).toContain(`Capital asked: ${k(submitted.totalCapital)} ${submitted.currency} k`);
    expect(told.text).toContain(`Expected NPV gain against rebuilding every engine: ${k(submitted.gainVsRebuildAll)} ${submitted.currency} k.`);
    expect(told.text).toContain(`Decision pack (PDF): http://127.0.0.1${packPath}`);
    signInAs(ids['viewer@aldervane.test']);
    const pdf = Buffer.from(await (await call(decisionPack, p(id))).response.arrayBuffer());
    const text = pdfToText(pdf);
    expect(text).toContain(frozenHash);
    expect(text).toContain('The stored record verifies against this hash');
    expect(text).toMatch(/Status\s+Approved/);
    // the figures of the frozen record's summary
    const ds = (await call(getSummary, p(id))).body as DecisionSummary;
    expect(ds.source).toBe('frozen');
    expect(text).toMatch(new RegExp(`Gain vs rebuilding every engine\\s+${esc(k(ds.gainVsRebuildAll))}`));
    expect(text).toContain('approved without a pinned Monte Carlo run');
    expect(text).toContain('Figures from the frozen record');
    expect(text).toMatch(/Submitted\s+For the committee/);
    expect(text).toMatch(/Approved\s+Agreed in committee/);
    expect(firstPageInkShare(pdf)).toBeGreaterThan(0.01);
  });
});
