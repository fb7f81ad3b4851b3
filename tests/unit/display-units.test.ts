/**
 * Display units: what a form field shows in the workspace's units and what
 * a typed value is stored as. The conversion factors are NIST SP 811
 * (Appendix B.8): 1 hp (550 ft·lbf/s) = 745.699 871 582 W, 1 US gallon = 3.785 411 784 L.
 */
import { describe, expect, it } from 'vitest';
import { fromDisplay, inputText, toDisplay } from '@/lib/display-units';

describe('display units', () => {
  it('shows a stored value in US customary to 6 significant digits, and metric as stored', () => {
    expect(inputText('power', 2600, 'us')).toBe('3486.66'); // 2,600 kW ÷ 0.745 699 872 kW/hp
    expect(inputText('burn', 378.5411784, 'us')).toBe('100'); // 378.54 L/h = 100 US gal/h
    expect(inputText('power', 2600, 'metric')).toBe('2600');
    expect(inputText('burn', null, 'us')).toBe('');
  });

  it('stores a value typed in US customary in metric (NIST SP 811)', () => {
    expect(fromDisplay('power', 3500, 'us')).toBeCloseTo(2609.949551, 5);
    expect(fromDisplay('volume', 1, 'us')).toBeCloseTo(3.785411784, 12);
    expect(fromDisplay('burn', 100, 'metric')).toBe(100);
    for (const q of ['power', 'bsfc', 'burn', 'volume'] as const) {
      expect(fromDisplay(q, toDisplay(q, 123.456, 'us') as number, 'us')).toBeCloseTo(123.456, 9);
    }
  });
});
