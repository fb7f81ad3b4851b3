import { describe, expect, it } from 'vitest';
import { formatMoney, formatNumber, formatPercent, signTone } from '@/lib/format';

describe('display formatting', () => {
  it('groups thousands and rounds only for display', () => {
    expect(formatNumber(1234567.891, 2)).toBe('1,234,567.89');
    expect(formatNumber(0.1 + 0.2, 2)).toBe('0.30');
  });
  it('shows negative money in parentheses by default, or with a minus sign', () => {
    expect(formatMoney(-1234.4)).toBe('(1,234)');
    expect(formatMoney(-1234.4, { negative: 'minus' })).toBe('−1,234');
    expect(formatMoney(-1_250_000, { scale: 'k' })).toBe('(1,250)');
    expect(formatMoney(-0.2)).toBe('0');
  });
  it('says — for a missing value', () => {
    expect(formatMoney(null)).toBe('—');
    expect(formatPercent(undefined)).toBe('—');
    expect(formatPercent(0.0866, 2)).toBe('8.66 %');
  });
});

describe('signTone', () => {
  it('takes the negative style only for a figure that shows as negative', () => {
    expect(signTone(0)).toBe('');
    expect(signTone(-0)).toBe('');
    expect(signTone(-200, { scale: 'k' })).toBe(''); // shows as "0" in k
    expect(signTone(-600, { scale: 'k' })).toBe('text-loss'); // shows as "(1)"
    expect(signTone(0.4)).toBe('');
    expect(signTone(1)).toBe('text-gain');
    expect(signTone(null)).toBe('');
  });
});
