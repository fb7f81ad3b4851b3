import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import * as docs from '@/app/api/workspaces/[workspace]/offers/[id]/documents/route';
import * as doc from '@/app/api/workspaces/[workspace]/offers/[id]/documents/[docId]/route';
import * as caseFile from '@/app/api/workspaces/[workspace]/case-file/route';
import { validateCase } from '@/lib/validation/case';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { OTHER, snapshotWorkspace, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n');
const PNG = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
const upload = (name: string, bytes: Uint8Array) => {
  const f = new FormData();
  f.set('file', new File([bytes as BlobPart], name));
  return f;
};

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('quote documents and the case file on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let offerId: string;
  let setId: number;
  let uploadDir: string;
  const as = (role: string | null) => signInAs(role ? ids[`${role}@aldervane.test`] : null);

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-uploads-'));
    process.env.HAULCASE_UPLOAD_DIR = uploadDir;
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    offerId = String((await k('repower_offers').where({ workspaceId: ws.id }).orderBy('id').first('id')).id);
    setId = (await k('assumption_sets').where({ workspaceId: ws.id, name: 'Base' }).first('id')).id;
  });
  afterAll(async () => {
    delete process.env.HAULCASE_UPLOAD_DIR;
    fs.rmSync(uploadDir, { recursive: true, force: true });
    await destroy();
  });

  it('stores a quote document name without its bidirectional and control characters', async () => {
    as('analyst');
    // shown as "quoteexe.pdf" if the override were kept
    const r = await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('quote\u202Efdp.exe', PDF) });
    expect(r.status).toBe(201);
    expect(r.body.fileName).toBe('quotefdp.exe');
    expect((await k('quote_documents').where({ id: r.body.id }).first('fileName')).fileName).toBe('quotefdp.exe');
    const dl = await call(doc.GET, { workspace: WS, id: offerId, docId: String(r.body.id) });
    expect(dl.response.headers.get('content-disposition')).toBe(`attachment; filename="quotefdp.exe"; filename*=UTF-8''quotefdp.exe`);
    const isolated = await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('\u2067Kestrel\u2069 \u200Fquote\u0007.pdf', PDF) });
    expect(isolated.body.fileName).toBe('Kestrel quote.pdf');
    as('admin');
    for (const id of [r.body.id, isolated.body.id]) expect((await call(doc.DELETE, { workspace: WS, id: offerId, docId: String(id) }, { method: 'DELETE' })).status).toBe(204);
  });

  it('stores a PDF quote through the storage folder, lists it and lets members download it', async () => {
    as('analyst');
    const r = await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('Kestrel quote 2026.pdf', PDF) });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ fileName: 'Kestrel quote 2026.pdf', contentType: 'application/pdf', size: PDF.length });
    expect(r.body.storageKey).toBeUndefined();
    const stored = await k('quote_documents').where({ id: r.body.id }).first();
    expect(fs.readFileSync(path.join(uploadDir, ...stored.storageKey.split('/')))).toEqual(Buffer.from(PDF));
    for (const role of ['viewer', 'approver']) {
      as(role);
      const list = await call(docs.GET, { workspace: WS, id: offerId });
      expect(list.body.items.map((d: { fileName: string }) => d.fileName)).toContain('Kestrel quote 2026.pdf');
      const dl = await call(doc.GET, { workspace: WS, id: offerId, docId: String(r.body.id) });
      expect(dl.status).toBe(200);
      expect(dl.response.headers.get('content-disposition')).toMatch(/attachment; filename="Kestrel quote 2026.pdf"/);
      expect(new Uint8Array(await dl.response.arrayBuffer())).toEqual(PDF);
    }
    // Not a member: the analyst of the other site only.
    signInAs(ids['admin@corrin.test']);
    expect((await call(doc.GET, { workspace: WS, id: offerId, docId: String(r.body.id) })).status).toBe(403);
    expect((await call(doc.GET, { workspace: OTHER, id: offerId, docId: String(r.body.id) })).status).toBe(404);
    as(null);
    expect((await call(doc.GET, { workspace: WS, id: offerId, docId: String(r.body.id) })).status).toBe(401);
    as('admin');
    expect((await call(doc.DELETE, { workspace: WS, id: offerId, docId: String(r.body.id) }, { method: 'DELETE' })).status).toBe(204);
    expect(fs.existsSync(path.join(uploadDir, ...stored.storageKey.split('/')))).toBe(false);
  });

  it('refuses a disguised file, an empty one, one over 10 MB, and uploads by viewers, saving nothing', async () => {
    const before = await snapshotWorkspace(k, WS);
    const filesBefore = fs.readdirSync(uploadDir, { recursive: true }).length;
    as('analyst');
    const exe = await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('quote.pdf', new TextEncoder().encode('MZ\x90\x00 not a pdf')) });
    expect(exe.status).toBe(422);
    expect(exe.body.problems[0].message).toMatch(/not a PDF, PNG, JPEG or WebP file \(checked from its contents/);
    expect((await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('empty.pdf', new Uint8Array()) })).body.problems[0].message).toMatch(/empty/);
    const big = new Uint8Array(10 * 1024 * 1024 + 1);
    big.set(PDF);
    const tooBig = await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('big.pdf', big) });
    expect(tooBig.status).toBe(422);
    expect(tooBig.body.problems[0].message).toMatch(/limit is 10 MB/);
    as('viewer');
    expect((await call(docs.POST, { workspace: WS, id: offerId }, { body: upload('q.png', PNG) })).status).toBe(403);
    as('analyst');
    expect((await call(docs.POST, { workspace: WS, id: '999999' }, { body: upload('q.png', PNG) })).status).toBe(404);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
    expect(fs.readdirSync(uploadDir, { recursive: true }).length).toBe(filesBefore);
  });

  it('downloads the workspace as a valid case/1 file and uploads it back unchanged', async () => {
    as('viewer');
    const dl = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    expect(dl.status).toBe(200);
    expect(dl.response.headers.get('content-disposition')).toMatch(/aldervane-north-pit-base\.case\.json/);
    const v = validateCase(dl.body);
    expect(v.ok).toBe(true);
    expect(dl.body.trucks).toHaveLength(24);
    expect(dl.body.engines).toHaveLength(4);
    expect(dl.body.name).toBe('Base');
    expect((await call(caseFile.POST, { workspace: WS }, { body: dl.body })).status).toBe(403);
    as('analyst');
    const up = await call(caseFile.POST, { workspace: WS }, { body: dl.body });
    expect(up.status).toBe(200);
    expect(up.body.trucks.updated).toHaveLength(24);
    expect(up.body.assumptionSets).toEqual({ created: [], updated: ['Base'] });
    const again = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    expect(again.body).toEqual(dl.body);
  });

  it('uploads a case file into another workspace, creating what is new', async () => {
    as('analyst');
    const dl = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    const theirs = { ...dl.body, currency: 'AUD', name: 'From Aldervane' };
    const up = await call(caseFile.POST, { workspace: OTHER }, { body: theirs });
    expect(up.status).toBe(200);
    expect(up.body.trucks.created).toHaveLength(24);
    const other = await snapshotWorkspace(k, OTHER);
    expect(other.trucks.map((t) => t.unitNumber)).toContain('T3-01');
    expect(other.sets.map((s) => s.name)).toContain('From Aldervane');
  });

  it('refuses an invalid case file as a whole, listing every problem, and saves nothing', async () => {
    as('analyst');
    const dl = await call(caseFile.GET, { workspace: WS }, { url: `http://x/?assumptionSetId=${setId}` });
    const before = await snapshotWorkspace(k, WS);
    const bad = structuredClone(dl.body);
    bad.trucks[0].engineHours = 99; // a valid change that must not be saved
    bad.trucks[3].annualHours = -1;
    bad.trucks[5].engineId = 'no-such-engine';
    const r = await call(caseFile.POST, { workspace: WS }, { body: bad });
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual(expect.arrayContaining([
      { path: 'trucks[3].annualHours', message: 'must be at least 1 hour' },
      { path: 'trucks[5].engineId', message: 'no engine has the id "no-such-engine"' },
    ]));
    expect((await call(caseFile.POST, { workspace: WS }, { body: { ...dl.body, currency: 'EUR' } })).body.problems[0]).toEqual({ path: 'currency', message: 'is EUR but this workspace reports in USD' });
    expect((await call(caseFile.POST, { workspace: WS }, { body: 'nope' })).status).toBe(422);
    expect((await call(caseFile.GET, { workspace: WS }, { url: 'http://x/' })).status).toBe(422);
    expect((await call(caseFile.GET, { workspace: OTHER }, { url: `http://x/?assumptionSetId=${setId}` })).status).toBe(404);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });
});
