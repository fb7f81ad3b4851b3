/**
 * Compare the reference path (tests/support/reference-path.ts) with the
 * engine's output for the same case and failure ages, and list every
 * disagreement (MODEL.md preamble: 1e-6 relative, 1e-6 absolute near zero).
 *
 * Only the engine's public API is used here (`evaluateCaseDetailed`, whose
 * `result` is what `evaluateCase` returns, and whose `details` carry the
 * per-period quantities).
 */
import { evaluateCaseDetailed, type FailureAgeProvider } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';
import {
  REF_CATEGORIES,
  REF_EVENT_KINDS,
  REF_POLICIES,
  REF_QUANTITIES,
  referencePath,
  type AgeSource,
  type RefPath,
  type RefPolicy,
} from './reference-path';

export interface Mismatch {
  truckId: string;
  policy: RefPolicy;
  period: number | null;
  what: string;
  reference: number;
  engine: number;
}

/** Equal to 1e-6 relative, 1e-6 absolute near zero. */
export function close(a: number, b: number, rel = 1e-6): boolean {
  return Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));
}

export function formatMismatch(m: Mismatch): string {
  const at = m.period == null ? '' : ` period ${m.period}`;
  return `${m.truckId} ${m.policy}${at} ${m.what}: reference ${m.reference}, engine ${m.engine}`;
}

/**
 * Run the engine (with `provider`, or the median path when absent) and the
 * reference (with `ages`) on every truck (or those in `truckIds`) and policy;
 * return the disagreements.
 */
export function compareWithEngine(
  caseFile: CaseFileInput,
  ages: (truckId: string, policy: RefPolicy) => AgeSource,
  provider?: FailureAgeProvider,
  truckIds?: string[],
): Mismatch[] {
  const { result, details } = evaluateCaseDetailed(caseFile, provider ? { failureAge: provider } : {});
  const out: Mismatch[] = [];
  result.trucks.forEach((tr, ti) => {
    if (truckIds && !truckIds.includes(tr.id)) return;
    for (const policy of REF_POLICIES) {
      const ref: RefPath = referencePath(caseFile, tr.id, policy, ages(tr.id, policy));
      const eng = tr.options[policy];
      const det = details[ti].policies[policy];
      const add = (period: number | null, what: string, r: number, e: number | undefined) => {
        const ev = e ?? NaN;
        if (!close(r, ev)) out.push({ truckId: tr.id, policy, period, what, reference: r, engine: ev });
      };
      add(null, 'horizonYears', ref.horizonYears, tr.horizonYears);
      if (eng.cashFlows.length !== ref.periods.length) {
        add(null, 'periods', ref.periods.length, eng.cashFlows.length);
        continue;
      }
      ref.periods.forEach((p, y) => {
        add(y, 'cashFlow', p.cashFlow, eng.cashFlows[y]);
        for (const cat of REF_CATEGORIES) add(y, cat, p[cat], eng.breakdown[y]?.[cat]);
        for (const kind of REF_EVENT_KINDS) add(y, `events.${kind}`, p.events[kind], eng.events[y]?.[kind]);
        for (const q of REF_QUANTITIES) add(y, q, p[q], det.periods[y]?.[q]);
      });
      add(null, 'npv', ref.npv, eng.npv);
      add(null, 'failureBeforePlanned', ref.failureBeforePlanned, eng.failureBeforePlanned);
      for (const q of REF_QUANTITIES) add(null, q, ref.totals[q], eng[q]);
    }
  });
  return out;
}
