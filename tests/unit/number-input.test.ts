import { describe, expect, it } from 'vitest';
import { formatNumberText, parseNumberText } from '@/lib/number-input';

const ok = (value: number | null) => ({ ok: true, value });
const value = (text: string, format: 'point' | 'comma' = 'point') => parseNumberText(text, format);
const message = (text: string, format: 'point' | 'comma' = 'point', range = {}) => {
  const r = parseNumberText(text, format, range);
  return r.ok ? `accepted ${r.value}` : r.message;
};

describe('parseNumberText: one rule for forms and imports', () => {
  it('reads grouping with the workspace mark or spaces, in threes', () => {
    expect(value('18,950')).toEqual(ok(18950));
    expect(value('1,234,567.25')).toEqual(ok(1234567.25));
    expect(value('18 950')).toEqual(ok(18950));
    expect(value('18\u00a0950,5', 'comma')).toEqual(ok(18950.5));
    expect(value('1.234.567,25', 'comma')).toEqual(ok(1234567.25));
    expect(value('18950')).toEqual(ok(18950));
    expect(message('1,23,456')).toBe('enter a number such as 18,950');
    expect(message('18 950,000')).toBe('enter a number such as 18,950; group thousands with "," or with spaces, not both');
  });

  it('reads the decimal mark of the workspace and explains the other one', () => {
    expect(value('8.50')).toEqual(ok(8.5));
    expect(value('8,50', 'comma')).toEqual(ok(8.5));
    expect(value('.5')).toEqual(ok(0.5));
    expect(message('8,50')).toBe('enter a number such as 8.5 (this workspace writes decimals with a point)');
    expect(message('8.50', 'comma')).toBe('enter a number such as 8,5 (this workspace writes decimals with a comma)');
    // in the point format "8,500" is eight thousand five hundred, in the comma format 8.5
    expect(value('8,500')).toEqual(ok(8500));
    expect(value('8,500', 'comma')).toEqual(ok(8.5));
    expect(message('1.2.3')).toBe('enter a number such as 18,950; it has more than one decimal mark (.)');
  });

  it('takes a sign: plus, hyphen-minus or the minus sign', () => {
    expect(value('-0.5')).toEqual(ok(-0.5));
    expect(value('−1,000')).toEqual(ok(-1000));
    expect(value('+12')).toEqual(ok(12));
    expect(value('-0')).toEqual(ok(0));
    expect(Object.is((value('-0') as { value: number }).value, -0)).toBe(false);
    expect(message('--1')).toBe('enter a number such as 18,950');
  });

  it('trims spaces around the number and reads empty as no value', () => {
    expect(value('  42  ')).toEqual(ok(42));
    expect(value('')).toEqual(ok(null));
    expect(value('   ')).toEqual(ok(null));
  });

  it('refuses garbage with an example in the workspace format', () => {
    expect(message('abc')).toBe('enter a number such as 18,950');
    expect(message('abc', 'comma')).toBe('enter a number such as 18.950');
    expect(message('12k')).toBe('enter a number such as 18,950');
    expect(message('NaN')).toBe('enter a number such as 18,950');
    expect(message('Infinity')).toBe('enter a number such as 18,950');
    expect(message('0x10')).toBe('enter a number such as 18,950');
    expect(message('1.')).toBe('enter a number such as 18,950');
    expect(message('9'.repeat(101))).toBe('enter a number such as 18,950');
    expect(message('abc', 'point', { example: '0.48' })).toBe('enter a number such as 0.48');
  });

  it('refuses an exponent', () => {
    expect(message('1e5')).toBe('write the number in full, without an exponent (e)');
    expect(message('1.5E-3')).toBe('write the number in full, without an exponent (e)');
    expect(message('2,5e3', 'comma')).toBe('write the number in full, without an exponent (e)');
  });

  it('checks the range and whole numbers, writing the limits in the workspace format', () => {
    expect(message('0', 'point', { min: 1, max: 8784 })).toBe('enter a number from 1 to 8,784');
    expect(message('9000', 'comma', { min: 1, max: 8784 })).toBe('enter a number from 1 to 8.784');
    expect(message('-1', 'point', { min: 0 })).toBe('enter a number of at least 0');
    expect(message('1.5', 'point', { max: 1 })).toBe('enter a number of at most 1');
    expect(message('2.5', 'point', { integer: true })).toBe('enter a whole number');
    expect(message('8784', 'point', { min: 1, max: 8784 })).toBe('accepted 8784');
  });

  it('writes a number back the way the workspace reads it', () => {
    expect(formatNumberText(0.55, 'point')).toBe('0.55');
    expect(formatNumberText(0.55, 'comma')).toBe('0,55');
    expect(formatNumberText(18950.5, 'comma', true)).toBe('18.950,5');
    expect(formatNumberText(1e21, 'point')).toBe('1000000000000000000000');
    for (const x of [0.55, 18950, 1234567.25, -3.5]) for (const f of ['point', 'comma'] as const) expect(parseNumberText(formatNumberText(x, f), f)).toEqual(ok(x));
  });
});
