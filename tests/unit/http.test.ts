import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { formatPath, parseOr422, HttpError, zodProblems } from '@/lib/http';

describe('problem paths', () => {
  it('writes zod paths the way the case file is read: a.b[2].c', () => {
    expect(formatPath(['trucks', 3, 'annualHours'])).toBe('trucks[3].annualHours');
    expect(formatPath([])).toBe('');
    expect(formatPath([0, 'x'])).toBe('[0].x');
  });

  it('lists every problem of a body at once, with its path', () => {
    const schema = z.object({ name: z.string().min(1), rate: z.number().max(1), items: z.array(z.object({ n: z.number() })) });
    const r = schema.safeParse({ name: '', rate: 2, items: [{ n: 1 }, { n: 'x' }] });
    expect(r.success).toBe(false);
    if (!r.success) expect(zodProblems(r.error).map((p) => p.path).sort()).toEqual(['items[1].n', 'name', 'rate']);
  });

  it('throws a 422 carrying the problems', () => {
    try {
      parseOr422(z.object({ a: z.number() }), { a: 'no' });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(HttpError);
      expect((e as HttpError).status).toBe(422);
      expect((e as HttpError).problems?.[0].path).toBe('a');
    }
  });
});
