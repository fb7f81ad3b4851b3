/**
 * Issue 14: one proposal, read and decided on its own figures. The results,
 * plan and approval pages show the same proposal figures for the demo case;
 * an approver reads the decision summary, approves, downloads the frozen
 * record and recomputes its SHA-256; one changed byte of the stored record
 * and the page says it does not verify.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { apiHeaders, openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

const text = async (page: Page, testId: string) => ((await page.getByTestId(testId).first().textContent()) ?? '').trim();

describe('the decision summary and the frozen record', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;
  let runId = '';
  const figures: Record<string, { capital: string; gain: string }> = {};

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('the results, plan and case pages show the same proposal figures for the demo case', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    // a copy of the seeded demo case (same assumptions, trucks and plan: budgets 3 M now, 12 M and 10 M), so other files keep theirs
    const list = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases`)).json();
    const demo = list.cases.find((c: { name: string }) => c.name === 'North Pit fleet — base assumptions');
    expect(demo.plan.budgets).toEqual({ '0': 3_000_000, '1': 12_000_000, '2': 10_000_000 });
    const copy = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases/${demo.id}/copy`, { headers: apiHeaders(baseURL), data: { name: 'Proposal for the capex committee' } });
    expect(copy.status()).toBe(201);
    caseId = (await copy.json()).case.id;

    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    const summary = page.getByTestId('decision-summary');
    await summary.waitFor();
    expect(await summary.getAttribute('data-source')).toBe('live');
    figures.summary = { capital: await text(page, 'ds-total-capital'), gain: await text(page, 'ds-gain') };
    await page.getByTestId('proposal-headline').waitFor();
    figures.results = { capital: await text(page, 'proposal-capital'), gain: await text(page, 'proposal-gain') };
    expect(figures.results).toEqual(figures.summary);
    // capital by fiscal year (January start: FY2027 for the plan's 2027 periods) and the comparisons, labelled
    expect(await page.getByTestId('proposal-fy-FY2027').count()).toBe(1);
    expect(await page.getByTestId('proposal-headline').textContent()).toContain('Comparison: unconstrained best mix');
    expect(await page.getByTestId('proposal-headline').textContent()).toContain('Comparison: repower every truck');
    // the ranking marks the proposed trucks, as many as the summary lists
    const chosen = ((await text(page, 'ds-chosen')).match(/\((\d+)\)/) ?? [])[1];
    expect(Number(chosen)).toBeGreaterThan(0);
    expect(await page.getByTestId('truck-table').locator('tr[data-in-proposal="yes"]').count()).toBe(Number(chosen));
    expect(await text(page, 'ds-no-run')).toContain('No Monte Carlo run is pinned');
    expect((await page.getByTestId('decision-summary').textContent()) ?? '').not.toContain('Submitted without');
    expect(await page.getByTestId('ds-drivers').locator('tbody tr').count()).toBe(3);
    await screenshot(page, 'decision-summary-case-page');

    await page.goto(`${baseURL}/${WS}/cases/${caseId}/plan`);
    await page.getByTestId('plan-proposal').waitFor();
    figures.plan = { capital: await text(page, 'plan-proposal-capital'), gain: await text(page, 'plan-proposal-gain') };
    expect(figures.plan).toEqual(figures.summary);
    expect(await page.getByTestId('ranking-table').locator('tr[data-in-proposal="yes"]').count()).toBe(Number(chosen));
    expect(await page.getByTestId('programme-periods').textContent()).toContain('FY2027 (now)');
    await screenshot(page, 'decision-summary-plan-page');

    // a Monte Carlo run on the proposal, pinned before submission (the risk page's own flow is tested in risk.test.ts)
    const started = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/monte-carlo`, {
      headers: apiHeaders(baseURL),
      data: { iterations: 200, seed: 2027, sampleFailures: true, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'uniform', min: 0.9, max: 1.3 } }], measure: 'proposal' },
    });
    expect(started.status()).toBe(202);
    runId = (await started.json()).run.id;
    let status = 'running';
    for (let i = 0; i < 240 && status === 'running'; i++) {
      await page.waitForTimeout(250);
      status = (await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/monte-carlo/${runId}`)).json()).run.status;
    }
    expect(status).toBe('done');
    const version = (await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}`)).json()).case.version;
    const pinned = await context.request.put(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/pinned-run`, { headers: apiHeaders(baseURL), data: { runId, version } });
    expect(pinned.status()).toBe(200);

    // submitted: the summary is the snapshot's
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    const panel = page.getByTestId('approval-panel');
    await panel.getByLabel(/Comment/).fill('The proposal within the saved budgets.');
    await panel.getByRole('button', { name: 'Submit for approval' }).click();
    await panel.getByText('Submitted; the approvers have been e-mailed.').waitFor();
    await signOut(page);
  });

  it('an approver reads the decision summary, approves, downloads the frozen record and finds its SHA-256 equal to the hash shown', async () => {
    await signIn(page, baseURL, 'approver@aldervane.test');
    await page.goto(`${baseURL}/${WS}/approvals/${caseId}`);
    const summary = page.getByTestId('decision-summary');
    await summary.waitFor();
    expect(await summary.getAttribute('data-source')).toBe('submitted');
    expect(await text(page, 'decision-source')).toContain('snapshot taken at submission');
    expect(await page.getByText('Figures are computed from the live fleet data until the case is approved').count()).toBe(0);
    figures.approval = { capital: await text(page, 'ds-total-capital'), gain: await text(page, 'ds-gain') };
    expect(figures.approval).toEqual(figures.summary);
    expect(await page.getByTestId('ds-capital-FY2027').count()).toBe(1);
    // the run pinned before submission, named with its settings, seed, author and time
    const run = await text(page, 'ds-risk-run');
    expect(run).toContain(`Monte Carlo run ${runId.slice(0, 8)}`);
    expect(run).toContain('200 iterations, seed 2027');
    expect(run).toContain('by Demo analyst');
    expect(await text(page, 'ds-prob-loss')).toMatch(/^\d+\.\d %$/);
    for (const id of ['ds-irr', 'ds-mirr', 'ds-payback', 'ds-discounted-payback', 'ds-fuel', 'ds-co2']) expect(await text(page, id)).not.toBe('');
    await screenshot(page, 'decision-summary-approval-submitted');

    const panel = page.getByTestId('approval-panel');
    await panel.getByLabel(/Comment/).fill('Approved on the figures above.');
    await panel.getByRole('button', { name: 'Approve' }).click();
    await panel.getByText('Approval recorded.').waitFor();
    await panel.getByTestId('frozen-hash').waitFor();
    expect(await text(page, 'frozen-verdict')).toBe('✓ Frozen record verifies');
    const shown = await text(page, 'frozen-hash-value');
    expect(shown).toMatch(/^[0-9a-f]{64}$/);
    expect(await panel.getByTestId('frozen-hash').textContent()).toContain(`sha256sum case-${caseId}-frozen-record.json`);

    const [download] = await Promise.all([page.waitForEvent('download'), panel.getByRole('link', { name: 'Download frozen record' }).click()]);
    expect(download.suggestedFilename()).toBe(`case-${caseId}-frozen-record.json`);
    const bytes = fs.readFileSync((await download.path()) as string);
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(shown);
    const record = JSON.parse(bytes.toString('utf8'));
    expect(record.format).toBe('frozen-record/1');
    expect(record.proposal.settings.budgets).toEqual({ '0': 3_000_000, '1': 12_000_000, '2': 10_000_000 });
    expect(record.proposal.chosenTrucks).toHaveLength(Number(((await text(page, 'ds-chosen')).match(/\((\d+)\)/) ?? [])[1]));
    expect(record.pinnedRun.id).toBe(runId);
    expect(record.pinnedRun.seed).toBe(2027);
    expect(record.summary.risk.runId).toBe(runId);

    // approved: the summary comes from the frozen record, with the same figures
    await page.reload();
    await summary.waitFor();
    expect(await summary.getAttribute('data-source')).toBe('frozen');
    expect({ capital: await text(page, 'ds-total-capital'), gain: await text(page, 'ds-gain') }).toEqual(figures.summary);
    expect(await text(page, 'ds-risk-run')).toContain(`Monte Carlo run ${runId.slice(0, 8)}`);
    await screenshot(page, 'decision-summary-approval-approved');
  });

  it('one changed byte of the stored record and the page says it does not verify', async () => {
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    try {
      const row = await k('business_cases').where({ id: caseId }).first('frozenRecord');
      const at = row.frozenRecord.indexOf('"swapsPerMonth":2');
      expect(at).toBeGreaterThan(0);
      const tampered = row.frozenRecord.replace('"swapsPerMonth":2', '"swapsPerMonth":3');
      await k('business_cases').where({ id: caseId }).update({ frozenRecord: tampered });
      await page.reload();
      await page.getByTestId('frozen-hash').waitFor();
      expect(await text(page, 'frozen-verdict')).toBe('✗ Frozen record does not verify: the stored record was altered');
      await page.getByTestId('ds-not-verified').waitFor();
      await screenshot(page, 'frozen-record-does-not-verify');
      await k('business_cases').where({ id: caseId }).update({ frozenRecord: row.frozenRecord });
      await page.reload();
      await page.getByTestId('frozen-hash').waitFor();
      expect(await text(page, 'frozen-verdict')).toBe('✓ Frozen record verifies');
    } finally {
      await k.destroy();
    }
    await signOut(page);
  });

  it('an admin sets the fiscal year to start in July; the plan and the summary name fiscal years by it', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/settings`);
    const form = page.getByTestId('display-settings');
    await form.getByLabel('Fiscal year starts in').selectOption({ label: 'July' });
    expect(await form.textContent()).toContain('FY2027 runs from July 2026 to June 2027');
    await form.getByRole('button', { name: 'Save display settings' }).click();
    await form.getByText('Saved.').waitFor();
    try {
      // a new draft of the demo plan (first month 2027-01): period 2 is 2028-01 – 2028-12, which starts in FY2028 (July 2027 – June 2028)
      const list = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases`)).json();
      const demo = list.cases.find((c: { name: string }) => c.name === 'North Pit fleet — base assumptions');
      const copy = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases/${demo.id}/copy`, { headers: apiHeaders(baseURL), data: { name: 'July fiscal year' } });
      const id = (await copy.json()).case.id;
      await page.goto(`${baseURL}/${WS}/cases/${id}/plan`);
      await page.getByTestId('programme-periods').waitFor();
      expect(await page.getByLabel('FY2028 budget (USD k)', { exact: true }).inputValue()).toBe('10,000');
      await screenshot(page, 'plan-july-fiscal-year');
    } finally {
      await page.goto(`${baseURL}/${WS}/settings`);
      await form.getByLabel('Fiscal year starts in').selectOption({ label: 'January' });
      await form.getByRole('button', { name: 'Save display settings' }).click();
      await form.getByText('Saved.').waitFor();
    }
    await signOut(page);
  });
});
