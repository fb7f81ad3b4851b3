/**
 * The check the engine's expected valuation (MODEL.md section 11) is held
 * to: `evaluateCase` with `valuation: 'expected'` against the Monte Carlo
 * mean of the independent reference path (tests/support/reference-expectation.ts)
 * on every per-period amount (cash flow and each breakdown category), every
 * per-period event count and quantity (fuel, CO2, tonnes, hours), npv and
 * failureBeforePlanned, within `sigmas` standard errors of the sampled mean
 * plus a floor of 1e-9 absolute (and 1e-12 relative, floating-point noise).
 *
 * How to call it (e.g. in tests/unit/engine/reference/expected-vs-sampled.test.ts,
 * once the engine's expected valuation lands):
 *
 *   import { checkExpectedAgainstSampled, formatExpectedMismatch } from '@/tests/support/expected-vs-sampled';
 *   import { referenceVariants } from '@/tests/support/reference-variants';
 *   for (const v of referenceVariants()) {
 *     it(v.name, () => {
 *       const bad = checkExpectedAgainstSampled(v.name, v.caseFile, 4000, 12345);
 *       expect(bad.map(formatExpectedMismatch)).toEqual([]);
 *     });
 *   }
 *
 * Options: `valuation` (default 'expected': the case is evaluated with it
 * whatever it says), `sigmas` (default 3), `modelAccuracy` (default false:
 * when true the tolerance also allows the engine's own error that MODEL.md
 * section 11 permits: 1e-5·(|npv of rebuild| + 1) on money, 1e-5 on counts
 * and probabilities, 1e-5 relative on fuel, CO2 and tonnes), `truckIds`
 * (default every truck).
 *
 * Mind the many comparisons: a variant has 3 policies × (N+1) periods × 18
 * figures, and at 3 standard errors about 0.27 % of honest comparisons of a
 * spread-out quantity still fall outside. With the same seed the run is
 * reproducible, so a seed that passes keeps passing; a failure that moves
 * when the seed or the iterations change is sampling noise, one that stays
 * (and grows in standard errors as iterations grow) is a real difference.
 * A rare event that no sample hit has a standard error of 0: give such a
 * case more iterations or `modelAccuracy: true`.
 */
import { evaluateCaseDetailed } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';
import { sampledExpectation, type Estimate } from './reference-expectation';
import { REF_CATEGORIES, REF_EVENT_KINDS, REF_POLICIES, REF_QUANTITIES, type RefPolicy } from './reference-path';

export interface ExpectedMismatch {
  variant: string;
  truckId: string;
  policy: RefPolicy;
  period: number | null;
  what: string;
  engine: number;
  sampledMean: number;
  se: number;
  tolerance: number;
  /** |engine − sampled mean| / se (Infinity when se = 0) */
  zScore: number;
}

export interface CheckOptions {
  valuation?: 'expected' | 'median-path';
  sigmas?: number;
  modelAccuracy?: boolean;
  truckIds?: string[];
}

export function formatExpectedMismatch(m: ExpectedMismatch): string {
  const at = m.period == null ? '' : ` period ${m.period}`;
  return (
    `${m.variant}: ${m.truckId} ${m.policy}${at} ${m.what}: engine ${m.engine}, sampled ${m.sampledMean} ± ${m.se}` +
    ` (z ${Number.isFinite(m.zScore) ? m.zScore.toFixed(2) : '∞'}, tolerance ${m.tolerance})`
  );
}

export function checkExpectedAgainstSampled(
  variantName: string,
  caseFile: CaseFileInput,
  iterations: number,
  seed: number,
  options: CheckOptions = {},
): ExpectedMismatch[] {
  const sigmas = options.sigmas ?? 3;
  const valuation = options.valuation ?? 'expected';
  const c = JSON.parse(JSON.stringify(caseFile)) as CaseFileInput;
  c.assumptions = { ...c.assumptions, valuation };
  const { result, details } = evaluateCaseDetailed(c);
  const out: ExpectedMismatch[] = [];
  result.trucks.forEach((tr, ti) => {
    if (options.truckIds && !options.truckIds.includes(tr.id)) return;
    const rebuildNpv = tr.options.rebuild.npv;
    const moneyAllowance = options.modelAccuracy ? 1e-5 * (Math.abs(rebuildNpv) + 1) : 0;
    REF_POLICIES.forEach((policy, pi) => {
      // one seed per truck and policy, so each is reproducible alone
      const s = sampledExpectation(c, tr.id, policy, iterations, (seed + 7919 * ti + 104_729 * pi) >>> 0);
      const eng = tr.options[policy];
      const det = details[ti].policies[policy];
      const add = (
        period: number | null,
        what: string,
        value: number | undefined,
        est: Estimate,
        kind: 'money' | 'count' | 'quantity',
      ) => {
        const v = value ?? NaN;
        const allowance = !options.modelAccuracy
          ? 0
          : kind === 'money'
            ? moneyAllowance
            : kind === 'count'
              ? 1e-5
              : 1e-5 * Math.abs(est.mean);
        const tolerance = sigmas * est.se + 1e-9 + 1e-12 * Math.abs(est.mean) + allowance;
        const diff = Math.abs(v - est.mean);
        if (!(diff <= tolerance)) {
          out.push({
            variant: variantName,
            truckId: tr.id,
            policy,
            period,
            what,
            engine: v,
            sampledMean: est.mean,
            se: est.se,
            tolerance,
            zScore: est.se > 0 ? diff / est.se : Infinity,
          });
        }
      };
      if (eng.cashFlows.length !== s.periods.length) {
        add(null, 'periods', eng.cashFlows.length, { mean: s.periods.length, se: 0 }, 'count');
        return;
      }
      s.periods.forEach((p, y) => {
        add(y, 'cashFlow', eng.cashFlows[y], p.cashFlow, 'money');
        for (const cat of REF_CATEGORIES) add(y, cat, eng.breakdown[y]?.[cat], p[cat], 'money');
        for (const k of REF_EVENT_KINDS) add(y, `events.${k}`, eng.events[y]?.[k], p.events[k], 'count');
        for (const q of REF_QUANTITIES) add(y, q, det.periods[y]?.[q], p[q], 'quantity');
      });
      add(null, 'npv', eng.npv, s.npv, 'money');
      add(null, 'failureBeforePlanned', eng.failureBeforePlanned, s.failureBeforePlanned, 'count');
      for (const q of REF_QUANTITIES) add(null, q, eng[q], s.totals[q], 'quantity');
    });
  });
  return out;
}
