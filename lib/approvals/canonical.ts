import { createHash } from 'node:crypto';

/**
 * Canonical JSON: object keys sorted, no whitespace, `undefined` members left
 * out, numbers as JavaScript prints them. The same value always gives the same
 * text, so a hash of it can be recomputed and compared years later.
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sortKeys);
  if (v && typeof v === 'object' && !(v instanceof Date)) {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(v as object).sort()) {
      const x = (v as Record<string, unknown>)[k];
      if (x !== undefined) out[k] = sortKeys(x);
    }
    return out;
  }
  return v;
}

/**
 * SHA-256 (hex) over both frozen texts. The case text, a newline, then the result
 * text: a newline never occurs inside canonical JSON, so the split is unambiguous.
 */
export function frozenHashOf(caseText: string, resultText: string): string {
  return createHash('sha256').update(caseText, 'utf8').update('\n', 'utf8').update(resultText, 'utf8').digest('hex');
}

export type FrozenColumns = { frozenCase: string | null; frozenResult: string | null; frozenHash: string | null };

/** Recomputes the hash from the stored text: true only when all three are present and agree. */
export function verifyFrozen(row: FrozenColumns): boolean {
  if (!row.frozenCase || !row.frozenResult || !row.frozenHash) return false;
  return frozenHashOf(row.frozenCase, row.frozenResult) === row.frozenHash;
}

/** SHA-256 (hex) of a token, as stored for invitations and password resets. */
export const hashToken = (token: string): string => createHash('sha256').update(token, 'utf8').digest('hex');
