/**
 * Issue 12: the case-file upload took lists of any length (a million trucks
 * went through the schema item by item). Each list now has a cap, checked
 * before the items (docs/methodology.md, "Input limits").
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { CASE_LIST_LIMITS, caseSchema, validateCase } from '@/lib/validation/case';

const root = path.resolve(__dirname, '../../..');
const oneTruck = JSON.parse(readFileSync(path.join(root, 'scenarios', 'one-truck.json'), 'utf8'));

describe('issue 12: a case file lists at most 1,000 engines, 1,000 offers and 10,000 trucks', () => {
  it('refuses 10,001 trucks and 1,001 engines and offers in one line each, before looking at the items', () => {
    const c = structuredClone(oneTruck);
    c.trucks = Array.from({ length: 10_001 }, (_, i) => ({ ...oneTruck.trucks[0], id: `T${i}` }));
    c.engines = Array.from({ length: 1_001 }, () => ({})); // invalid items: not reported, the length is
    c.repowerOffers = Array.from({ length: 1_001 }, () => null);
    const v = validateCase(c);
    expect(v).toEqual({
      ok: false,
      problems: [
        { path: 'engines', message: 'must list at most 1,000 engines; this file lists 1,001' },
        { path: 'repowerOffers', message: 'must list at most 1,000 repower offers; this file lists 1,001' },
        { path: 'trucks', message: 'must list at most 10,000 trucks; this file lists 10,001' },
      ],
    });
  });

  it('refuses a million trucks in one line', () => {
    const v = validateCase({ ...oneTruck, trucks: new Array(1_000_000).fill(0) });
    expect(v.ok ? [] : v.problems).toEqual([{ path: 'trucks', message: 'must list at most 10,000 trucks; this file lists 1,000,000' }]);
  });

  it('accepts 10,000 trucks, and the schema itself says the same', () => {
    const c = structuredClone(oneTruck);
    c.trucks = Array.from({ length: CASE_LIST_LIMITS.trucks }, (_, i) => ({ ...oneTruck.trucks[0], id: `T${i}` }));
    expect(validateCase(c).ok).toBe(true);
    const over = { ...c, trucks: [...c.trucks, { ...oneTruck.trucks[0], id: 'one-more' }] };
    expect(caseSchema.safeParse(over).error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['trucks', 'must list at most 10,000 trucks']]);
  });
});
