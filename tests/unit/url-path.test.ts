import { describe, expect, it } from 'vitest';
import { hasBrokenPercentEncoding } from '@/lib/url-path';

describe('a request path that cannot be percent-decoded', () => {
  it('is told apart from one that can', () => {
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/T%')).toBe(true);
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/%E0%A4%A')).toBe(true);
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/%ED%A0%80')).toBe(true);
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/T%2541')).toBe(false);
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/%C3%9Cberlader%207')).toBe(false);
    expect(hasBrokenPercentEncoding('/ws/cases/1/trucks/T3-01')).toBe(false);
  });
});
