/**
 * Recommended overhaul life of an engine type: the age-replacement model
 * with a Weibull life law (Barlow & Proschan, "Mathematical Theory of
 * Reliability", 1965, ch. 4; Jardine & Tsang, "Maintenance, Replacement and
 * Reliability", ch. 2). Pure.
 *
 * ## Model
 *
 * An engine is overhauled when it reaches the planned life T, or repaired
 * when it fails first; either way it starts again as new (MODEL.md section 3).
 * Over the long run the expected cost per operating hour is the cost of one
 * cycle over its expected length (the renewal-reward theorem):
 *
 *   C(T) = (Cp·R(T) + Cf·(1 − R(T))) / ∫₀ᵀ R(t) dt,   R(t) = exp(−(t/η)^β)
 *
 * - Cp, the planned cost = overhaulCost + overhaulDowntimeDays · m;
 * - Cf, the failure cost = failureCost + failureDowntimeDays · m;
 * - m, a day down's lost margin at year-1 prices (MODEL.md section 5):
 *   (annualHours / 365) · tonnesPerHour · marginPerTonne · lostMarginShare.
 *
 * Units: T and t in engine operating hours; C in money per operating hour
 * (positive: a cost). Year-1 prices, not discounted, no tax: a steady-state
 * rate, not a horizon npv (the case's npv of `rebuild` with the chosen life
 * answers that). Oil services cost the same per hour whatever T (to within
 * the one a planned event saves) and are left out.
 *
 * ## Edge cases
 *
 * - β ≤ 1 (a constant or falling hazard), or Cf ≤ Cp: a planned overhaul
 *   never lowers the rate, which falls all the way to Cf / E[X] as T → ∞
 *   (E[X] = η·Γ(1 + 1/β)): the optimum is at infinity ("run to failure"),
 *   said as `optimumHours: null` with `reason`.
 * - β > 1 and Cf > Cp: C(T) → ∞ as T → 0 and C has one minimum (the hazard
 *   rises), found by a scan of the curve and a golden-section refinement to
 *   1e-9 relative. At the optimum (Barlow & Proschan): h(T*)·∫₀^T* R − F(T*)
 *   = Cp / (Cf − Cp), and C(T*) = (Cf − Cp)·h(T*), h the hazard rate.
 *
 * ## Worked example (tests/unit/engine/age-replacement.test.ts)
 *
 * β = 1, η = 10,000 h, Cp = 1, Cf = 5: ∫₀ᵀ R = η(1 − e^(−T/η)), so
 * C(T) = (1 + 4(1 − e^(−T/η))) / (η(1 − e^(−T/η))), falling in T to
 * 5 / η = 0.0005 per hour: no planned overhaul pays.
 */

export interface AgeReplacementInput {
  weibullShape: number;
  weibullScaleHours: number;
  /** cost of a planned overhaul, money (days down included) */
  plannedCost: number;
  /** cost of a failure in service, money (days down included) */
  failureCost: number;
  /** the curve runs to this age, hours (default 3η) */
  curveToHours?: number;
  /** points on the curve (default 120) */
  curvePoints?: number;
}

export interface AgeReplacementResult {
  /** the planned life with the lowest cost per hour; null: at infinity (never plan) */
  optimumHours: number | null;
  /** C at the optimum, or Cf / E[X] when the optimum is at infinity, money per hour */
  optimumCostPerHour: number;
  /** Cf / E[X]: the rate of running to failure (no planned overhaul) */
  runToFailureCostPerHour: number;
  /** why no finite optimum, in plain words; null when there is one */
  reason: string | null;
  curve: { hours: number; costPerHour: number }[];
}

/** ∫₀ᵀ exp(−(t/η)^β) dt by Gauss–Legendre (8 points) on panels; the substitution t = T·u^(1/…) is not needed for β ≥ 0.3. */
export function expectedCycleHours(T: number, shape: number, scale: number): number {
  if (!(T > 0)) return 0;
  const panels = 64;
  // nodes and weights of 8-point Gauss–Legendre on [−1, 1] (Abramowitz & Stegun, Table 25.4)
  const x = [0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363];
  const w = [0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763];
  // panels graded towards 0 (t = T·s², s uniform) so a steep R near 0 (β < 1) is integrated well
  let sum = 0;
  for (let p = 0; p < panels; p++) {
    const a = p / panels;
    const b = (p + 1) / panels;
    const mid = (a + b) / 2;
    const half = (b - a) / 2;
    for (let i = 0; i < 4; i++) {
      for (const sgn of [-1, 1]) {
        const s = mid + sgn * half * x[i];
        const t = T * s * s;
        sum += w[i] * half * Math.exp(-Math.pow(t / scale, shape)) * 2 * T * s;
      }
    }
  }
  return sum;
}

/** Γ(z) for z > 0 (Lanczos, g = 7, 9 terms; relative error about 1e-15). */
export function gamma(z: number): number {
  if (z < 0.5) return Math.PI / (Math.sin(Math.PI * z) * gamma(1 - z));
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  const zz = z - 1;
  let a = c[0];
  const t = zz + 7.5;
  for (let i = 1; i < 9; i++) a += c[i] / (zz + i);
  return Math.sqrt(2 * Math.PI) * Math.pow(t, zz + 0.5) * Math.exp(-t) * a;
}

/** C(T): expected cost per operating hour with planned life T (see the module comment). */
export function ageReplacementCostRate(T: number, input: AgeReplacementInput): number {
  const { weibullShape: beta, weibullScaleHours: eta, plannedCost: cp, failureCost: cf } = input;
  const R = Math.exp(-Math.pow(T / eta, beta));
  return (cp * R + cf * (1 - R)) / expectedCycleHours(T, beta, eta);
}

/**
 * The optimum planned life and the cost-rate curve (see the module comment).
 *
 * @example optimalOverhaulLife({ weibullShape: 1, weibullScaleHours: 10000, plannedCost: 1, failureCost: 5 }).optimumHours // = null
 */
export function optimalOverhaulLife(input: AgeReplacementInput): AgeReplacementResult {
  const { weibullShape: beta, weibullScaleHours: eta, plannedCost: cp, failureCost: cf } = input;
  for (const [name, v] of Object.entries({ weibullShape: beta, weibullScaleHours: eta })) {
    if (!(Number.isFinite(v) && v > 0)) throw new RangeError(`${name} must be a positive number (got ${v})`);
  }
  for (const [name, v] of Object.entries({ plannedCost: cp, failureCost: cf })) {
    if (!(Number.isFinite(v) && v >= 0)) throw new RangeError(`${name} must be a number ≥ 0 (got ${v})`);
  }
  const mean = eta * gamma(1 + 1 / beta);
  const runToFailure = cf / mean;
  const to = input.curveToHours ?? 3 * eta;
  const points = Math.max(2, Math.round(input.curvePoints ?? 120));
  const curve: { hours: number; costPerHour: number }[] = [];
  for (let i = 1; i <= points; i++) {
    const T = (to * i) / points;
    curve.push({ hours: T, costPerHour: ageReplacementCostRate(T, input) });
  }
  if (beta <= 1) {
    return {
      optimumHours: null, optimumCostPerHour: runToFailure, runToFailureCostPerHour: runToFailure, curve,
      reason: `With a Weibull shape of ${beta} (≤ 1) the engine does not wear out: its failure rate does not rise with age, so a planned overhaul never lowers the cost per hour. Run it to failure (the best planned life is infinite).`,
    };
  }
  if (cf <= cp) {
    return {
      optimumHours: null, optimumCostPerHour: runToFailure, runToFailureCostPerHour: runToFailure, curve,
      reason: 'A failure costs no more than a planned overhaul (days down included), so a planned overhaul never pays: run the engine to failure (the best planned life is infinite).',
    };
  }
  // scan on a log grid from η/1000 to 20η, then golden section around the best point
  const f = (T: number) => ageReplacementCostRate(T, input);
  const lo0 = eta / 1000;
  const hi0 = eta * 20;
  const steps = 400;
  let best = 0;
  let bestValue = Number.POSITIVE_INFINITY;
  const grid: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const T = lo0 * Math.pow(hi0 / lo0, i / steps);
    grid.push(T);
    const v = f(T);
    if (v < bestValue) {
      bestValue = v;
      best = i;
    }
  }
  let a = grid[Math.max(0, best - 1)];
  let b = grid[Math.min(steps, best + 1)];
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(c);
  let fd = f(d);
  while (b - a > 1e-9 * b) {
    if (fc < fd) {
      b = d; d = c; fd = fc; c = b - g * (b - a); fc = f(c);
    } else {
      a = c; c = d; fc = fd; d = a + g * (b - a); fd = f(d);
    }
  }
  const T = (a + b) / 2;
  return { optimumHours: T, optimumCostPerHour: f(T), runToFailureCostPerHour: runToFailure, curve, reason: null };
}

/** What a day down costs and the planned/failure costs of an engine on a truck's duty (see the module comment). */
export function ageReplacementCosts(
  engine: { overhaulCost: number; overhaulDowntimeDays: number; failureCost: number; failureDowntimeDays: number },
  duty: { annualHours: number; tonnesPerHour: number },
  assumptions: { marginPerTonne: number; lostMarginShare?: number },
): { plannedCost: number; failureCost: number; dayDownCost: number } {
  const day = (duty.annualHours / 365) * duty.tonnesPerHour * assumptions.marginPerTonne * (assumptions.lostMarginShare ?? 1);
  return {
    plannedCost: engine.overhaulCost + engine.overhaulDowntimeDays * day,
    failureCost: engine.failureCost + engine.failureDowntimeDays * day,
    dayDownCost: day,
  };
}
