import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Knex } from 'knex';
import type { Page } from 'playwright-core';
import { hashPassword } from '@/lib/auth/password';
import { createKnex } from '@/lib/db/connection';
import { nowIso } from '@/lib/time';
import { DEMO_PASSWORD, openBrowser, screenshot, signIn, WS } from './support/browser';

// A member of its own, so the demo accounts the other browser files use keep their roles.
const CONTRACTOR = 'contractor@aldervane.test';

describe('an admin changes a member\'s role and removes them', () => {
  let admin: { page: Page; baseURL: string; close: () => Promise<void> };
  let member: { page: Page; baseURL: string; close: () => Promise<void> };
  let k: Knex;

  beforeAll(async () => {
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const now = nowIso();
    const [row] = await k('users').insert({ email: CONTRACTOR, name: 'Demo contractor', passwordHash: await hashPassword(DEMO_PASSWORD), createdAt: now, updatedAt: now }).returning('id');
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    await k('memberships').insert({ workspaceId: ws.id, userId: typeof row === 'object' ? row.id : row, role: 'viewer', createdAt: now });
    admin = await openBrowser();
    member = await openBrowser();
  });
  afterAll(async () => {
    await admin.close();
    await member.close();
    await k('users').where({ email: CONTRACTOR }).delete();
    await k.destroy();
  });

  it('changes the role, removes the member, and the removed member\'s next page load is refused', async () => {
    const { baseURL } = admin;
    await signIn(member.page, baseURL, CONTRACTOR);
    await member.page.goto(`${baseURL}/${WS}/fleet`);
    expect(await member.page.getByTestId('current-role').textContent()).toBe('Viewer');

    await signIn(admin.page, baseURL, 'admin@aldervane.test');
    await admin.page.goto(`${baseURL}/${WS}/members`);
    const row = admin.page.getByTestId(`member-${CONTRACTOR}`);
    await row.getByLabel(`Access for ${CONTRACTOR}`).selectOption({ label: 'Analyst' });
    await row.getByRole('button', { name: 'Save role' }).click();
    await row.getByText('Demo contractor is now analyst.').waitFor();

    // the contractor's open session: the next page shows the new role, no sign-in needed
    await member.page.reload();
    expect(await member.page.getByTestId('current-role').textContent()).toBe('Analyst');

    // the last admin cannot demote themselves
    const self = admin.page.getByTestId('member-admin@aldervane.test');
    await self.getByLabel('Access for admin@aldervane.test').selectOption({ label: 'Viewer' });
    await self.getByRole('button', { name: 'Save role' }).click();
    await self.getByTestId('member-message').getByText('Demo admin is the only admin of this workspace, so they cannot be made viewer. Make another member an admin first.', { exact: true }).waitFor();
    await screenshot(admin.page, 'members-last-admin');
    await admin.page.reload();

    await row.getByRole('button', { name: `Remove ${CONTRACTOR}` }).click();
    await row.getByText('Remove Demo contractor?').waitFor();
    await screenshot(admin.page, 'members-remove-confirm');
    await row.getByRole('button', { name: 'Yes, remove' }).click();
    await row.waitFor({ state: 'detached' });
    expect(await admin.page.getByTestId('members-table').textContent()).not.toContain(CONTRACTOR);

    const answer = await member.page.reload();
    expect(answer?.status()).toBe(404);
    await member.page.getByText('belongs to a workspace you are not a member of').waitFor();
    const api = await member.page.request.get(`${baseURL}/api/workspaces/${WS}/trucks`);
    expect(api.status()).toBe(403);
    await screenshot(member.page, 'members-removed-refused');

    // the audit log names both changes
    await admin.page.goto(`${baseURL}/${WS}/audit?kind=membership`);
    const table = await admin.page.getByTestId('audit-table').textContent();
    expect(table).toContain('Member Demo contractor');
  });
});
