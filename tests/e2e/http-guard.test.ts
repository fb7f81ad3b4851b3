import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page, Response } from 'playwright-core';
import { freePort } from '../support/ports';
import { apiHeaders, openBrowser, signIn, signOut, WS } from './support/browser';

declare global {
  interface Window {
    __cspViolations?: string[];
  }
}

const ASSUMPTIONS = {
  discountRate: 0.08, timing: 'end-of-year', horizonYears: null, inflation: 0.025, fuelPrice: 1.05, fuelEscalation: 0.03,
  fuelDensityKgPerL: 0.835, co2KgPerLitre: 2.697, lubePrice: 4.2, labourRate: 115, carbonPrice: 0, carbonEscalation: 0,
  marginPerTonne: 2.5, taxRate: 0.3, depreciation: { method: 'macrs', years: 7 }, rebuildAccounting: 'expense',
};

/**
 * A text/plain form sends `name=value`: split a JSON text at a string value so
 * the `=` lands inside it, and the body parses as the JSON the route takes.
 */
function jsonForm(action: string, frame: string, json: string, splitAt: string): string {
  const at = json.indexOf(splitAt) + splitAt.length;
  const attr = (s: string) => s.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;');
  return `<iframe name="${frame}"></iframe>
<form method="POST" enctype="text/plain" action="${attr(action)}" target="${frame}">
  <input type="hidden" name="${attr(json.slice(0, at))}" value="${attr(json.slice(at))}">
</form>`;
}

/** What another site on the same host (another port) would serve: forms and no-cors fetches at the app's API. */
function attackPage(api: string, caseId: number): string {
  const set = JSON.stringify({ name: 'Forged set', notes: '', assumptions: ASSUMPTIONS });
  const approve = JSON.stringify({ decision: 'approve', comment: '' });
  const invite = JSON.stringify({ email: 'mallory@example.test', role: 'admin' });
  return `<!doctype html><html><head><title>pending</title></head><body>
${jsonForm(`${api}/assumption-sets`, 'f1', set, '"notes":"')}
${jsonForm(`${api}/cases/${caseId}/decisions`, 'f2', approve, '"comment":"')}
<script>
  for (const f of document.forms) f.submit();
  const send = (url, body) => fetch(url, { method: 'POST', mode: 'no-cors', credentials: 'include', headers: { 'content-type': 'text/plain' }, body }).catch(() => {});
  Promise.all([
    send(${JSON.stringify(`${api}/invitations`)}, ${JSON.stringify(invite)}),
    send(${JSON.stringify(`${api}/cases/${caseId}/decisions`)}, ${JSON.stringify(approve)}),
    send(${JSON.stringify(`${api}/assumption-sets`)}, ${JSON.stringify(set)}),
  ]).then(() => { document.title = 'sent'; });
</script></body></html>`;
}

describe('a page on another port of the same host cannot act for a signed-in admin', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let attacker: http.Server;
  let attackerURL: string;
  let caseId: number;
  let html = '';

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
    const port = await freePort();
    attacker = http.createServer((_req, res) => {
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
      res.end(html);
    });
    await new Promise<void>((r) => attacker.listen(port, '127.0.0.1', r));
    attackerURL = `http://127.0.0.1:${port}/`;
  });
  afterAll(async () => {
    await new Promise((r) => attacker.close(r));
    await close();
  });

  it('refuses its text/plain forms and no-cors fetches (403), and nothing changes', async () => {
    const api = `${baseURL}/api/workspaces/${WS}`;
    // a case waiting for approval, made by the analyst through the app
    await signIn(page, baseURL, 'analyst@aldervane.test');
    const opts = await (await context.request.get(`${api}/cases/options`)).json();
    const base = opts.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const made = await context.request.post(`${api}/cases`, {
      headers: apiHeaders(baseURL),
      data: { name: 'Forgery target', assumptionSetId: base.id, selection: opts.trucks.slice(0, 2).map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(made.status()).toBe(201);
    caseId = (await made.json()).case.id;
    expect((await context.request.post(`${api}/cases/${caseId}/submit`, { headers: apiHeaders(baseURL), data: {} })).status()).toBe(200);
    await signOut(page);

    await signIn(page, baseURL, 'admin@aldervane.test');
    const setsBefore = (await (await context.request.get(`${api}/assumption-sets`)).json()).items.map((s: { name: string }) => s.name);
    const invitesBefore = (await (await context.request.get(`${api}/invitations`)).json()).invitations;

    html = attackPage(api, caseId);
    const answers: Array<{ url: string; status: number; cookie: boolean; origin: string | undefined }> = [];
    const seen: Promise<void>[] = [];
    page.on('response', (res) => {
      const req = res.request();
      if (req.method() !== 'POST' || !req.url().startsWith(`${baseURL}/api/`)) return;
      seen.push(
        req.allHeaders().then((h) => {
          answers.push({ url: req.url(), status: res.status(), cookie: /next-auth\.session-token=/.test(h.cookie ?? ''), origin: h.origin });
        }),
      );
    });
    await page.goto(attackerURL);
    await page.waitForFunction(() => document.title === 'sent');
    await expect.poll(() => answers.length, { timeout: 15_000 }).toBe(5);
    await Promise.all(seen);
    console.log('[http-guard e2e] attack answers', JSON.stringify(answers));

    const attackerOrigin = attackerURL.replace(/\/$/, '');
    for (const a of answers) {
      // refused by the origin rule (the admin may do all three: without the rule these would be 200/201, or 401 without the cookie)
      expect(a.status, a.url).toBe(403);
    }
    // the browser sent the admin's session cookie with them (same site): without the rule they would have been obeyed.
    // (Playwright reports the full request headers for the form posts; for the no-cors fetches it often has only the page's.)
    const full = answers.filter((a) => a.origin);
    expect(full.length).toBeGreaterThanOrEqual(2);
    for (const a of full) {
      expect(a.origin, a.url).toBe(attackerOrigin);
      expect(a.cookie, a.url).toBe(true);
    }

    // nothing changed, seen through the API as the admin
    const sets = (await (await context.request.get(`${api}/assumption-sets`)).json()).items.map((s: { name: string }) => s.name);
    expect(sets).toEqual(setsBefore);
    expect(sets).not.toContain('Forged set');
    const invites = (await (await context.request.get(`${api}/invitations`)).json()).invitations;
    expect(invites).toEqual(invitesBefore);
    const c = (await (await context.request.get(`${api}/cases/${caseId}`)).json()).case;
    expect(c.status).toBe('submitted');

    // the app's own page still writes (a same-origin fetch from the browser)
    await page.goto(`${baseURL}/${WS}/engines`);
    const own = await page.evaluate(async (url) => {
      const r = await fetch(url, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'return', comment: 'Checked the guard.' }) });
      return r.status;
    }, `${api}/cases/${caseId}/decisions`);
    expect(own).toBe(200);
    await signOut(page);
  });
});

describe('pages run under a per-request nonce CSP without violations', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  const refused: string[] = [];

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
    page.on('console', (m) => {
      if (/Refused to|Content Security Policy/i.test(m.text())) refused.push(m.text());
    });
    await context.addInitScript(() => {
      document.addEventListener('securitypolicyviolation', (e) => {
        (window.__cspViolations ??= []).push(`${e.violatedDirective} ${e.blockedURI}`);
      });
    });
  });
  afterAll(async () => close());

  const nonceOf = (csp: string) => /'nonce-([^']+)'/.exec(csp)?.[1];

  /** The policy allows scripts by nonce only, and every script tag the server wrote carries this response's nonce. */
  async function expectNonceScripts(res: Response | null) {
    const csp = res!.headers()['content-security-policy'];
    expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{16,}' 'strict-dynamic'/);
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(csp).toContain("frame-ancestors 'none'");
    const tags = (await res!.text()).match(/<script\b[^>]*>/g) ?? [];
    expect(tags.length).toBeGreaterThan(0);
    for (const t of tags) expect(t).toContain(`nonce="${nonceOf(csp)}"`);
    return csp;
  }

  it('the sign-in page: a fresh nonce on every load, on every script, and the form works', async () => {
    const first = await expectNonceScripts(await page.goto(`${baseURL}/sign-in`));
    const second = await expectNonceScripts(await page.goto(`${baseURL}/sign-in`));
    expect(nonceOf(second)).not.toBe(nonceOf(first));
    // signing in goes through next-auth's client code: it runs only if the scripts were allowed
    await signIn(page, baseURL, 'viewer@aldervane.test');
    expect(await page.evaluate(() => window.__cspViolations ?? [])).toEqual([]);
  });

  it('a signed-in page renders its client-loaded table with no violation', async () => {
    await expectNonceScripts(await page.goto(`${baseURL}/${WS}/engines`));
    // the table is filled from the API by SWR in the browser
    await page.getByTestId('engine-table').locator('tbody tr').first().waitFor();
    expect(await page.getByTestId('engine-table').locator('tbody tr').count()).toBeGreaterThan(0);
    // a client-side navigation loads more chunks under 'strict-dynamic'
    await page.getByRole('navigation', { name: 'Workspace' }).getByRole('link', { name: 'Assumptions' }).click();
    await page.getByTestId('assumption-table').waitFor();
    expect(await page.evaluate(() => window.__cspViolations ?? [])).toEqual([]);
    expect(refused).toEqual([]);
    await signOut(page);
  });
});
