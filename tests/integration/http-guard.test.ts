import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { NextRequest } from 'next/server';
import { BODY_LIMITS } from '@/lib/http/body';
import { POST as uploadDocument } from '@/app/api/workspaces/[workspace]/offers/[id]/documents/route';
import { POST as importFleet } from '@/app/api/workspaces/[workspace]/fleet/import/route';
import { POST as importReadings } from '@/app/api/workspaces/[workspace]/readings/import/route';
import { POST as uploadCaseFile } from '@/app/api/workspaces/[workspace]/case-file/route';
import { POST as forgotPassword } from '@/app/api/password/forgot/route';
import { POST as resetPassword } from '@/app/api/password/reset/route';
import { POST as acceptInvitation } from '@/app/api/invitations/accept/route';
import { POST as nextAuthPost } from '@/app/api/auth/[...nextauth]/route';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import { POST as invite } from '@/app/api/workspaces/[workspace]/invitations/route';
import { POST as createSet } from '@/app/api/workspaces/[workspace]/assumption-sets/route';
import { DELETE as deleteSet } from '@/app/api/workspaces/[workspace]/assumption-sets/[id]/route';
import { GET as getWorkspace } from '@/app/api/workspaces/[workspace]/route';
import { call } from './support/call';
import { insertDraftCase } from './support/cases';
import { openMailDb } from './support/mail-db';
import { setBody } from './support/fleet-fixtures';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const ORIGIN = 'http://127.0.0.1';
const URL_ = `${ORIGIN}/api/test`;
const MB = 1024 * 1024;
const CHUNK = 64 * 1024;

/** A body of `total` bytes made lazily, chunk by chunk, as the reader pulls; `pulled` counts what was handed out. */
function lazyBody(total: number, fill = 0x61) {
  const state = { pulled: 0 };
  const stream = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (state.pulled >= total) return controller.close();
        const n = Math.min(CHUNK, total - state.pulled);
        state.pulled += n;
        controller.enqueue(new Uint8Array(n).fill(fill));
      },
    },
    { highWaterMark: 0 },
  );
  return { stream, state };
}

type Target = { name: string; handler: (req: any, ctx: any) => Promise<Response>; params: Record<string, unknown>; type: string; limit: number };

describe('request bodies are refused past their limit before they are read', () => {
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  let k: Knex;
  let offerId: string;
  let targets: Target[];

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(false));
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    offerId = String((await k('repower_offers').where({ workspaceId: ws.id }).orderBy('id').first('id')).id);
    const multipart = 'multipart/form-data; boundary=----haulcase';
    targets = [
      { name: 'offer quote document upload', handler: uploadDocument, params: { workspace: WS, id: offerId }, type: multipart, limit: BODY_LIMITS.quoteDocument.bytes },
      { name: 'fleet import', handler: importFleet, params: { workspace: WS }, type: multipart, limit: BODY_LIMITS.fleetImport.bytes },
      { name: 'readings import', handler: importReadings, params: { workspace: WS }, type: multipart, limit: BODY_LIMITS.fleetImport.bytes },
      { name: 'case-file upload', handler: uploadCaseFile, params: { workspace: WS }, type: 'application/json', limit: BODY_LIMITS.caseFile.bytes },
      { name: 'forgot password', handler: forgotPassword, params: {}, type: 'application/json', limit: BODY_LIMITS.auth.bytes },
      { name: 'password reset', handler: resetPassword, params: {}, type: 'application/json', limit: BODY_LIMITS.auth.bytes },
      { name: 'invitation accept', handler: acceptInvitation, params: {}, type: 'application/json', limit: BODY_LIMITS.auth.bytes },
      { name: 'next-auth sign-in callback', handler: nextAuthPost, params: { nextauth: ['callback', 'credentials'] }, type: 'application/x-www-form-urlencoded', limit: BODY_LIMITS.auth.bytes },
    ];
  });
  afterAll(async () => close());
  afterEach(() => signInAs(null));

  const send = (t: Target, body: ReadableStream<Uint8Array>, headers: Record<string, string> = {}) => {
    const init = { method: 'POST', headers: { origin: ORIGIN, 'content-type': t.type, ...headers }, body, duplex: 'half' } as RequestInit;
    const req = t.name.startsWith('next-auth') ? new NextRequest(`${ORIGIN}/api/auth/callback/credentials`, init as any) : new Request(URL_, init);
    return t.handler(req, { params: Promise.resolve(t.params) });
  };

  it('answers 413 with the limit on a Content-Length of 512 MB, reading none of it (every route with a body)', async () => {
    signInAs(ids['analyst@aldervane.test']);
    for (const t of targets) {
      const { stream, state } = lazyBody(512 * MB);
      const res = await send(t, stream, { 'content-length': String(512 * MB) });
      expect(res.status, t.name).toBe(413);
      const body = await res.json();
      expect(body.error, t.name).toMatch(/too large: .*(limit|at most) .*\d+ (KB|MB)/);
      expect(body.limitBytes, t.name).toBe(t.limit);
      expect(state.pulled, t.name).toBe(0);
    }
  });

  it('stops a 200 MB body of unknown length at the limit: 413, and only about the limit pulled', async () => {
    signInAs(ids['analyst@aldervane.test']);
    for (const t of targets) {
      const { stream, state } = lazyBody(200 * MB);
      const res = await send(t, stream);
      expect(res.status, t.name).toBe(413);
      expect((await res.json()).limitBytes, t.name).toBe(t.limit);
      // the stream stops within a chunk or two past the limit: a small share of the 200 MB
      expect(state.pulled, t.name).toBeLessThanOrEqual(t.limit + 2 * CHUNK);
      console.log(`[http-guard] ${t.name}: pulled ${state.pulled} of ${200 * MB} bytes (limit ${t.limit})`);
    }
  });

  it('does not believe a Content-Length that understates the body', async () => {
    signInAs(ids['analyst@aldervane.test']);
    for (const t of targets) {
      const { stream, state } = lazyBody(200 * MB);
      const res = await send(t, stream, { 'content-length': '100' });
      expect(res.status, t.name).toBe(413);
      expect(state.pulled, t.name).toBeLessThanOrEqual(t.limit + 2 * CHUNK);
    }
  });

  it('keeps the server memory bounded while refusing 200 MB uploads (RSS and pulled bytes)', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const t = targets[0];
    globalThis.gc?.();
    const before = process.memoryUsage().rss;
    let pulled = 0;
    for (let i = 0; i < 5; i++) {
      const { stream, state } = lazyBody(200 * MB);
      expect((await send(t, stream)).status).toBe(413);
      pulled += state.pulled;
    }
    const grew = process.memoryUsage().rss - before;
    console.log(`[http-guard] 5 × 200 MB uploads refused: ${pulled} bytes pulled in all, RSS grew by ${(grew / MB).toFixed(1)} MB`);
    expect(pulled).toBeLessThanOrEqual(5 * (t.limit + 2 * CHUNK));
    // reading the bodies would have taken 1 GB or more
    expect(grew).toBeLessThan(200 * MB);
  });

  it('still accepts a body within its limit', async () => {
    await k('password_reset_requests').del().catch(() => {});
    const r = await call(forgotPassword, {}, { body: { email: 'nobody@aldervane.test' } });
    expect(r.status).toBe(200);
    expect(r.response.headers.get('cache-control')).toBe('no-store');
  });
});

describe('state-changing API requests must come from the app itself', () => {
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  let k: Knex;
  const foreign = { origin: 'http://127.0.0.1:4444' };
  const p = (id: number | string) => ({ workspace: WS, id: String(id) });

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(false));
  });
  afterAll(async () => close());
  afterEach(() => {
    signInAs(null);
    delete process.env.APP_URL;
  });

  /** call() with the Origin header removed (a browser that sends none). */
  const callWithout = (handler: any, params: any, init: { method?: string; body?: unknown; url?: string; headers?: Record<string, string> }) => {
    const req = new Request(init.url ?? URL_, {
      method: init.method ?? 'POST',
      headers: { 'content-type': 'application/json', ...init.headers },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
    });
    return handler(req, { params: Promise.resolve(params) }) as Promise<Response>;
  };

  it('refuses an approval from another origin, without Origin, and as text/plain; the same request from the app approves', async () => {
    const id = await insertDraftCase(k, WS, 'Guarded case');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: {} })).status).toBe(200);
    signInAs(ids['admin@aldervane.test']);
    const approve = { decision: 'approve', comment: 'fine' };

    const fromOther = await call(decide, p(id), { body: approve, headers: foreign });
    expect(fromOther.status).toBe(403);
    expect(fromOther.body.error).toMatch(/came from http:\/\/127\.0\.0\.1:4444, not from this app \(http:\/\/127\.0\.0\.1\)/);
    const none = await callWithout(decide, p(id), { body: approve });
    expect(none.status).toBe(403);
    expect((await none.json()).error).toMatch(/Origin header/);
    const sameSite = await callWithout(decide, p(id), { body: approve, headers: { 'sec-fetch-site': 'same-site' } });
    expect(sameSite.status).toBe(403);
    // what a form on another page sends: text/plain, or urlencoded, from the app's origin even
    const plain = await call(decide, p(id), { body: JSON.stringify(approve), headers: { 'content-type': 'text/plain;charset=UTF-8' } });
    expect(plain.status).toBe(415);
    expect(plain.body.error).toMatch(/Content-Type: application\/json \(it came as text\/plain\)/);
    expect((await call(decide, p(id), { body: 'decision=approve', headers: { 'content-type': 'application/x-www-form-urlencoded' } })).status).toBe(415);
    expect((await call(decide, p(id), { body: JSON.stringify(approve), headers: { 'content-type': '' } })).status).toBe(415);
    expect((await k('business_cases').where({ id }).first()).status).toBe('submitted');

    // a browser on the app's own page without Origin says same-origin in Sec-Fetch-Site
    const ok = await callWithout(decide, p(id), { body: approve, headers: { 'sec-fetch-site': 'same-origin' } });
    expect(ok.status).toBe(200);
    expect((await k('business_cases').where({ id }).first()).status).toBe('approved');
  });

  it('refuses an invitation of an admin from another origin or as text/plain, and mails nothing', async () => {
    signInAs(ids['admin@aldervane.test']);
    const before = await k('invitations').count({ n: '*' }).first();
    const outbox = await k('mail_outbox').count({ n: '*' }).first();
    const body = { email: 'attacker@example.test', role: 'admin' };
    expect((await call(invite, { workspace: WS }, { body, headers: foreign })).status).toBe(403);
    expect((await callWithout(invite, { workspace: WS }, { body })).status).toBe(403);
    expect((await call(invite, { workspace: WS }, { body: JSON.stringify(body), headers: { 'content-type': 'text/plain' } })).status).toBe(415);
    expect(await k('invitations').count({ n: '*' }).first()).toEqual(before);
    expect(await k('mail_outbox').count({ n: '*' }).first()).toEqual(outbox);
    expect((await call(invite, { workspace: WS }, { body })).status).toBe(201);
  });

  it('refuses creating an assumption set from another origin or as text/plain; creates it from the app', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const count = async () => Number((await k('assumption_sets').count({ n: '*' }).first())!.n);
    const before = await count();
    expect((await call(createSet, { workspace: WS }, { body: setBody('Forged'), headers: foreign })).status).toBe(403);
    expect((await callWithout(createSet, { workspace: WS }, { body: setBody('Forged') })).status).toBe(403);
    expect((await call(createSet, { workspace: WS }, { body: JSON.stringify(setBody('Forged')), headers: { 'content-type': 'text/plain' } })).status).toBe(415);
    const form = new FormData();
    form.set('name', 'Forged');
    expect((await call(createSet, { workspace: WS }, { body: form })).status).toBe(415);
    expect(await count()).toBe(before);
    expect((await call(createSet, { workspace: WS }, { body: setBody('Made here') })).status).toBe(201);
    expect(await count()).toBe(before + 1);
  });

  it('refuses a DELETE from another origin or without Origin; deletes from the app', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const made = await call(createSet, { workspace: WS }, { body: setBody('To delete') });
    const id = made.body.id as number;
    const url = `${ORIGIN}/api/x?version=${made.body.version}`;
    expect((await call(deleteSet, p(id), { method: 'DELETE', url, headers: foreign })).status).toBe(403);
    expect((await callWithout(deleteSet, p(id), { method: 'DELETE', url })).status).toBe(403);
    expect((await call(deleteSet, p(id), { method: 'DELETE', url, headers: { 'content-type': 'text/plain' } })).status).toBe(415);
    expect(await k('assumption_sets').where({ id }).first()).toBeTruthy();
    expect((await call(deleteSet, p(id), { method: 'DELETE', url })).status).toBe(204);
    expect(await k('assumption_sets').where({ id }).first()).toBeUndefined();
  });

  it('refuses JSON on an upload route, and a public route from another origin', async () => {
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(importFleet, { workspace: WS }, { body: { file: 'x' } })).status).toBe(415);
    signInAs(null);
    expect((await call(forgotPassword, {}, { body: { email: 'admin@aldervane.test' }, headers: foreign })).status).toBe(403);
  });

  it('takes the app origin from APP_URL when set, not from the request', async () => {
    process.env.APP_URL = 'https://haulcase.example/';
    signInAs(ids['analyst@aldervane.test']);
    const r = await call(createSet, { workspace: WS }, { body: setBody('Under APP_URL') });
    expect(r.status).toBe(403);
    expect(r.body.error).toMatch(/not from this app \(https:\/\/haulcase\.example\)/);
    const ok = await call(createSet, { workspace: WS }, { body: setBody('Under APP_URL'), headers: { origin: 'https://haulcase.example' } });
    expect(ok.status).toBe(201);
    expect(ok.response.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
  });

  it('lets reads through from anywhere (GET is not guarded) and marks every API answer no-store', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const r = await call(getWorkspace, { workspace: WS }, { headers: foreign });
    expect(r.status).toBe(200);
    expect(r.response.headers.get('cache-control')).toBe('no-store');
    expect(r.response.headers.get('strict-transport-security')).toBeNull();
    const refused = await call(createSet, { workspace: WS }, { body: setBody('x'), headers: foreign });
    expect(refused.response.headers.get('cache-control')).toBe('no-store');
  });

  it('sends HSTS only over https: X-Forwarded-Proto counts only behind HAULCASE_TRUSTED_PROXY=1', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const proto = { 'x-forwarded-proto': 'https' };
    expect((await call(getWorkspace, { workspace: WS }, { headers: proto })).response.headers.get('strict-transport-security')).toBeNull();
    process.env.HAULCASE_TRUSTED_PROXY = '1';
    try {
      expect((await call(getWorkspace, { workspace: WS }, { headers: proto })).response.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
    } finally {
      delete process.env.HAULCASE_TRUSTED_PROXY;
    }
    expect((await call(getWorkspace, { workspace: WS }, { url: 'https://127.0.0.1/api/x' })).response.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
  });
});
