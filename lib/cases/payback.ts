/**
 * Does a payback hold? Pure; reads a Δ cash-flow series the way the engine's
 * `paybackYears` does (MODEL.md section 8: counted from the investment at the
 * first flow that is not zero, cum_y ≥ 0 with the 1e-6 rule).
 *
 * Definitions (period y = 0 now, 1..N years, flows at the end of each year):
 * - cum_y = Σ_{t ≤ y} values[t] (pass the discounted flows, values[t]·DF_t, for
 *   a discounted payback).
 * - No investment: every flow is zero, or the first flow that is not zero is
 *   positive — nothing is spent first, so there is nothing to pay back (the
 *   engine's payback is then 0, which would read as "pays back at once").
 * - Never: the running sum never comes back to zero (the engine's null).
 * - Holds: after the first year y_p > s with cum_y ≥ 0, cum stays ≥ 0 to the end.
 * - Falls back: some later year has cum_y < 0 again; `below` lists the runs of
 *   consecutive such years, `endsBelow` says the last year is one of them.
 *
 * Worked example (by hand): values = [−1000, 600, 600, −300, −300, 500]
 *   cum = −1000, −400, 200, −100, −400, 100
 *   s = 0; first cum ≥ 0 at y = 2: payback = (2 − 0 − 1) + 400/600 = 1.667 yr;
 *   cum < 0 again in years 3 and 4 → { kind: 'falls-back', at: 1.667,
 *   below: [{ from: 3, to: 4 }], endsBelow: false }:
 *   "pays back in year 1.7 but falls below zero again in years 3–4".
 */
export type PaybackHold =
  | { kind: 'no-investment' }
  | { kind: 'never' }
  | { kind: 'holds'; at: number; start: number }
  | { kind: 'falls-back'; at: number; start: number; below: Array<{ from: number; to: number }>; endsBelow: boolean };

const ZERO = 1e-6;

export function paybackHold(values: readonly number[]): PaybackHold {
  const s = values.findIndex((v) => Math.abs(v) >= ZERO);
  if (s < 0 || values[s] > 0) return { kind: 'no-investment' };
  let cum = values[s];
  let payYear = -1;
  let at = 0;
  for (let y = s + 1; y < values.length; y++) {
    const previous = cum;
    cum += values[y];
    if (cum > -ZERO) {
      payYear = y;
      at = y - s - 1 + -previous / values[y];
      break;
    }
  }
  if (payYear < 0) return { kind: 'never' };
  const below: Array<{ from: number; to: number }> = [];
  for (let y = payYear + 1; y < values.length; y++) {
    cum += values[y];
    if (cum <= -ZERO) {
      const last = below[below.length - 1];
      if (last && last.to === y - 1) last.to = y;
      else below.push({ from: y, to: y });
    }
  }
  if (!below.length) return { kind: 'holds', at, start: s };
  return { kind: 'falls-back', at, start: s, below, endsBelow: below[below.length - 1].to === values.length - 1 };
}

const years = (r: { from: number; to: number }) => (r.from === r.to ? `${r.from}` : `${r.from}–${r.to}`);
const one = (x: number) => (Math.round(x * 10) / 10).toFixed(1);

/**
 * The flag in words, or null when there is nothing to flag. The year is the
 * chart's (the spend's period plus the payback), e.g. "Pays back in year 2.8
 * but falls below zero again in years 6–7".
 */
export function paybackWarning(h: PaybackHold): string | null {
  if (h.kind !== 'falls-back') return null;
  const runs = h.below.map(years);
  const plural = h.below.length > 1 || h.below[0].from !== h.below[0].to;
  const list = runs.length > 1 ? `${runs.slice(0, -1).join(', ')} and ${runs[runs.length - 1]}` : runs[0];
  return `Pays back in year ${one(h.start + h.at)} but falls below zero again in year${plural ? 's' : ''} ${list}${h.endsBelow ? ', and ends below zero' : ''}`;
}

/** Why a payback cell is blank, or null when it shows a figure. */
export function paybackBlankReason(h: PaybackHold): string | null {
  if (h.kind === 'no-investment') return 'no investment: repowering spends nothing more than the other policy, so there is nothing to pay back';
  if (h.kind === 'never') return 'does not pay back within the horizon';
  return null;
}
