/**
 * The decision pack and print: a viewer reads the decision summary on the case
 * page, downloads the decision pack and finds the same headline figures in it;
 * printing the results page of a 28-truck case gives several pages without the
 * rail, navigation or controls; the approval page offers the pack too.
 */
import fs from 'node:fs';
import type { Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createKnex } from '@/lib/db/connection';
import { firstPageInkShare, pdfPageCount, pdfToText } from '../support/pdf-text';
import { apiHeaders, openBrowser, screenshot, signIn, signOut } from './support/browser';
import { createSyntheticWorkspace } from './support/synthetic-fleet';

// a workspace of 28 trucks made from the demo's (the demo itself has 24)
const WS = 'synthetic-twenty-eight';
const WS_NAME = 'Synthetic fleet (28 trucks)';

const NAVIGATION = ['Fleet register', 'Engine library', 'Audit log', 'Sign out', 'All cases', 'Methodology: how these figures', 'Download workbook', 'Download decision pack', 'Summary CSV'];
const squash = (s: string) => s.replace(/\s+/g, ' ');

describe('decision pack and print', () => {
  let b: Awaited<ReturnType<typeof openBrowser>>;
  let k: Knex;
  let caseId: number;
  const name = 'North Pit pack and print';

  beforeAll(async () => {
    b = await openBrowser();
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await createSyntheticWorkspace(k, WS, 28, 'analyst@aldervane.test');
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    const viewer = await k('users').where({ email: 'viewer@aldervane.test' }).first('id');
    await k('memberships').insert({ workspaceId: ws.id, userId: viewer.id, role: 'viewer', createdAt: new Date().toISOString() });
    await signIn(b.page, b.baseURL, 'analyst@aldervane.test');
    const opts = await (await b.page.request.get(`${b.baseURL}/api/workspaces/${WS}/cases/options`)).json();
    const base = opts.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const trucks = opts.trucks.slice(0, 28);
    expect(trucks).toHaveLength(28);
    const made = await b.page.request.post(`${b.baseURL}/api/workspaces/${WS}/cases`, {
      headers: apiHeaders(b.baseURL),
      data: { name, assumptionSetId: base.id, selection: trucks.map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(made.status()).toBe(201);
    caseId = (await made.json()).case.id;
    await signOut(b.page);
  });
  afterAll(async () => {
    await k?.('workspaces').where({ slug: WS }).delete();
    await k?.destroy();
    await b?.close();
  });

  it('a viewer downloads the decision pack from the case page and it holds the figures the page shows', async () => {
    const { page, baseURL } = b;
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    await page.getByRole('heading', { name }).first().waitFor();
    await page.getByTestId('ds-gain').waitFor();
    const gain = (await page.getByTestId('ds-gain').innerText()).trim();
    const capital = (await page.getByTestId('ds-total-capital').innerText()).trim();
    const fyRows = await page.getByTestId('ds-capital').locator('tbody tr[data-testid^="ds-capital-FY"]').all();
    const fy: Array<[string, string]> = [];
    for (const r of fyRows) fy.push([(await r.getAttribute('data-testid'))!.replace('ds-capital-', ''), (await r.getByTestId('ds-capital-amount').innerText()).trim()]);
    expect(fy.length).toBeGreaterThan(0);

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download decision pack (PDF)' }).click()]);
    expect(download.suggestedFilename()).toBe(`${name} decision pack.pdf`);
    const pdf = fs.readFileSync(await download.path());
    const text = pdfToText(pdf);
    expect(text).toContain(name);
    expect(text).toMatch(new RegExp(`Capital asked \\(USD k\\)\\s+${capital.replace(/[()]/g, '\\$&')}`));
    expect(text).toMatch(new RegExp(`Gain vs rebuilding every engine\\s+${gain.replace(/[()]/g, '\\$&')}`));
    for (const [label, amount] of fy) expect(text).toMatch(new RegExp(`${label}\\s+\\S+( limit)?\\s+${amount.replace(/[()]/g, '\\$&')}`));
    expect(text).toMatch(/Engine swaps, electrical work and\s+load testing/);
    expect(firstPageInkShare(pdf)).toBeGreaterThan(0.01);
    // the plan and approval pages quote the same proposal
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/plan`);
    await page.getByTestId('plan-proposal-gain').waitFor();
    expect((await page.getByTestId('plan-proposal-gain').innerText()).trim()).toBe(gain);
    expect((await page.getByTestId('plan-proposal-capital').innerText()).trim()).toBe(capital);
    await page.goto(`${baseURL}/${WS}/approvals/${caseId}`);
    await page.getByTestId('ds-gain').waitFor();
    expect((await page.getByTestId('ds-gain').innerText()).trim()).toBe(gain);
    expect((await page.getByTestId('ds-total-capital').innerText()).trim()).toBe(capital);
    fs.mkdirSync('test-results/screens', { recursive: true });
    fs.writeFileSync('test-results/screens/decision-pack.pdf', pdf);
  });

  it('prints the results page of a 28-truck case over several pages without the rail or controls', async () => {
    const { page, baseURL } = b;
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    await page.getByTestId('ds-gain').waitFor();
    await page.getByRole('link', { name: 'S-028' }).first().waitFor();
    await page.emulateMedia({ media: 'print' });
    await screenshot(page, 'case-results-print');
    // as a person prints it: the stylesheet's page size (A4 landscape)
    const pdf = await page.pdf({ preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    fs.writeFileSync('test-results/screens/case-results-print.pdf', pdf);
    expect(pdfPageCount(pdf)).toBeGreaterThan(1);
    const text = pdfToText(pdf, false);
    const flat = squash(text);
    for (const n of NAVIGATION) expect(flat).not.toContain(n);
    // the header line: case, page, workspace, print date
    expect(flat).toMatch(new RegExp(`${name} · Results · ${WS_NAME.replace(/[()]/g, '\\$&')} Printed \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} UTC`));
    expect(flat).toContain('Decision summary');
    // the whole truck table flows over the pages: its last truck is printed too
    const rows = text.match(/\bS-0\d\d\b/g) ?? [];
    expect(new Set(rows).size).toBe(28);
    // the truck table's column headings (sort buttons on screen) are printed
    expect(flat).toMatch(/Truck\s.*Best\s/);
    // printed at twice the size the truck table runs over a page break: its heading row is printed again on each page
    await page.emulateMedia({ media: 'print' });
    const portrait = await page.pdf({ preferCSSPageSize: true, scale: 2, printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    const pagesWithRows = pdfToText(portrait, false).split('\f').filter((p) => /\bS-0\d\d (Keep|Rebuild|Repower) /.test(squash(p))); // a truck row: unit, then its best policy
    expect(pagesWithRows.length).toBeGreaterThan(1);
    for (const p of pagesWithRows) expect(squash(p)).toMatch(/Fails before overhaul, rebuild NPV keep \(USD k\)/);
  });

  it('the approval page offers the decision pack and prints without its buttons', async () => {
    const { page, baseURL } = b;
    await page.goto(`${baseURL}/${WS}/approvals/${caseId}`);
    await page.getByTestId('ds-gain').waitFor();
    const link = page.getByRole('link', { name: 'Download decision pack (PDF)' });
    expect(await link.getAttribute('href')).toBe(`/api/workspaces/${WS}/cases/${caseId}/decision-pack`);
    await page.emulateMedia({ media: 'print' });
    const flat = squash(pdfToText(await page.pdf({ preferCSSPageSize: true }), false));
    await page.emulateMedia({ media: 'screen' });
    expect(flat).toContain(`${name} · Approval`);
    expect(flat).toContain('Decision summary');
    for (const n of [...NAVIGATION, 'Open the case']) expect(flat).not.toContain(n);
  });
  it('prints the plan, truck and risk pages with the header line and without navigation or controls', async () => {
    const { page, baseURL } = b;
    const pages: Array<[string, string, string]> = [
      [`/${WS}/cases/${caseId}/plan`, 'Fleet programme and ranking', 'plan'],
      [`/${WS}/cases/${caseId}/trucks/S-001`, 'Truck S-001', 'truck'],
      [`/${WS}/cases/${caseId}/risk`, 'Sensitivity and risk', 'risk'],
    ];
    for (const [path, what, shot] of pages) {
      await page.goto(`${baseURL}${path}`, { timeout: 60_000 });
      await page.getByRole('main').getByRole('heading').first().waitFor();
      // the page's data has loaded (no panel still busy)
      await page.waitForFunction(() => document.querySelectorAll('[aria-busy="true"]').length === 0, undefined, { timeout: 60_000 });
      await page.emulateMedia({ media: 'print' });
      await screenshot(page, `case-${shot}-print`);
      const flat = squash(pdfToText(await page.pdf({ preferCSSPageSize: true }), false));
      await page.emulateMedia({ media: 'screen' });
      expect(flat).toContain(`${name} · ${what} ·`);
      for (const n of NAVIGATION.filter((x) => !x.startsWith('Download'))) expect(flat).not.toContain(n);
    }
  });

});
