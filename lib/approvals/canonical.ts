import { createHash } from 'node:crypto';
import type { DecisionSummary } from '@/lib/cases/decision-summary';
import type { CaseResult, PolicyResult } from '@/lib/engine/types';
import type { CapitalPlan } from '@/lib/plan';
import type { CaseFile } from '@/lib/validation/case';

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

export type FrozenColumns = { frozenCase: string | null; frozenResult: string | null; frozenHash: string | null; frozenRecord?: string | null };

/**
 * What an approval freezes, as one canonical JSON text (`frozen-record/1`):
 * the case file, its result, the proposal (the plan settings, the chosen
 * trucks, each truck's policy, the capital plan and the swap schedule), the
 * proposal's decision summary and the pinned Monte Carlo run (null: none was
 * pinned). `frozenHash` is the SHA-256 of exactly this text's UTF-8 bytes.
 */
export interface FrozenRecord {
  format: 'frozen-record/1';
  caseId: number;
  case: CaseFile;
  result: CaseResult;
  proposal: {
    settings: { budgets: Record<string, number | null>; swapsPerMonth: number; startMonth: string; capacityByMonth?: Record<string, number>; maxDelayMonths?: number };
    /** each repowered truck's chosen timing's result (the fleet programme's); absent in records made before it */
    timings?: Record<string, PolicyResult>;
    chosenTrucks: string[];
    policies: Record<string, string>;
    plan: CapitalPlan;
    schedule: unknown[];
  };
  summary: DecisionSummary;
  pinnedRun: unknown;
}

/** SHA-256 (hex) of a text's UTF-8 bytes. */
export const sha256Hex = (text: string): string => createHash('sha256').update(text, 'utf8').digest('hex');

/** The stored record, or null (not approved, or approved before records were kept). */
export function readFrozenRecord(text: string | null | undefined): FrozenRecord | null {
  if (!text) return null;
  try {
    const r = JSON.parse(text) as FrozenRecord;
    return r && r.format === 'frozen-record/1' ? r : null;
  } catch {
    return null;
  }
}

/**
 * The exact bytes the stored hash covers: the frozen record, or for a case
 * approved before records were kept `frozenCase + "\n" + frozenResult`. Null
 * when the case is not frozen.
 */
export function hashedBytes(row: FrozenColumns): string | null {
  if (row.frozenRecord) return row.frozenRecord;
  if (row.frozenCase && row.frozenResult) return `${row.frozenCase}\n${row.frozenResult}`;
  return null;
}

/**
 * Recomputes the hash from the stored text: true only when the hash is present
 * and equals the SHA-256 of the hashed bytes, and (with a record) the
 * `frozenCase`/`frozenResult` columns the pages read are the record's own.
 */
export function verifyFrozen(row: FrozenColumns): boolean {
  if (!row.frozenHash) return false;
  if (row.frozenRecord) {
    if (sha256Hex(row.frozenRecord) !== row.frozenHash) return false;
    const r = readFrozenRecord(row.frozenRecord);
    return !!r && canonicalJson(r.case) === row.frozenCase && canonicalJson(r.result) === row.frozenResult;
  }
  if (!row.frozenCase || !row.frozenResult) return false;
  return frozenHashOf(row.frozenCase, row.frozenResult) === row.frozenHash;
}

/** SHA-256 (hex) of a token, as stored for invitations and password resets. */
export const hashToken = (token: string): string => createHash('sha256').update(token, 'utf8').digest('hex');
