/**
 * The fleet programme as one mixed-integer linear programme (issue 15):
 * which timing option each truck takes, so that the fleet's expected npv is
 * as high as it can be while planned capital stays within each fiscal year's
 * budget and the shop does at most its capacity of swaps each month.
 * Solved exactly by HiGHS (the npm package `highs`, WebAssembly).
 *
 * ## Model
 *
 * Binary x_{t,o} = 1 when truck t takes option o (keep, rebuild, repower now,
 * repower at the k-th planned event, possibly delayed d months — each option
 * has one planned swap month, or none):
 *
 *   maximise   Σ_{t,o} npv_{t,o} · x_{t,o}
 *   subject to Σ_o x_{t,o} = 1                          for every truck t
 *              Σ_{t,o} capital_{t,o,y} · x_{t,o} ≤ B_y   for every fiscal year y with a budget (null: no limit)
 *              Σ_{t,o : month_{t,o} = m} x_{t,o} ≤ c_m    for every month m in the capacity list
 *
 * npv in money (higher is better: costs are negative), capital_{t,o,y} the
 * option's planned capital in fiscal year y (positive money; the caller maps
 * engine periods to fiscal years), c_m ≥ 0 swaps (0: a shutdown). A month
 * beyond the capacity list has no limit.
 *
 * ## What is reported
 *
 * - the chosen option per truck, and for each truck whose choice is not its
 *   unconstrained best (the option of highest npv ignoring budgets and the
 *   shop), the npv it gives up: `cost` = best npv − chosen npv (≥ 0). A chosen
 *   option with a delay d > 0 is a forced delay.
 * - the value of one more unit of each binding constraint, by re-solving:
 *   a budget binds when its slack is below 1e-6 · max(1, B), and gets
 *   +1,000,000; a month binds when it is full, and gets +1 swap. `gain` is
 *   the re-solved optimum less the optimum (≥ 0). The LP relaxation of the
 *   relaxed model is solved first: when its bound is within the absolute
 *   gap of the optimum, one more unit cannot gain anything and the MILP is
 *   not re-solved (gain 0).
 * - HiGHS's model status, the relative MIP gap (0 when proven optimal:
 *   mip_rel_gap is set to 0, mip_abs_gap to one unit of money) and the solve
 *   time in seconds. Each solve stops at `timeLimitSeconds` (default 30):
 *   then the best plan found is reported with status "time limit" and its
 *   gap, or, with none found, `ok: false`.
 *
 * ## Solving
 *
 * Each budget row comes with whole-plan rows that tighten its relaxation
 * (`budgetCuts`); the main solve starts from a greedy plan that fits
 * (`greedyStart`), each marginal re-solve from the optimum (it fits the
 * relaxed model). Neither changes the optimum: the cuts remove no whole plan,
 * a start only gives the search an early bound.
 *
 * The LP text uses indices only (x0, x1, …; r0, …): no truck id or label ever
 * reaches the parser.
 */
import highsLoader from 'highs';

export interface ProgrammeOption {
  /** stable key within the truck, e.g. "keep", "rebuild", "now", "k2", "k1+d3" */
  key: string;
  label: string;
  /** planned swap month (0 = this month), or null (no swap: keep, rebuild) */
  month: number | null;
  /** months the swap is delayed past its due month (0: on time) */
  delayMonths: number;
  /** expected npv, money */
  npv: number;
  /** planned capital per fiscal year (index as `budgets`), positive money; missing years are 0 */
  capitalByYear: number[];
}

export interface ProgrammeTruck {
  id: string;
  options: ProgrammeOption[];
}

export interface ProgrammeInput {
  trucks: ProgrammeTruck[];
  /** budget per fiscal year (index 0 = the first fiscal year), null: no limit */
  budgets: (number | null)[];
  /** fiscal year labels for the report (default "year 1", …) */
  yearLabels?: string[];
  /** most swaps per month (index 0 = this month); months beyond the list have no limit */
  capacity: number[];
  /**
   * seconds each solve may take (default 30): past it the best plan found so far is reported with status
   * "time limit" and its gap (a bound on how far it may be from the optimum); no plan found by then: not ok
   */
  timeLimitSeconds?: number;
  /** also re-solve each binding constraint relaxed by one unit (default true) */
  marginals?: boolean;
}

export interface TruckChoice {
  truckId: string;
  option: ProgrammeOption;
  best: ProgrammeOption;
  /** best.npv − option.npv, ≥ 0 */
  cost: number;
  forcedDelay: boolean;
}

export interface ConstraintValue {
  kind: 'budget' | 'capacity';
  /** fiscal year index or month index */
  index: number;
  label: string;
  /** the limit and the amount used in the optimum */
  limit: number;
  used: number;
  /** the relaxation tried: +1,000,000 (budget) or +1 swap (capacity) */
  relaxBy: number;
  /** optimum with the relaxation less the optimum */
  gain: number;
}

export interface ProgrammeResult {
  ok: boolean;
  /** plain words when not ok (empty or infeasible input) */
  message: string | null;
  status: string;
  /** Σ npv of the chosen options */
  objective: number;
  /** relative MIP gap reported by HiGHS (+∞ when stopped before any bound was proven) */
  gap: number;
  seconds: number;
  choices: TruckChoice[];
  binding: ConstraintValue[];
  /** planned capital per fiscal year of the chosen plan, and swaps per month */
  capitalByYear: number[];
  swapsByMonth: number[];
}

export const BUDGET_STEP = 1_000_000;
const SLACK = 1e-6;
/** The solver stops when its bound is within this of the best plan found: one unit of money (the npvs are whole-money figures). */
export const ABS_GAP = 1;
export const DEFAULT_TIME_LIMIT = 30;

type Highs = Awaited<ReturnType<typeof highsLoader>>;
let loading: Promise<Highs> | null = null;

/**
 * The solver, loaded once. In Node it reads build/highs.wasm beside the
 * package's script (__dirname, or import.meta.url in the ES build); a bundler
 * that moves the script must leave the package external (Next:
 * `serverExternalPackages: ['highs']`) or pass `locateFile`.
 */
export function loadHighs(locateFile?: (file: string) => string): Promise<Highs> {
  if (!loading) loading = highsLoader(locateFile ? { locateFile } : {});
  return loading;
}

/** A number as LP text (finite, no exponent surprises). */
function num(v: number): string {
  if (!Number.isFinite(v)) throw new RangeError(`not a finite number: ${v}`);
  return Math.abs(v) < 1e-12 ? '0' : String(v);
}

interface Built {
  text: string;
  /** per column: truck index, option index */
  truckOf: number[];
  optionOf: number[];
  offset: number;
  /** row index of each fiscal year's budget row and each month's capacity row (absent: no row) */
  budgetRow: Map<number, number>;
  capacityRow: Map<number, number>;
}

/** A valid inequality Σ coef(capital_c) · x_c ≤ rhs on a budget row: integer coefficients, integer right-hand side. */
interface BudgetCut {
  coef: (amount: number) => number;
  rhs: number;
}

/**
 * Rows that every plan within budget B meets, added beside the budget row to
 * tighten its LP relaxation (the optimum is unchanged: no whole plan within
 * B is cut off; the budget row itself stays). The swaps of a fiscal year
 * mostly cost one of a few amounts (one per offer, at that year's prices),
 * so the row is a knapsack over counts n_v of swaps of each amount v:
 *
 * - one amount v: n_v ≤ ⌊B / v⌋;
 * - two amounts v1 > v2: the facets of the convex hull of the whole points
 *   {(n1, n2) ≥ 0 : v1·n1 + v2·n2 ≤ B} (its upper hull over n1 = 0 … ⌊B/v1⌋
 *   with n2 = ⌊(B − v1·n1)/v2⌋, plus n1 ≤ ⌊B/v1⌋; each count at most the
 *   options of its price): the strongest such rows;
 * - more amounts: the Chvátal–Gomory rows Σ ⌊v_c / d⌋ · x_c ≤ ⌊B / d⌋ for each
 *   amount d (valid: the left side is a whole number ≤ Σ v_c x_c / d).
 *
 * Amounts are compared to the cent; the floors allow a little slack
 * (1e-9 · B plus half a cent per option) so a rounding error never cuts off
 * a plan (the budget row stays exact).
 */
export function budgetCuts(amounts: number[], budget: number): BudgetCut[] {
  const values = [...new Set(amounts.filter((a) => a > 0).map((a) => Math.round(a * 100) / 100))].sort((a, b) => b - a);
  if (values.length === 0) return [];
  // generous by rounding: amounts within half a cent of a value count as it
  const tol = 1e-9 * Math.max(1, budget) + 0.005 * amounts.length;
  const fl = (v: number) => Math.max(0, Math.floor(v + 1e-9));
  const same = (a: number, v: number) => a > 0 && Math.abs(Math.round(a * 100) / 100 - v) < 0.005;
  if (values.length === 1) {
    const v = values[0];
    return [{ coef: (a) => (same(a, v) ? 1 : 0), rhs: fl((budget + tol) / v) }];
  }
  if (values.length === 2) {
    const [v1, v2] = values;
    // no more swaps of a price than options with it (this also bounds the loop whatever the budget)
    const count = (v: number) => amounts.filter((a) => same(a, v)).length;
    const top = Math.min(count(v1), fl((budget + tol) / v1));
    const most2 = count(v2);
    const pts: [number, number][] = [];
    for (let a = 0; a <= top; a++) pts.push([a, Math.min(most2, fl((budget + tol - v1 * a) / v2))]);
    // upper hull (monotone chain), left to right
    const hull: [number, number][] = [];
    for (const p of pts) {
      while (hull.length >= 2) {
        const [o, q] = [hull[hull.length - 2], hull[hull.length - 1]];
        const cross = (q[0] - o[0]) * (p[1] - o[1]) - (q[1] - o[1]) * (p[0] - o[0]);
        if (cross >= 0) hull.pop();
        else break;
      }
      hull.push(p);
    }
    const cuts: BudgetCut[] = [];
    const pick = (c1: number, c2: number) => (a: number) => (same(a, v1) ? c1 : same(a, v2) ? c2 : 0);
    cuts.push({ coef: pick(1, 0), rhs: top });
    cuts.push({ coef: pick(0, 1), rhs: hull[0][1] });
    for (let i = 0; i + 1 < hull.length; i++) {
      const [a1, b1] = hull[i];
      const [a2, b2] = hull[i + 1];
      // the edge through (a1, b1) and (a2, b2): (b1 − b2)·n1 + (a2 − a1)·n2 ≤ (b1 − b2)·a1 + (a2 − a1)·b1
      const c1 = b1 - b2;
      const c2 = a2 - a1;
      if (c1 > 0 && c2 > 0) cuts.push({ coef: pick(c1, c2), rhs: c1 * a1 + c2 * b1 });
    }
    return cuts;
  }
  return values.map((d) => ({ coef: (a: number) => (a > 0 ? Math.floor(a / d) : 0), rhs: fl((budget + tol) / d) }));
}

/** The CPLEX LP text of the programme; npvs are offset by each truck's lowest npv (a constant) to keep coefficients small. */
export function programmeLp(input: ProgrammeInput, budgets = input.budgets, capacity = input.capacity): Built {
  const truckOf: number[] = [];
  const optionOf: number[] = [];
  const obj: string[] = [];
  let offset = 0;
  input.trucks.forEach((t, ti) => {
    const base = Math.min(...t.options.map((o) => o.npv));
    offset += base;
    t.options.forEach((o, oi) => {
      const j = truckOf.length;
      truckOf.push(ti);
      optionOf.push(oi);
      obj.push(`+ ${num(o.npv - base)} x${j}`);
    });
  });
  const rows: string[] = [];
  const budgetRow = new Map<number, number>();
  const capacityRow = new Map<number, number>();
  let r = 0;
  // long rows continue on following lines (the LP reader joins them)
  const wrap = (parts: string[]) => parts.reduce((acc, p, i) => acc + (i > 0 && i % 20 === 0 ? '\n ' : ' ') + p, '');
  const row = (terms: string[], sense: string) => ` r${r++}:${wrap(terms)} ${sense}`;
  let j = 0;
  input.trucks.forEach((t) => {
    const terms = t.options.map((_, oi) => `+ x${j + oi}`);
    rows.push(row(terms, '= 1'));
    j += t.options.length;
  });
  budgets.forEach((b, y) => {
    if (b === null) return;
    const terms: string[] = [];
    const amounts: number[] = [];
    for (let c = 0; c < truckOf.length; c++) {
      const amount = input.trucks[truckOf[c]].options[optionOf[c]].capitalByYear[y] ?? 0;
      amounts.push(amount);
      if (Math.abs(amount) > 0) terms.push(`+ ${num(amount)} x${c}`);
    }
    if (terms.length > 0) {
      budgetRow.set(y, r);
      rows.push(row(terms, `<= ${num(b)}`));
      for (const cut of budgetCuts(amounts, b)) {
        const cutTerms: string[] = [];
        for (let c = 0; c < truckOf.length; c++) {
          const w = cut.coef(amounts[c]);
          if (w > 0) cutTerms.push(`+ ${w} x${c}`);
        }
        if (cutTerms.length > 0) rows.push(row(cutTerms, `<= ${cut.rhs}`));
      }
    }
  });
  capacity.forEach((cap, m) => {
    const terms: string[] = [];
    for (let c = 0; c < truckOf.length; c++) if (input.trucks[truckOf[c]].options[optionOf[c]].month === m) terms.push(`+ x${c}`);
    if (terms.length > 0) {
      capacityRow.set(m, r);
      rows.push(row(terms, `<= ${num(cap)}`));
    }
  });
  const cols = truckOf.map((_, c) => `x${c}`);
  const text = [
    'Maximize',
    ` obj:${wrap(obj)}`,
    'Subject To',
    ...rows,
    'Binary',
    ...Array.from({ length: Math.ceil(cols.length / 20) }, (_, i) => ' ' + cols.slice(i * 20, i * 20 + 20).join(' ')),
    'End',
  ].join('\n');
  return { text, truckOf, optionOf, offset, budgetRow, capacityRow };
}

function checkInput(input: ProgrammeInput): string | null {
  if (input.trucks.length === 0) return 'There are no trucks to plan: add trucks to the case first.';
  for (let i = 0; i < input.trucks.length; i++) {
    const t = input.trucks[i];
    if (t.options.length === 0) return `Truck ${i + 1} (${t.id}) has no timing option to choose from.`;
    for (const o of t.options) {
      if (!Number.isFinite(o.npv)) return `Truck ${i + 1} (${t.id}), option "${o.label}": its npv is not a number.`;
      if (o.month !== null && !(Number.isInteger(o.month) && o.month >= 0)) return `Truck ${i + 1} (${t.id}), option "${o.label}": its month must be a whole number ≥ 0.`;
      for (const v of o.capitalByYear) if (!(Number.isFinite(v) && v >= 0)) return `Truck ${i + 1} (${t.id}), option "${o.label}": its planned capital must be numbers ≥ 0.`;
    }
  }
  for (let y = 0; y < input.budgets.length; y++) {
    const b = input.budgets[y];
    if (b !== null && !(Number.isFinite(b) && b >= 0)) return `The budget of ${yearLabel(input, y)} must be a number ≥ 0 or empty (no limit).`;
  }
  for (let m = 0; m < input.capacity.length; m++) {
    const c = input.capacity[m];
    if (!(Number.isInteger(c) && c >= 0)) return `The shop capacity of month ${m + 1} must be a whole number of swaps ≥ 0.`;
  }
  return null;
}

function yearLabel(input: ProgrammeInput, y: number): string {
  return input.yearLabels?.[y] ?? `year ${y + 1}`;
}

/** Why no plan fits, in plain words: a truck none of whose options fits alone, else the combination. */
function whyInfeasible(input: ProgrammeInput): string {
  for (let i = 0; i < input.trucks.length; i++) {
    const t = input.trucks[i];
    const fits = t.options.some((o) => {
      if (o.month !== null && o.month < input.capacity.length && input.capacity[o.month] < 1) return false;
      return input.budgets.every((b, y) => b === null || (o.capitalByYear[y] ?? 0) <= b + SLACK * Math.max(1, b));
    });
    if (!fits) {
      return `No plan fits: truck ${i + 1} (${t.id}) has no option that fits on its own — each needs a month the shop is closed or more capital than a year's budget. Give it a keep or rebuild option, raise the budget or open the month.`;
    }
  }
  return 'No plan fits every budget and the shop capacity together: the trucks that must swap need more capital in some fiscal year, or more swaps in some months, than allowed. Raise a budget, add shop capacity, or allow later timings.';
}

/**
 * The options no optimal plan needs: an option is dominated by another of the
 * same truck that has at least its npv, no more capital in any year, and
 * either no swap month or the same one (it uses nothing the first does not).
 * Of equals the first listed stays. Dropping them leaves the optimum's value
 * unchanged and makes the model smaller.
 */
export function undominated(options: ProgrammeOption[]): ProgrammeOption[] {
  const years = Math.max(0, ...options.map((o) => o.capitalByYear.length));
  const covers = (b: ProgrammeOption, a: ProgrammeOption) =>
    b.npv >= a.npv && (b.month === null || b.month === a.month) &&
    Array.from({ length: years }, (_, y) => (b.capitalByYear[y] ?? 0) <= (a.capitalByYear[y] ?? 0)).every(Boolean);
  return options.filter((a, i) => !options.some((b, j) => j !== i && covers(b, a) && (!covers(a, b) || j < i)));
}

interface Solved {
  status: string;
  objective: number;
  gap: number;
  seconds: number;
  x: Float64Array | null;
}

const STATUS_NAMES: Record<number, string> = {
  0: 'not set', 1: 'load error', 2: 'model error', 3: 'presolve error', 4: 'solve error', 5: 'postsolve error', 6: 'empty',
  7: 'optimal', 8: 'infeasible', 9: 'unbounded or infeasible', 10: 'unbounded', 11: 'objective bound', 12: 'objective target',
  13: 'time limit', 14: 'iteration limit', 15: 'unknown', 16: 'solution limit', 17: 'interrupted',
};

type Model = ReturnType<Highs['createModel']>;

function runModel(model: Model, built: Built): Solved {
  model.run();
  const code = model.getModelStatus() as number;
  const status = STATUS_NAMES[code] ?? `status ${code}`;
  const seconds = model.getRunTime();
  // optimal, or stopped at the time limit with a feasible plan (then the gap says how far from proven)
  const feasible = code === 7 || (code === 13 && Number(model.info.get('primal_solution_status')) === 2);
  if (!feasible) return { status, objective: Number.NaN, gap: Number.NaN, seconds, x: null };
  // stopped before any bound was proven (a plan given as the start, no node solved): the gap is unknown, +∞
  const reported = Number(model.info.get('mip_gap'));
  const gap = Number.isNaN(reported) ? Number.POSITIVE_INFINITY : reported;
  return { status, objective: model.getObjectiveValue() + built.offset, gap, seconds, x: model.getSolution().colValue.slice() };
}

/**
 * A plan that fits, to start the solver from (its bound prunes from the first node): trucks in order of
 * regret (their best npv less their second best, largest first) each take their best option that still fits
 * the budgets and the shop. Null when some truck finds nothing that fits (the solver then starts cold).
 * Column values of `built` (one 1 per truck).
 */
export function greedyStart(model: ProgrammeInput, built: Built): Float64Array | null {
  const spend = model.budgets.map(() => 0);
  const swaps = new Map<number, number>();
  const x = new Float64Array(built.truckOf.length);
  const firstCol: number[] = [];
  let j = 0;
  for (const t of model.trucks) {
    firstCol.push(j);
    j += t.options.length;
  }
  const ranked = model.trucks.map((t) => t.options.map((_, k) => k).sort((a, b) => t.options[b].npv - t.options[a].npv));
  const order = model.trucks.map((t, i) => {
    const r = ranked[i];
    return { i, regret: r.length > 1 ? t.options[r[0]].npv - t.options[r[1]].npv : 0 };
  }).sort((a, b) => b.regret - a.regret);
  for (const { i } of order) {
    const t = model.trucks[i];
    const fit = ranked[i].find((k) => {
      const o = t.options[k];
      if (o.month !== null && o.month < model.capacity.length && (swaps.get(o.month) ?? 0) >= model.capacity[o.month]) return false;
      return model.budgets.every((b, y) => b === null || spend[y] + (o.capitalByYear[y] ?? 0) <= b);
    });
    if (fit === undefined) return null;
    const o = t.options[fit];
    model.budgets.forEach((_, y) => (spend[y] += o.capitalByYear[y] ?? 0));
    if (o.month !== null) swaps.set(o.month, (swaps.get(o.month) ?? 0) + 1);
    x[firstCol[i] + fit] = 1;
  }
  return x;
}

/** Solve the LP text, from `start` when given (a plan that fits); `then` reads the model's first solution before the model is freed. */
function solveLp(highs: Highs, built: Built, timeLimit: number, then?: (first: Solved) => void, start?: Float64Array | null): Solved {
  const model = highs.createModel({ format: 'lp', data: built.text });
  try {
    model.options.set({ output_flag: false, mip_rel_gap: 0, mip_abs_gap: ABS_GAP, time_limit: timeLimit });
    if (start) model.setSolution({ colValue: start });
    const first = runModel(model, built);
    if (first.x && then) then(first);
    return first;
  } finally {
    model.dispose();
  }
}

/** The optimum of the LP relaxation (every binary in [0, 1]): an upper bound on the MILP's optimum; +∞ when the LP does not solve. */
function relaxationBound(highs: Highs, built: Built): { value: number; seconds: number } {
  const model = highs.createModel({ format: 'lp', data: built.text });
  try {
    model.options.set({ output_flag: false });
    model.clearIntegrality();
    model.run();
    const optimal = (model.getModelStatus() as number) === 7;
    return { value: optimal ? model.getObjectiveValue() + built.offset : Number.POSITIVE_INFINITY, seconds: model.getRunTime() };
  } finally {
    model.dispose();
  }
}

function objectiveOf(input: ProgrammeInput, built: Built, x: Float64Array): number {
  let v = 0;
  for (let c = 0; c < x.length; c++) if (x[c] > 0.5) v += input.trucks[built.truckOf[c]].options[built.optionOf[c]].npv;
  return v;
}

/**
 * Solve the programme (see the module comment). Never throws on a plan that
 * cannot be made: `ok: false` with `message` in plain words.
 */
export async function solveProgramme(input: ProgrammeInput, highs?: Highs): Promise<ProgrammeResult> {
  const empty = (message: string, status: string): ProgrammeResult => ({
    ok: false, message, status, objective: Number.NaN, gap: Number.NaN, seconds: 0, choices: [], binding: [], capitalByYear: [], swapsByMonth: [],
  });
  const problem = checkInput(input);
  if (problem) return empty(problem, 'not solved');
  const solver = highs ?? (await loadHighs());
  // the model without dominated options; `input` keeps every option (each truck's best)
  const model: ProgrammeInput = { ...input, trucks: input.trucks.map((t) => ({ id: t.id, options: undominated(t.options) })) };
  const built = programmeLp(model);
  let result: ProgrammeResult | null = null;
  const limit = input.timeLimitSeconds ?? DEFAULT_TIME_LIMIT;
  const solved = solveLp(solver, built, limit, (first) => {
    const x = first.x as Float64Array;
    const objective = objectiveOf(model, built, x);
    const chosen = new Array<number>(model.trucks.length).fill(-1);
    for (let c = 0; c < x.length; c++) if (x[c] > 0.5) chosen[built.truckOf[c]] = built.optionOf[c];
    const years = model.budgets.length;
    const capitalByYear = new Array<number>(years).fill(0);
    const months = Math.max(model.capacity.length, ...model.trucks.flatMap((t) => t.options.map((o) => (o.month ?? -1) + 1)));
    const swapsByMonth = new Array<number>(months).fill(0);
    const choices: TruckChoice[] = model.trucks.map((t, ti) => {
      const option = t.options[chosen[ti]];
      const best = input.trucks[ti].options.reduce((a, b) => (b.npv > a.npv ? b : a));
      for (let y = 0; y < years; y++) capitalByYear[y] += option.capitalByYear[y] ?? 0;
      if (option.month !== null) swapsByMonth[option.month] += 1;
      const cost = Math.max(0, best.npv - option.npv);
      return { truckId: t.id, option, best, cost, forcedDelay: option.delayMonths > 0 && cost > 0 };
    });
    const binding: ConstraintValue[] = [];
    model.budgets.forEach((b, y) => {
      if (b === null || !built.budgetRow.has(y)) return;
      if (b - capitalByYear[y] <= SLACK * Math.max(1, b)) {
        binding.push({ kind: 'budget', index: y, label: yearLabel(model, y), limit: b, used: capitalByYear[y], relaxBy: BUDGET_STEP, gain: Number.NaN });
      }
    });
    model.capacity.forEach((cap, m) => {
      if (built.capacityRow.has(m) && swapsByMonth[m] >= cap) {
        binding.push({ kind: 'capacity', index: m, label: `month ${m + 1}`, limit: cap, used: swapsByMonth[m], relaxBy: 1, gain: Number.NaN });
      }
    });
    let seconds = first.seconds;
    if (model.marginals !== false) {
      for (const b of binding) {
        // a fresh model each time: re-running the solved model with a bound changed (and the optimum as a start) was slower
        const budgets = b.kind === 'budget' ? model.budgets.map((v, y) => (y === b.index && v !== null ? v + b.relaxBy : v)) : model.budgets;
        const capacity = b.kind === 'capacity' ? model.capacity.map((v, m) => (m === b.index ? v + b.relaxBy : v)) : model.capacity;
        const again = programmeLp(model, budgets, capacity);
        // the LP relaxation bounds the relaxed optimum from above: within the gap of the optimum, nothing is gained
        const bound = relaxationBound(solver, again);
        seconds += bound.seconds;
        if (bound.value <= objective + ABS_GAP) {
          b.gain = 0;
          continue;
        }
        // the optimum fits the relaxed model too: the re-solve starts from it
        const s = solveLp(solver, again, limit, undefined, x);
        seconds += s.seconds;
        b.gain = s.x ? Math.max(0, objectiveOf(model, again, s.x) - objective) : 0;
      }
    }
    result = { ok: true, message: null, status: first.status, objective, gap: first.gap, seconds, choices, binding, capitalByYear, swapsByMonth };
  }, greedyStart(model, built));
  if (result) return result;
  if (solved.status === 'infeasible') return { ...empty(whyInfeasible(model), solved.status), seconds: solved.seconds };
  return { ...empty(`The solver stopped without a plan (${solved.status}).`, solved.status), seconds: solved.seconds };
}
