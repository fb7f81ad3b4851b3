import 'server-only';
/**
 * The case result cache: each evaluation of a stored case is kept under the
 * SHA-256 of everything it reads — the case file as loaded (the frozen or
 * submitted snapshot, or the live file built from the register, which carries
 * the assumption set, engines, offers and trucks), the case row's summary and
 * plan (its version moves on every write), the snapshot source, the register
 * rows the pages link to, and the workspace settings that shape the answer
 * (currency, fiscal year, negative style). Any write to any of them changes
 * the key, so there is nothing to invalidate by hand; a changed case simply
 * misses and the old entry ages out.
 *
 * A hit costs the database reads that build the case file (a few ms at 200
 * trucks) and no validation, evaluation, programme solve or serialisation.
 * The route answers with the key as a strong ETag, so a client that has the
 * answer gets 304 without a body.
 *
 * Bounds: at most `MAX_ENTRIES` evaluations and `MAX_BYTES` of serialised
 * answers per server process (least recently used dropped first); an answer
 * larger than the byte bound is served but not kept.
 */
import { createHash } from 'node:crypto';
import type { Access } from '@/lib/auth/access';
import { evaluateInputs, loadCaseInputs, toSummaryDto, type CaseInputs } from './evaluate';
import type { CaseResultDto, EvaluatedCase, SlimCaseResult } from './types';

export const RESULT_CACHE_LIMITS = { MAX_ENTRIES: 16, MAX_BYTES: 64 * 1024 * 1024 } as const;

type Entry = { evaluated: EvaluatedCase; body: string | null; bytes: number };

const entries = new Map<string, Entry>();
let totalBytes = 0;
const counters = { hits: 0, misses: 0 };

/** The cache key of loaded inputs (hex SHA-256). */
export function resultKey(access: Access, inputs: CaseInputs): string {
  const { workspace } = access;
  const parts = {
    workspace: workspace.id,
    currency: workspace.currency,
    fiscalYearStartMonth: workspace.settings.fiscalYearStartMonth,
    negativeStyle: workspace.settings.negativeStyle,
    source: inputs.source,
    summary: toSummaryDto(inputs.row),
    plan: inputs.row.plan,
    truckRows: [...inputs.truckRows.entries()],
    problems: inputs.problems,
    file: inputs.file,
  };
  return createHash('sha256').update(JSON.stringify(parts)).digest('hex');
}

function touch(key: string, entry: Entry) {
  entries.delete(key);
  entries.set(key, entry);
}

function evict() {
  while (entries.size > RESULT_CACHE_LIMITS.MAX_ENTRIES || totalBytes > RESULT_CACHE_LIMITS.MAX_BYTES) {
    const oldest = entries.keys().next();
    if (oldest.done) break;
    totalBytes -= entries.get(oldest.value)!.bytes;
    entries.delete(oldest.value);
  }
}

/** The stored case's evaluation and its key: from the cache, or evaluated now and kept. */
export async function cachedEvaluation(access: Access, id: number): Promise<{ key: string; evaluated: EvaluatedCase }> {
  const inputs = await loadCaseInputs(access, id);
  const key = resultKey(access, inputs);
  const found = entries.get(key);
  if (found) {
    counters.hits += 1;
    touch(key, found);
    return { key, evaluated: found.evaluated };
  }
  counters.misses += 1;
  // a case that cannot be evaluated throws its 422 here and is not kept
  const evaluated = await evaluateInputs(access, inputs);
  entries.set(key, { evaluated, body: null, bytes: 0 });
  evict();
  return { key, evaluated };
}

/** The route's answer: the evaluated case without each policy's by-year breakdown. */
export function toResultDto(evaluated: EvaluatedCase): CaseResultDto {
  const result: SlimCaseResult = {
    ...evaluated.result,
    trucks: evaluated.result.trucks.map((t) => ({
      ...t,
      options: {
        keep: withoutBreakdown(t.options.keep),
        rebuild: withoutBreakdown(t.options.rebuild),
        repower: withoutBreakdown(t.options.repower),
      },
    })),
  };
  return { ...evaluated, result };
}

function withoutBreakdown<T extends { breakdown: unknown }>(p: T): Omit<T, 'breakdown'> {
  const { breakdown: _omit, ...rest } = p;
  return rest;
}

/**
 * The route's answer as JSON text with its ETag (the cache key, quoted).
 * Serialised once per entry; `notModified` when the client's If-None-Match
 * already names it.
 */
export async function cachedResultBody(access: Access, id: number, ifNoneMatch: string | null): Promise<{ etag: string; body: string | null }> {
  const { key, evaluated } = await cachedEvaluation(access, id);
  const etag = `"${key}"`;
  if (ifNoneMatch && ifNoneMatch.split(',').some((t) => t.trim().replace(/^W\//, '') === etag)) return { etag, body: null };
  const entry = entries.get(key);
  if (entry?.body != null) return { etag, body: entry.body };
  const body = JSON.stringify(toResultDto(evaluated));
  if (entry) {
    entry.body = body;
    entry.bytes = Buffer.byteLength(body);
    totalBytes += entry.bytes;
    evict();
  }
  return { etag, body };
}

/** Hit and miss counts since start (tests and the bench read them). */
export function resultCacheStats() {
  return { ...counters, entries: entries.size, bytes: totalBytes };
}

/** Empties the cache (tests). */
export function clearResultCache() {
  entries.clear();
  totalBytes = 0;
  counters.hits = 0;
  counters.misses = 0;
}
