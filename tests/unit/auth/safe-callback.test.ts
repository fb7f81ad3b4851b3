import { describe, expect, it } from 'vitest';
import { safeCallback } from '@/lib/auth/callback';

const ORIGIN = 'http://127.0.0.1:3000';

describe('where sign-in returns to', () => {
  it('keeps a path of this site, with its query', () => {
    expect(safeCallback('/aldervane-north-pit/cases/4?tab=plan', ORIGIN)).toBe('/aldervane-north-pit/cases/4?tab=plan');
  });
  it('refuses other sites, however they are written (regression: /\\evil.test was followed)', () => {
    for (const bad of ['//evil.test', '/\\evil.test', '/\\/evil.test', 'https://evil.test/x', 'javascript:alert(1)', '']) {
      expect(safeCallback(bad, ORIGIN)).toBe('/');
    }
    expect(safeCallback(undefined, ORIGIN)).toBe('/');
  });
});
