import { describe, expect, it } from 'vitest';
import { caseTruckParams, unitPageParam, unitParam } from '@/lib/cases/params';
import { HttpError, readParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';

const unit = (raw: string) => {
  const r = unitParam.safeParse(raw);
  return r.success ? r.data : null;
};
const pageUnit = (raw: string) => {
  const r = unitPageParam.safeParse(raw);
  return r.success ? r.data : null;
};

// The link to the unit "T%41" is /trucks/T%2541. Route handlers get the segment
// decoded by Next ("T%41"); pages get it as it is in the URL ("T%2541").
describe('a unit number from the truck route segment', () => {
  it('in a route handler is used as Next decoded it, never decoded a second time', () => {
    expect(unit('T%41')).toBe('T%41');
    expect(unit('50%')).toBe('50%');
    expect(unit('%E0%A4%A')).toBe('%E0%A4%A');
    expect(unit('T3-01')).toBe('T3-01');
    expect(unit('Überlader 7')).toBe('Überlader 7');
  });

  it('in a page is decoded exactly once', () => {
    expect(pageUnit(encodeURIComponent('T%41'))).toBe('T%41');
    expect(pageUnit(encodeURIComponent('50%'))).toBe('50%');
    expect(pageUnit(encodeURIComponent('Überlader 7'))).toBe('Überlader 7');
    expect(pageUnit('T3-01')).toBe('T3-01');
  });

  it('does not match what no unit number can be, nor broken percent-encoding in a page', () => {
    expect(unit('')).toBeNull();
    expect(unit('x'.repeat(80))).toBe('x'.repeat(80));
    expect(unit('x'.repeat(81))).toBeNull();
    expect(unit('T1\u0000')).toBeNull();
    expect(unit('T1\n')).toBeNull();
    expect(unit('T\uD800')).toBeNull();
    expect(pageUnit('T%')).toBeNull();
    expect(pageUnit('%E0%A4%A')).toBeNull();
    expect(pageUnit('%ED%A0%80')).toBeNull();
    expect(pageUnit('T1%00')).toBeNull();
  });

  it('with the case id: a 404 in a route handler, the not-found page in a page', () => {
    expect(readParams(caseTruckParams, { workspace: 'w', id: '7', truckId: 'T%41' })).toEqual({ id: 7, truckId: 'T%41' });
    expect(() => readParams(caseTruckParams, { workspace: 'w', id: '7', truckId: '' })).toThrow(expect.objectContaining({ status: 404, message: 'Not found.' }));
    expect(() => readParams(caseTruckParams, { workspace: 'w', id: '0x10', truckId: 'T1' })).toThrow(HttpError);
    expect(() => readPageParams(caseTruckParams, { id: '7', truckId: 'T1\n' })).toThrow(expect.objectContaining({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' }));
  });
});
