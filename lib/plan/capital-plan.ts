/**
 * The capital plan's shape: by period of spend, the repowers the fleet
 * programme (./programme.ts, one MILP over timing, budgets and shop
 * capacity) chose and those it left out, with what was spent and gained.
 * `proposalFromProgramme` (lib/cases/proposal.ts) fills it from the
 * programme's answer; nothing chooses here any more.
 */

export interface PlanCandidate {
  truckId: string;
  /** npv(repower) − npv(best other policy) */
  gain: number;
  profitabilityIndex: number | null;
  /** capital spend, positive */
  capital: number;
  /** period of the spend */
  capitalYear: number;
}

export interface LeftOut {
  truckId: string;
  gain: number;
  capital: number;
  /** max(0, capital − budget left unspent): what adding it to the chosen set would take */
  extraBudget: number;
}

export interface YearPlan {
  year: number;
  /** null: no limit set */
  budget: number | null;
  chosen: PlanCandidate[];
  leftOut: LeftOut[];
  spent: number;
  gain: number;
}

export interface CapitalPlan {
  years: YearPlan[];
  /** repowers that do not pay against the better other policy */
  notWorthIt: PlanCandidate[];
  totalGain: number;
  totalSpent: number;
}
