/** Break-even changes: rates and shares in percentage points, other drivers relative (components/risk/format.ts). */
import { describe, expect, it } from 'vitest';
import { changeLabel } from '@/components/risk/format';

describe('changeLabel', () => {
  it('shows a rate change in percentage points', () => {
    expect(changeLabel({ unit: '%' }, 0.08, 0.112)).toBe('+3.2 pp');
    expect(changeLabel({ unit: '%/yr' }, 0.03, -0.095)).toBe('−12.5 pp');
    expect(changeLabel({ unit: '%' }, 0.08, 0.08)).toBe('0.0 pp');
  });
  it('shows other drivers relative to their value in the case', () => {
    expect(changeLabel({ unit: 'USD/L' }, 1.2, 1.5)).toBe('+25.0 %');
    expect(changeLabel({ unit: 'USD' }, 1000, 275)).toBe('−72.5 %');
  });
  it('shows nothing where there is no value or a relative change means nothing', () => {
    expect(changeLabel({ unit: 'USD/t CO2' }, 0, 120)).toBe('');
    expect(changeLabel({ unit: '%' }, 0.08, null)).toBe('');
    expect(changeLabel(undefined, 1, 2)).toBe('');
  });
});
