import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS, apiHeaders } from './support/browser';

/** The link in a message's plain-text part, read from the Outbox page as an admin would. */
async function linkFromOutbox(page: Page, baseURL: string, subject: string, pathPart: string): Promise<string> {
  const item = page.getByTestId('outbox').locator('li').filter({ has: page.getByTestId('outbox-subject').getByText(subject, { exact: true }) }).first();
  // mail is sent after the change commits, so it can reach the sink a moment after the page was made: reload as a person would
  for (let attempt = 0; ; attempt++) {
    await page.goto(`${baseURL}/${WS}/outbox`);
    if ((await item.count()) > 0 || attempt >= 20) break;
    await page.waitForTimeout(500);
  }
  await item.locator('summary').click();
  const href = await item.getByRole('link').filter({ hasText: pathPart }).first().getAttribute('href');
  expect(href).toContain(pathPart);
  return href as string;
}

describe('approval by e-mail, end to end', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;
  const caseName = 'North Pit repower programme 2027';
  let frozenHash = '';

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('the analyst creates the demo case and submits it with a comment', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    const options = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/options`)).json();
    const base = options.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const created = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases`, {
      headers: apiHeaders(baseURL),
      data: { name: caseName, assumptionSetId: base.id, selection: options.trucks.map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(created.status()).toBe(201);
    caseId = (await created.json()).case.id;

    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    const panel = page.getByTestId('approval-panel');
    expect(await panel.getByTestId('case-status').textContent()).toBe('Draft');
    await panel.getByLabel(/Comment/).fill('Base assumptions, whole fleet. Ready for the capex committee.');
    await panel.getByRole('button', { name: 'Submit for approval' }).click();
    await panel.getByText('Submitted; the approvers have been e-mailed.').waitFor();
    expect(await panel.getByTestId('case-status').textContent()).toBe('Waiting for approval');
    expect(await panel.getByRole('button', { name: 'Approve' }).count()).toBe(0);
    await screenshot(page, 'approval-submitted-case-page');
    await signOut(page);
  });

  it('the approver follows the e-mailed link, signs in, and approves with a comment; the record is frozen and verifies', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    const link = await linkFromOutbox(page, baseURL, `Approval requested: ${caseName}`, `/approvals/${caseId}`);
    expect(await page.getByTestId('outbox').locator('li').first().textContent()).toContain('to approver@aldervane.test');
    await screenshot(page, 'outbox-approval-requested');
    await signOut(page);

    await page.goto(link);
    await page.waitForURL((u) => u.pathname === '/sign-in');
    await page.getByLabel('Email').fill('approver@aldervane.test');
    await page.getByLabel('Password').fill('haulcase-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(link);
    const nav = page.getByRole('navigation', { name: 'Workspace' });
    expect(await nav.getByRole('link', { name: /Approvals/ }).getByLabel('1 waiting').count()).toBe(1);
    const panel = page.getByTestId('approval-panel');
    expect(await panel.getByTestId('approval-history').textContent()).toContain('Ready for the capex committee.');
    await panel.getByLabel(/Comment/).fill('Approved at the March capex committee; schedule swaps from Q2.');
    await panel.getByRole('button', { name: 'Approve' }).click();
    await panel.getByText('Approval recorded.').waitFor();
    await panel.getByTestId('frozen-hash').waitFor();
    expect(await panel.getByTestId('case-status').textContent()).toBe('Approved');
    const frozen = await panel.getByTestId('frozen-hash').textContent();
    expect(frozen).toContain('Frozen record verifies');
    frozenHash = (frozen ?? '').match(/[0-9a-f]{64}/)?.[0] ?? '';
    expect(frozenHash).toHaveLength(64);
    await page.getByTestId('frozen-fleet').waitFor();
    expect(await page.getByTestId('frozen-fleet').locator('tbody td').count()).toBe(4);
    await screenshot(page, 'approval-approved-review-page');
    await signOut(page);
  });

  it('the analyst sees the decision, its comment, and the mail that told them', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/approvals`);
    const decided = page.getByTestId('approvals-decided');
    expect(await decided.textContent()).toContain(caseName);
    await decided.getByRole('link', { name: caseName }).click();
    await page.waitForURL(`${baseURL}/${WS}/approvals/${caseId}`);
    const panel = page.getByTestId('approval-panel');
    await panel.getByTestId('approval-history').waitFor();
    const history = await panel.getByTestId('approval-history').textContent();
    expect(history).toContain('Approved by Demo approver');
    expect(history).toContain('schedule swaps from Q2');
    expect(await panel.getByRole('button', { name: 'New revision' }).count()).toBe(1);

    // The workbook of the approved case carries who approved it, when, and the hash.
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download workbook (XLSX)' }).click()]);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile((await download.path()) as string);
    const cover = wb.getWorksheet('Cover') as ExcelJS.Worksheet;
    const label = (text: string) => {
      let found: unknown;
      cover.eachRow((row) => {
        if (row.getCell(1).value === text) found = row.getCell(2).value;
      });
      return found;
    };
    expect(label('Approved by')).toContain('approver@aldervane.test');
    expect(String(label('Approved at'))).toMatch(/^\d{4}-\d\d-\d\dT/);
    expect(label('Record hash (SHA-256)')).toBe(frozenHash);
    await signOut(page);

    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/outbox`);
    const decision = page.getByTestId('outbox').locator('li').filter({ hasText: `Approved: ${caseName}` });
    expect(await decision.textContent()).toContain('to analyst@aldervane.test');
  });

  it('an admin invites a new approver, whose e-mailed link lets them create an account and join', async () => {
    await page.goto(`${baseURL}/${WS}/members`);
    await page.getByLabel('Email').fill('not-an-address');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Enter a valid email address.').waitFor();
    await page.getByLabel('Email').fill('capex.approver@aldervane.test');
    await page.getByLabel('Role').selectOption('approver');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Invitation sent to capex.approver@aldervane.test.').waitFor();
    await page.getByTestId('invitations-table').getByText('capex.approver@aldervane.test').waitFor();
    await screenshot(page, 'members-invite');
    const link = await linkFromOutbox(page, baseURL, 'You are invited to Aldervane Copper — North Pit on Haulcase', '/invite/');
    await signOut(page);

    await page.goto(link);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Join a workspace');
    await page.getByLabel('Your name').fill('Capex approver');
    await page.getByLabel('Choose a password').fill('copper-and-diesel-2027');
    await page.getByLabel('Repeat the password').fill('copper-and-diesel-2027');
    await screenshot(page, 'invite-accept');
    await page.getByRole('button', { name: 'Create my account and join' }).click();
    await page.waitForURL(`${baseURL}/${WS}`);
    expect(await page.getByTestId('current-role').textContent()).toBe('Approver');
    await signOut(page);

    await page.goto(link);
    expect(await page.getByTestId('invite-error').textContent()).toMatch(/already been used/);
  });
});
