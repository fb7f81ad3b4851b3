import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { engineLivesSchema, readEngineLives, updateCaseSchema } from '@/lib/validation/business-case';

const issues = (v: unknown) => {
  const r = updateCaseSchema.safeParse({ version: 1, engineLives: v });
  return r.success ? [] : r.error.issues.map((i) => [i.path.join('.'), i.message]);
};

describe('a case’s engine-life overrides (engineLives)', () => {
  it('takes whole hours within the lifeHours range, by engine type id', () => {
    expect(engineLivesSchema.parse({ '3': 27626, '12': 500 })).toEqual({ '3': 27626, '12': 500 });
    expect(issues({})).toEqual([]);
  });

  it.each([
    [{ '3': 499 }, 'engineLives.3', 'must be at least 500 hours'],
    [{ '3': 200_001 }, 'engineLives.3', 'must be at most 200,000 hours'],
    [{ '3': 27625.6 }, 'engineLives.3', 'must be a whole number of hours'],
    [{ '3': Number.POSITIVE_INFINITY }, 'engineLives.3', 'must be a finite number'],
    [{ '3': '20000' }, 'engineLives.3', 'must be a finite number'],
    [{ abc: 20000 }, 'engineLives.abc', 'must be an engine type id'],
  ])('refuses %j naming the field', (value, where, message) => {
    expect(issues(value)).toContainEqual([where, message]);
  });

  it('reads a stored value back, and anything unreadable as no overrides', () => {
    expect(readEngineLives('{"3":27626}')).toEqual({ '3': 27626 });
    expect(readEngineLives(null)).toEqual({});
    expect(readEngineLives('not json')).toEqual({});
    expect(readEngineLives('{"3":1}')).toEqual({});
  });

  it('has its row in docs/methodology.md "Input limits"', () => {
    const doc = readFileSync(path.resolve(__dirname, '../../../docs/methodology.md'), 'utf8');
    const start = doc.indexOf('## Input limits');
    const section = doc.slice(start, doc.indexOf('\n## ', start + 3));
    expect(section).toMatch(/\| case's engine-life override \(`engineLives`[^|]*\| whole hours, 500 to 200,000 h/);
  });
});
