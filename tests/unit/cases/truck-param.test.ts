import { describe, expect, it } from 'vitest';
import { parseTruckParam, truckIdFromPageSegment, truckIdFromParam } from '@/lib/cases/params';

// The link to the unit "T%41" is /trucks/T%2541. Route handlers get the segment
// decoded by Next ("T%41"); pages get it as it is in the URL ("T%2541").
describe('a unit number from the truck route segment', () => {
  it('in a route handler is used as Next decoded it, never decoded a second time', () => {
    expect(truckIdFromParam('T%41')).toBe('T%41');
    expect(truckIdFromParam('50%')).toBe('50%');
    expect(truckIdFromParam('%E0%A4%A')).toBe('%E0%A4%A');
    expect(truckIdFromParam('T3-01')).toBe('T3-01');
    expect(truckIdFromParam('Überlader 7')).toBe('Überlader 7');
  });

  it('in a page is decoded exactly once', () => {
    expect(truckIdFromPageSegment(encodeURIComponent('T%41'))).toBe('T%41');
    expect(truckIdFromPageSegment(encodeURIComponent('50%'))).toBe('50%');
    expect(truckIdFromPageSegment(encodeURIComponent('Überlader 7'))).toBe('Überlader 7');
    expect(truckIdFromPageSegment('T3-01')).toBe('T3-01');
  });

  it('is null for what no unit number can be (a 404 in a route handler), and for broken percent-encoding in a page', () => {
    expect(truckIdFromParam('')).toBeNull();
    expect(truckIdFromParam('x'.repeat(81))).toBeNull();
    expect(truckIdFromParam('T1\u0000')).toBeNull();
    expect(truckIdFromParam('T1\n')).toBeNull();
    expect(truckIdFromParam('T\uD800')).toBeNull();
    expect(() => parseTruckParam('')).toThrow(expect.objectContaining({ status: 404 }));
    expect(truckIdFromPageSegment('T%')).toBeNull();
    expect(truckIdFromPageSegment('%E0%A4%A')).toBeNull();
    expect(truckIdFromPageSegment('%ED%A0%80')).toBeNull();
    expect(truckIdFromPageSegment('T1%00')).toBeNull();
  });
});
