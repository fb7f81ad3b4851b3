import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// docs/methodology.md is shown as it is on the Methodology page: it speaks to planners, not to developers.
describe('methodology page wording', () => {
  const text = readFileSync(path.resolve(__dirname, '../../../docs/methodology.md'), 'utf8');
  it('names no source folders or files', () => {
    expect(text.match(/\blib\/[\w./-]*|\b[\w-]+\.tsx?\b/g) ?? []).toEqual([]);
  });
});
