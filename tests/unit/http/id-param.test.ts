import { describe, expect, it } from 'vitest';
import { errorResponse, HttpError, idParam, idParams, readParams, readQueryId } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';
import { auditFilterSchema } from '@/lib/validation/audit';
import { runIdParam } from '@/lib/validation/risk';

const ACCEPTED: Array<[string, number]> = [['1', 1], ['7', 7], ['10', 10], ['123456789', 123_456_789], ['999999999', 999_999_999]];
// hex, exponent, leading zero, sign, space, decimal point, 10 and 11 digits, nothing, words
const REFUSED = ['0', '01', '0x10', '1e3', '1e1', '-1', '+1', ' 1', '1 ', ' 7', '1.0', '1000000000', '99999999999', '', 'abc', '1_000', '١', 'Infinity', 'NaN'];

describe('one id rule for the URL', () => {
  it.each(ACCEPTED)('idParam reads %j as %d', (raw, n) => {
    expect(idParam.parse(raw)).toBe(n);
  });

  it.each(REFUSED)('idParam refuses %j', (raw) => {
    expect(idParam.safeParse(raw).success).toBe(false);
  });

  it('refuses what is not text (the segments are always strings)', () => {
    expect(idParam.safeParse(16).success).toBe(false);
    expect(idParam.safeParse(undefined).success).toBe(false);
  });

  it('readParams gives the ids of the params, without the other segments', () => {
    expect(readParams(idParams, { workspace: 'w', id: '42' })).toEqual({ id: 42 });
    expect(readParams(idParams.extend({ docId: idParam }), { workspace: 'w', id: '1', docId: '999999999' })).toEqual({ id: 1, docId: 999_999_999 });
  });

  it.each(REFUSED)('readParams answers 404 { error: "Not found." } for %j', async (raw) => {
    let thrown: unknown;
    try {
      readParams(idParams, { workspace: 'w', id: raw });
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(HttpError);
    const res = errorResponse(thrown);
    expect(res.status).toBe(404);
    expect(await res.json()).toEqual({ error: 'Not found.' });
  });

  it('readParams answers 404 when a second id is bad and when a segment is missing', () => {
    const two = idParams.extend({ docId: idParam });
    expect(() => readParams(two, { workspace: 'w', id: '1', docId: '0x10' })).toThrow(expect.objectContaining({ status: 404, message: 'Not found.' }));
    expect(() => readParams(idParams, { workspace: 'w' })).toThrow(expect.objectContaining({ status: 404 }));
  });

  it('readPageParams shows the not-found page (Next’s notFound) instead', () => {
    expect(readPageParams(idParams, { workspace: 'w', id: '5' })).toEqual({ id: 5 });
    expect(() => readPageParams(idParams, { workspace: 'w', id: '0x10' })).toThrow(expect.objectContaining({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' }));
    expect(() => readPageParams(idParams, { workspace: 'w', id: '05' })).toThrow(expect.objectContaining({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' }));
  });

  it('a query-string id: null when absent or blank, the number, or a 422 naming the parameter', () => {
    const q = (s: string) => new URLSearchParams(s);
    expect(readQueryId(q(''), 'assumptionSetId')).toBeNull();
    expect(readQueryId(q('assumptionSetId='), 'assumptionSetId')).toBeNull();
    expect(readQueryId(q('assumptionSetId=12'), 'assumptionSetId')).toBe(12);
    for (const bad of ['99999999999', '0x10', '1e3', '01', '-1']) {
      expect(() => readQueryId(q(`assumptionSetId=${encodeURIComponent(bad)}`), 'assumptionSetId')).toThrow(
        expect.objectContaining({ status: 422, problems: [{ path: 'assumptionSetId', message: 'must be an id (a whole number from 1 to 999,999,999)' }] }),
      );
    }
  });

  it('the audit filter reads its user id by the same rule', () => {
    expect(auditFilterSchema.parse({ user: '12' }).user).toBe(12);
    expect(auditFilterSchema.parse({ user: '' }).user).toBeUndefined();
    for (const bad of ['1e3', '0x10', '99999999999', '0']) expect(auditFilterSchema.safeParse({ user: bad }).success).toBe(false);
  });

  it('a Monte Carlo run id is the UUID it was stored under', () => {
    expect(runIdParam.safeParse('00000000-0000-4000-8000-000000000001').success).toBe(true);
    expect(runIdParam.safeParse(crypto.randomUUID()).success).toBe(true);
    for (const bad of ['', '0x10', 'abc', 'no-such-run', '00000000-0000-4000-8000-00000000000', '00000000-0000-4000-8000-0000000000011', ' 00000000-0000-4000-8000-000000000001']) {
      expect(runIdParam.safeParse(bad).success).toBe(false);
    }
  });
});
