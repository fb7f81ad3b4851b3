import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as offersRoute from '@/app/api/workspaces/[workspace]/offers/route';
import * as offerRoute from '@/app/api/workspaces/[workspace]/offers/[id]/route';
import * as docs from '@/app/api/workspaces/[workspace]/offers/[id]/documents/route';
import * as doc from '@/app/api/workspaces/[workspace]/offers/[id]/documents/[docId]/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { offerBody, OTHER, snapshotWorkspace, truckBody, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n');
const upload = (name: string) => {
  const f = new FormData();
  f.set('file', new File([PDF as BlobPart], name));
  return f;
};
const del = (id: number, version?: number) =>
  call(offerRoute.DELETE, { workspace: WS, id: String(id) }, { method: 'DELETE', url: `http://127.0.0.1/api/test${version ? `?version=${version}` : ''}` });

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('deleting repower offers on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let engineId: number;
  let uploadDir: string;
  const as = (role: string | null) => signInAs(role ? ids[`${role}@aldervane.test`] : null);
  const stored = (key: string) => path.join(uploadDir, ...key.split('/'));

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-uploads-'));
    process.env.HAULCASE_UPLOAD_DIR = uploadDir;
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    engineId = (await k('engine_types').where({ workspaceId: wsId }).orderBy('id').first('id')).id;
  });
  afterAll(async () => {
    delete process.env.HAULCASE_UPLOAD_DIR;
    fs.rmSync(uploadDir, { recursive: true, force: true });
    await destroy();
  });

  const newOffer = async (key: string): Promise<{ id: number; version: number }> => {
    as('analyst');
    const r = await call(offersRoute.POST, { workspace: WS }, { body: offerBody(key, engineId) });
    expect(r.status).toBe(201);
    return r.body;
  };

  it('refuses (409) to delete an offer that trucks still name, saying which, and changes nothing', async () => {
    const used = await k('trucks').where({ workspaceId: wsId }).whereNotNull('repowerOfferId').orderBy('unitNumber').first('repowerOfferId', 'unitNumber');
    const offer = await k('repower_offers').where({ id: used.repowerOfferId }).first('id', 'version');
    const before = await snapshotWorkspace(k, WS);
    as('analyst');
    const r = await del(offer.id, offer.version);
    expect(r.status).toBe(409);
    expect(r.body.error).toMatch(/still named by \d+ truck\(s\)/);
    expect(r.body.error).toContain(used.unitNumber);
    expect(r.body.error).toMatch(/Nothing was deleted/);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });

  it('refuses (409) while a case that is not frozen names the offer, and allows it once only a frozen case does', async () => {
    const offer = await newOffer('case-only-offer');
    const truck = await k('trucks').where({ workspaceId: wsId }).orderBy('id').first('id');
    const set = await k('assumption_sets').where({ workspaceId: wsId }).orderBy('id').first('id');
    const now = '2026-01-01T00:00:00Z';
    const [row] = await k('business_cases')
      .insert({ workspaceId: wsId, name: 'Uses the offer', assumptionSetId: set.id, selection: JSON.stringify([{ truckId: truck.id, repowerOfferId: offer.id }]), plan: '{}', status: 'draft', version: 1, createdAt: now, updatedAt: now })
      .returning('id');
    const caseId = typeof row === 'object' ? row.id : row;
    const r = await del(offer.id, offer.version);
    expect(r.status).toBe(409);
    expect(r.body.error).toContain('1 business case(s) (“Uses the offer”)');
    expect(await k('repower_offers').where({ id: offer.id }).first('id')).toBeTruthy();
    // an approved case keeps its own frozen copy of the offer, so it no longer holds the offer back
    await k('business_cases').where({ id: caseId }).update({ status: 'approved', frozenCase: '{}' });
    expect((await del(offer.id, offer.version)).status).toBe(204);
  });

  it('deletes an unused offer with its quote documents, removes their stored files after the commit, and audits it', async () => {
    const offer = await newOffer('offer-with-quotes');
    for (const name of ['quote a.pdf', 'quote b.pdf']) {
      expect((await call(docs.POST, { workspace: WS, id: String(offer.id) }, { body: upload(name) })).status).toBe(201);
    }
    const keys = (await k('quote_documents').where({ offerId: offer.id }).select('storageKey')).map((d) => d.storageKey as string);
    expect(keys).toHaveLength(2);
    for (const key of keys) expect(fs.existsSync(stored(key))).toBe(true);

    as('viewer');
    expect((await del(offer.id, offer.version)).status).toBe(403);
    signInAs(ids['admin@corrin.test']);
    expect((await call(offerRoute.DELETE, { workspace: OTHER, id: String(offer.id) }, { method: 'DELETE', url: `http://x/?version=${offer.version}` })).status).toBe(404);
    as('analyst');
    expect((await del(offer.id, offer.version + 1)).status).toBe(409);
    for (const key of keys) expect(fs.existsSync(stored(key)), 'a refused delete keeps the files').toBe(true);

    expect((await del(offer.id, offer.version)).status).toBe(204);
    expect(await k('repower_offers').where({ id: offer.id }).first('id')).toBeUndefined();
    expect(await k('quote_documents').where({ offerId: offer.id })).toHaveLength(0);
    for (const key of keys) expect(fs.existsSync(stored(key)), `${key} removed from storage`).toBe(false);
    const audit = await k('audit_log').where({ entity: 'repower_offer', entityId: String(offer.id), action: 'delete' });
    expect(audit).toHaveLength(1);
  });

  it('removes a single quote document and its stored file', async () => {
    const offer = await newOffer('offer-one-quote');
    const up = await call(docs.POST, { workspace: WS, id: String(offer.id) }, { body: upload('single.pdf') });
    const { storageKey } = await k('quote_documents').where({ id: up.body.id }).first('storageKey');
    expect(fs.existsSync(stored(storageKey))).toBe(true);
    expect((await call(doc.DELETE, { workspace: WS, id: String(offer.id), docId: String(up.body.id) }, { method: 'DELETE' })).status).toBe(204);
    expect(fs.existsSync(stored(storageKey))).toBe(false);
    expect(await k('quote_documents').where({ id: up.body.id }).first()).toBeUndefined();
  });
});
