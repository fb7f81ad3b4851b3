/**
 * Ranking trucks for repower. Pure: a `case-result/1` in, a ranked list out.
 *
 * The gain of repowering a truck is measured against the better of the two
 * other policies (a planner who does not repower would still pick the better
 * of keep and rebuild): gain = npv(repower) − max(npv(keep), npv(rebuild)),
 * ties going to rebuild as in the engine's `best`. The profitability index is
 * the engine's PI of that same comparison: 1 + ΔNPV / PV(repower capital).
 */
import type { CaseResult, Comparison, TruckResult } from '@/lib/engine/types';

export interface RankedTruck {
  truckId: string;
  rank: number;
  /** the policy the repower is measured against */
  bestOther: 'keep' | 'rebuild';
  /** npv(repower) − npv(bestOther), currency */
  gain: number;
  profitabilityIndex: number | null;
  /** the repower's capital spend, undiscounted, positive (0 when nothing is spent) */
  capital: number;
  /** the period of that spend (0 = now, 1.. years); null when there is none */
  capitalYear: number | null;
  best: TruckResult['best'];
}

const TIE = 1e-6;

/** The parts of a truck's result the policy comparisons read (a slim result without breakdowns will do). */
type Comparable = Pick<TruckResult, 'repowerVsKeep' | 'repowerVsRebuild'> & { options: Record<'keep' | 'rebuild', { npv: number }> };

export function bestOtherPolicy(t: Comparable): 'keep' | 'rebuild' {
  return t.options.keep.npv > t.options.rebuild.npv + TIE ? 'keep' : 'rebuild';
}

/** The engine's comparison of repower against the truck's better other policy. */
export function repowerComparison(t: Comparable): Comparison {
  return bestOtherPolicy(t) === 'keep' ? t.repowerVsKeep : t.repowerVsRebuild;
}

/** Capital spent on the repower (positive) and the period it falls in. */
export function repowerCapital(t: TruckResult): { capital: number; year: number | null } {
  const byPeriod = t.options.repower.breakdown.map((b) => -b.capital);
  const year = byPeriod.findIndex((c) => Math.abs(c) > TIE);
  return { capital: byPeriod.reduce((s, c) => s + c, 0), year: year < 0 ? null : year };
}

/**
 * Trucks ordered by gain, largest first (then by PI, then by id, so the order
 * is stable). Example: repower −9.0 M, rebuild −10.0 M, keep −10.5 M gives
 * bestOther "rebuild" and gain +1.0 M.
 */
export function rankTrucks(result: CaseResult): RankedTruck[] {
  const rows = result.trucks.map((t) => {
    const other = bestOtherPolicy(t);
    const { capital, year } = repowerCapital(t);
    return {
      truckId: t.id,
      rank: 0,
      bestOther: other,
      gain: t.options.repower.npv - t.options[other].npv,
      profitabilityIndex: repowerComparison(t).profitabilityIndex,
      capital,
      capitalYear: year,
      best: t.best,
    };
  });
  rows.sort((a, b) => b.gain - a.gain || (b.profitabilityIndex ?? -Infinity) - (a.profitabilityIndex ?? -Infinity) || a.truckId.localeCompare(b.truckId));
  rows.forEach((r, i) => (r.rank = i + 1));
  return rows;
}
